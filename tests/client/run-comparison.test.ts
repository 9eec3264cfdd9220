// The comparison page's wording: run ids from the address, the headline table's differences
// against the first run (signs, units, better or worse), and the choke-point changes.
import { describe, expect, it } from 'vitest';
import type { ChokePoint, RunResult } from '../../shared/api/runs';
import { chokePointPresence } from '../../shared/model/compare-runs';
import { setPreferences } from '../../src/format/preferences';
import { comparisonOrder, comparisonRows, presenceByChange, presenceSummary, runIdsFromQuery, runLabel } from '../../src/format/run-comparison';

const a = '00000000-0000-4000-8000-00000000000a';
const b = '00000000-0000-4000-8000-00000000000b';

function chokePoint(segmentId: number, name: string): ChokePoint {
  return { segmentId, direction: 'forward', name, roadClass: 'primary', capacityVehiclesPerHour: 2000, shareOfCut: 0.3, cutWindows: [], inStaticCut: true, gainPerExtraLaneVehiclesPerHour: 0 };
}

function result(vehPerHour: number, clearance: number | null, chokePoints: ChokePoint[]): RunResult {
  return {
    headline: {
      steadyStateVehiclesPerHour: vehPerHour,
      steadyStatePersonsPerHour: vehPerHour * 2.5,
      demandVehicles: 10_000,
      demandPersons: 25_000,
      deliveredVehicles: 9_000,
      deliveredPersons: 22_500,
      horizonMinutes: 360,
      clearanceMinutes: clearance,
      p50Minutes: 60,
      p90Minutes: 120,
      p95Minutes: 150,
    },
    curve: { stepMinutes: 1, deliveredVehicles: [0, 10] },
    zones: [],
    shelters: [],
    bottlenecks: chokePoints,
    fixes: [],
    stats: { engineVersion: '1', algorithm: 'dinic', nodes: 1, arcs: 1, expandedNodes: 1, expandedArcs: 1, augmentations: 1, solveMs: 1, peakMemoryBytes: 1, verified: true },
  };
}

describe('runIdsFromQuery', () => {
  it('keeps valid ids in order, each once, and drops the rest', () => {
    expect(runIdsFromQuery(`${a},not-an-id,${b},${a}`)).toEqual([a, b]);
    expect(runIdsFromQuery([a, b])).toEqual([a, b]);
    expect(runIdsFromQuery(undefined)).toEqual([]);
  });
});

describe('runLabel', () => {
  it('names the base plan, a scenario, or a deleted one', () => {
    const createdAt = '2026-12-02T10:30:00.000Z';
    setPreferences({ unitSystem: 'metric', timeZone: 'UTC' });
    // Day, month name, year and zone: not the ambiguous US-style "Dec 2, 10:30 AM".
    expect(runLabel({ scenarioId: null, createdAt }, [])).toBe('Base plan · 2 Dec 2026, 10:30 UTC');
    setPreferences({ unitSystem: 'metric', timeZone: null });
    expect(runLabel({ scenarioId: a, createdAt }, [{ id: a, name: 'Quay Bridge closed' }])).toMatch(/^Quay Bridge closed · /);
    expect(runLabel({ scenarioId: b, createdAt }, [])).toMatch(/^Deleted scenario · /);
  });
});

describe('comparisonRows', () => {
  const base = result(5600, 300, [chokePoint(1, 'Quay Bridge'), chokePoint(2, 'Mill Bridge')]);
  const closed = result(3600, null, [chokePoint(2, 'Mill Bridge'), chokePoint(3, 'Wharf Road')]);

  it('gives each later run its difference from the first, signed, in units, marked better or worse', () => {
    const rows = comparisonRows([base, closed]);
    const vehicles = rows.find((r) => r.key === 'steadyStateVehiclesPerHour')!;
    expect(vehicles.cells[0]).toEqual({ value: '5,600 veh/h', difference: '', tone: 'none' });
    expect(vehicles.cells[1]).toEqual({ value: '3,600 veh/h', difference: '−2,000 veh/h', tone: 'worse' });
    const persons = rows.find((r) => r.key === 'steadyStatePersonsPerHour')!;
    expect(persons.cells[1]!.difference).toBe('−5,000 persons/h');
    expect(rows[0]!.key).toBe('steadyStatePersonsPerHour');
  });

  it('says "not comparable" when one run clears within the horizon and the other does not', () => {
    const clearance = comparisonRows([base, closed]).find((r) => r.key === 'clearanceMinutes')!;
    expect(clearance.cells[0]!.value).toBe('5 h');
    expect(clearance.cells[1]).toEqual({ value: 'over 6 h', difference: 'not comparable', tone: 'none' });
  });

  it('calls a shorter time better and an equal one no change', () => {
    const faster = result(5600, 240, []);
    const clearance = comparisonRows([base, faster]).find((r) => r.key === 'clearanceMinutes')!;
    expect(clearance.cells[1]).toEqual({ value: '4 h', difference: '−1 h', tone: 'better' });
    const p50 = comparisonRows([base, faster]).find((r) => r.key === 'p50Minutes')!;
    expect(p50.cells[1]!.difference).toBe('no change');
  });

  it('words the choke-point changes: new first, then those that no longer limit, then the steady ones', () => {
    const presence = presenceByChange(chokePointPresence([base, closed]));
    expect(presence.map((p) => [p.name, p.change])).toEqual([
      ['Wharf Road', 'appears'],
      ['Quay Bridge', 'vanishes'],
      ['Mill Bridge', 'everywhere'],
    ]);
    expect(presenceSummary(presence)).toBe('1 new, 1 no longer limiting, 1 in every run');
    expect(presenceSummary([])).toBe('No choke points in these runs');
  });
});

describe('comparisonOrder', () => {
  it('puts base-plan runs first, then the oldest', () => {
    const runs = [
      { id: 'c', scenarioId: a, createdAt: '2026-12-02T10:00:00Z' },
      { id: 'b', scenarioId: null, createdAt: '2026-12-02T11:00:00Z' },
      { id: 'd', scenarioId: b, createdAt: '2026-12-02T09:00:00Z' },
    ];
    expect(comparisonOrder(runs)).toEqual(['b', 'd', 'c']);
  });
});

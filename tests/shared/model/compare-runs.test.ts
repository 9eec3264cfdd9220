// Run comparison: choke points that appear, vanish or stay; headline differences (common practice:
// differences are against the first, reference run).
import { describe, expect, it } from 'vitest';
import { chokePointPresence, headlineDifferences } from '../../../shared/model/compare-runs';
import type { ChokePoint, RunResult } from '../../../shared/api/runs';

const chokePoint = (segmentId: number): ChokePoint => ({
  segmentId,
  direction: 'forward',
  name: `Road ${segmentId}`,
  roadClass: 'primary',
  capacityVehiclesPerHour: 1000,
  shareOfCut: 0.5,
  cutWindows: [],
  inStaticCut: true,
  gainPerExtraLaneVehiclesPerHour: 0,
});

function result(ids: number[], steady: number, clearance: number | null): RunResult {
  return {
    headline: {
      steadyStateVehiclesPerHour: steady,
      steadyStatePersonsPerHour: steady * 2,
      demandVehicles: 100,
      demandPersons: 200,
      deliveredVehicles: 100,
      deliveredPersons: 200,
      horizonMinutes: 60,
      clearanceMinutes: clearance,
      p50Minutes: 10,
      p90Minutes: 20,
      p95Minutes: 30,
    },
    curve: { stepMinutes: 1, deliveredVehicles: [0] },
    zones: [],
    shelters: [],
    bottlenecks: ids.map(chokePoint),
    fixes: [],
    stats: { engineVersion: 't', algorithm: 't', nodes: 0, arcs: 0, expandedNodes: 0, expandedArcs: 0, augmentations: 0, solveMs: 0, peakMemoryBytes: 0, verified: true },
  };
}

describe('chokePointPresence', () => {
  it('sorts roads into everywhere, appears, vanishes and varies', () => {
    const p = chokePointPresence([result([1, 2, 4], 1, 1), result([1, 3, 4], 1, 1), result([1, 3], 1, 1)]);
    const by = Object.fromEntries(p.map((x) => [x.segmentId, x.change]));
    expect(by).toEqual({ 1: 'everywhere', 2: 'vanishes', 3: 'appears', 4: 'varies' });
    expect(p.find((x) => x.segmentId === 4)!.inRun).toEqual([true, true, false]);
  });
});

describe('headlineDifferences', () => {
  it('subtracts the first run, and keeps "not within horizon" as no difference', () => {
    const d = headlineDifferences([result([], 5600, 100), result([], 4750, null), result([], 6000, 90)]);
    expect(d.steadyStateVehiclesPerHour).toEqual([0, -850, 400]);
    expect(d.clearanceMinutes).toEqual([0, null, -10]);
  });
});

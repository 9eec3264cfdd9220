// Which layout a search over time runs on, and its refusal past the run budget: the written-out
// network where what the search builds there fits, else the implicit one, else a refusal that
// says what to change. Sizes follow run-budget.ts's formula (a copy of every road and a waiting arc
// at every junction per step, plus the zones' and shelters' arcs).
import { describe, expect, it } from 'vitest';
import type { EvacuationProblem } from '../../../shared/flow';
import { expandedSize } from '../../../shared/model/run-budget';
import { chooseSearchLayout, problemNetworkSize, searchBytes } from '../../../shared/model/search-budget';
import { searchTooLargeReason } from '../../../shared/format/search-limits';

// A 10 × 10 grid of two-way streets, one zone and one shelter, 60 steps of one minute.
function grid(): EvacuationProblem {
  const roads: EvacuationProblem['roads'] = [];
  const id = (r: number, c: number) => r * 10 + c;
  for (let r = 0; r < 10; r++) {
    for (let c = 0; c < 10; c++) {
      if (c < 9) roads.push({ from: id(r, c), to: id(r, c + 1), capacityVehPerHour: 1800, travelTimeSeconds: 60 }, { from: id(r, c + 1), to: id(r, c), capacityVehPerHour: 1800, travelTimeSeconds: 60 });
      if (r < 9) roads.push({ from: id(r, c), to: id(r + 1, c), capacityVehPerHour: 1800, travelTimeSeconds: 60 }, { from: id(r + 1, c), to: id(r, c), capacityVehPerHour: 1800, travelTimeSeconds: 60 });
    }
  }
  return { nodeCount: 100, roads, zones: [{ id: 'z', entryNodes: [0], vehicles: 100 }], shelters: [{ id: 's', node: 99, capacityVehicles: null }], timeStepSeconds: 60, horizonSteps: 60 };
}

describe('search layout and budget', () => {
  const problem = grid();
  const n = problemNetworkSize(problem);
  const bytes = (search: 'closures' | 'release-order', layout: 'explicit' | 'implicit') => expandedSize(n.nodeCount, n.roads, 60, n.entries, searchBytes(search, layout)).bytes;

  it('counts the network as the run check does: 360 roads, 100 junctions and the zone’s and shelter’s arcs per step', () => {
    expect(n).toEqual({ nodeCount: 100, roads: 360, entries: 1 + 2 + 2 });
    expect(expandedSize(n.nodeCount, n.roads, 60, n.entries).arcs).toBe((360 + 100 + 5) * 61);
  });

  it('closures: the written-out network where it fits, else the implicit one; the other searches the implicit one; refused past both', () => {
    const arcs = 1e9;
    expect(chooseSearchLayout('closures', problem, { maxExpandedArcs: arcs, maxBytes: bytes('closures', 'explicit') })).toEqual({ layout: 'explicit', refusal: null });
    expect(chooseSearchLayout('closures', problem, { maxExpandedArcs: arcs, maxBytes: bytes('closures', 'explicit') - 1 })).toEqual({ layout: 'implicit', refusal: null });
    for (const search of ['release-order', 'zone-routes', 'contraflow'] as const) {
      expect(chooseSearchLayout(search, problem, { maxExpandedArcs: arcs, maxBytes: 2 ** 40 })).toEqual({ layout: 'implicit', refusal: null });
    }
    // Closures keep more beside the network on either layout.
    expect(bytes('closures', 'explicit')).toBeGreaterThan(bytes('release-order', 'explicit'));
    expect(bytes('closures', 'implicit')).toBeGreaterThan(bytes('release-order', 'implicit'));
    expect(chooseSearchLayout('release-order', problem, { maxExpandedArcs: arcs, maxBytes: bytes('release-order', 'implicit') - 1 }).layout).toBeNull();
    const refused = chooseSearchLayout('closures', problem, { maxExpandedArcs: arcs, maxBytes: bytes('closures', 'implicit') - 1 });
    expect(refused.layout).toBeNull();
    expect(refused.refusal).toMatch(/At a time step of 90 seconds it fits/);
    // The arcs count too.
    expect(chooseSearchLayout('zone-routes', problem, { maxExpandedArcs: 465 * 61 - 1, maxBytes: 2 ** 40 }).layout).toBeNull();
  });

  it('words the refusal with what the search builds and what stays available', () => {
    const refused = chooseSearchLayout('zone-routes', problem, { maxExpandedArcs: 465 * 30, maxBytes: 2 ** 40 });
    const reason = searchTooLargeReason('zone-routes', refused.refusal!);
    expect(reason).toMatch(/^Following where each zone goes solves the evacuation over time/);
    expect(reason).toMatch(/shorten the horizon|time step of/);
    expect(reason).toMatch(/added lanes do not look over time/);
  });
});

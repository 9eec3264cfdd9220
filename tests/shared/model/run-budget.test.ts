// The run budget in arcs and bytes, and the refusal that offers a coarser step. Sizes are worked
// by hand from the formula (a copy of every directed road and a waiting arc at every junction per
// step); the formula is checked against the engine's own expanded network on a small grid.
import { describe, expect, it } from 'vitest';
import { expandOverTime, type EvacuationRoad } from '../../../shared/flow';
import { budgetRefusal, BYTES_PER_EXPANDED_ARC, BYTES_PER_EXPANDED_NODE, expandedSize } from '../../../shared/model/run-budget';

const GIB = 2 ** 30;
// The generated county (tests/bench/county/README.md): 90,000 junctions, 358,216 directed roads.
const county = { nodeCount: 90_000, roads: 358_216 };
const budget = { maxExpandedArcs: 70_000_000, maxBytes: 4 * GIB };

describe('run budget', () => {
  it('sizes the county at 60 s over 6 h: 161.8 million arcs, refused', () => {
    const size = expandedSize(county.nodeCount, county.roads, 360);
    expect(size.arcs).toBe(448_216 * 361);
    expect(size.bytes).toBe(448_216 * 361 * BYTES_PER_EXPANDED_ARC + 90_000 * 361 * BYTES_PER_EXPANDED_NODE);
    const refusal = budgetRefusal(county, { horizonMinutes: 360, timeStepSeconds: 60 }, budget)!;
    expect(refusal).toContain('about 161.8 million time-expanded arcs');
    expect(refusal).toContain("this server's budget of 70.0 million arcs and 4.0 GB");
  });

  it('offers the shortest coarser step that fits, with what it changes, and the horizon that fits at the present step', () => {
    // 90 s: 241 layers × 448,216 = 108.0 M arcs; 2 min: 181 × 448,216 = 81.1 M (over 70 M);
    // 3 min: 121 × 448,216 = 54,234,136 arcs, × 10 + 10,890,000 nodes × 22 bytes = 781,921,360 bytes = 746 MiB: fits.
    const refusal = budgetRefusal(county, { horizonMinutes: 360, timeStepSeconds: 60 }, budget)!;
    expect(refusal).toContain('At a time step of 3 minutes it fits (at most 54.2 million arcs, 746 MB)');
    expect(refusal).toContain('fastest trips stay within 3 minutes of free flow (instead of 1 minute)');
    // The bound holds for fastest routes to the nearest shelter only (docs/model.md §1): say so.
    expect(refusal).toContain('on the way to the nearest shelter or exit (other trips can drift further');
    expect(refusal).toContain('counted in whole 3-minute steps');
    // 70 M / 448,216 = 156 layers; 4 GiB / (448,216 × 10 + 90,000 × 22) = 664 layers → 155 steps of 1 minute.
    expect(refusal).toContain('shorten the horizon to at most 155 minutes');
  });

  it('lets a run that fits through, and says so when no step up to an hour fits', () => {
    expect(budgetRefusal(county, { horizonMinutes: 360, timeStepSeconds: 180 }, budget)).toBeNull();
    const tiny = { maxExpandedArcs: 1000, maxBytes: GIB };
    expect(budgetRefusal(county, { horizonMinutes: 360, timeStepSeconds: 60 }, tiny, 'more than')).toMatch(/^This analysis would need more than .* No time step up to one hour fits/);
  });

  it('the formula bounds the engine’s own expanded network on a small grid from above, within 10 % of it with every copy built', () => {
    const n = 12;
    const roads: EvacuationRoad[] = [];
    const id = (x: number, y: number) => y * n + x;
    for (let y = 0; y < n; y++)
      for (let x = 0; x < n; x++) {
        if (x + 1 < n) roads.push({ from: id(x, y), to: id(x + 1, y), capacityVehPerHour: 600, travelTimeSeconds: 40 }, { from: id(x + 1, y), to: id(x, y), capacityVehPerHour: 600, travelTimeSeconds: 40 });
        if (y + 1 < n) roads.push({ from: id(x, y), to: id(x, y + 1), capacityVehPerHour: 600, travelTimeSeconds: 40 }, { from: id(x, y + 1), to: id(x, y), capacityVehPerHour: 600, travelTimeSeconds: 40 });
      }
    const T = 30;
    const problem = {
      nodeCount: n * n,
      roads,
      zones: [{ id: 'z', entryNodes: [0], vehicles: 100 }],
      shelters: [{ id: 's', node: n * n - 1, capacityVehicles: null }],
      timeStepSeconds: 60,
      horizonSteps: T,
    };
    // Per step: one entry node + 2 for the zone, 2 for the shelter (as build-run-input counts them).
    const estimate = expandedSize(n * n, roads.length, T, 1 + 2 + 2).arcs;
    // Every copy built: the formula is close. Copies no zone reaches in time or that reach no
    // shelter by T left out (the default): smaller still, so the formula stays an upper bound.
    const full = expandOverTime(problem, { prune: false });
    expect(full.network.arcCount).toBeLessThanOrEqual(estimate);
    expect(full.network.arcCount).toBeGreaterThan(0.9 * estimate);
    expect(expandOverTime(problem).network.arcCount).toBeLessThan(full.network.arcCount);
  });
});

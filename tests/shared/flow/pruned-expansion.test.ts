// The time-expanded network leaves out the arcs of node copies that no zone reaches by their step
// or that reach no shelter by the horizon (shared/flow/step-window.ts), and writes its arcs in
// place instead of through a list. The explicit network with every copy is the oracle: on random
// problems with closures, storage, departure schedules, release rates and shelter intake and
// totals, the pruned network must give the same maximum flow at every horizon and the same minimum
// cut (the same bottleneck report), and the in-place layout must be exactly the one the generic
// builder (buildNetworkFromArrays) makes from the same arcs. The plan's read-out walks the flow on
// the residual itself and must leave it as it found it. The curve itself is checked against
// glpk.js in time-expanded-lp.test.ts, which now runs on the pruned network.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  arcCapacity,
  arcHead,
  arcTail,
  buildNetworkFromArrays,
  computeEvacuationCurve,
  createFlowState,
  decomposeTrips,
  expandOverTime,
  timeExpandedBottlenecks,
  type MaxFlowAlgorithm,
} from '../../../shared/flow';
import { randomEvacuation } from './support/random-evacuations';

const demandOf = (problem: { zones: readonly { vehicles: number }[] }): number => problem.zones.reduce((s, z) => s + z.vehicles, 0);

describe('the pruned time-expanded network', () => {
  it('gives the explicit network\'s maximum flow at every horizon and its minimum cut', () => {
    let prunedSomething = 0;
    fc.assert(
      fc.property(
        randomEvacuation({ maxNodes: 8, maxRoads: 10, maxHorizon: 14 }),
        fc.constantFrom<MaxFlowAlgorithm>('incremental-bfs', 'boykov-kolmogorov', 'edmonds-karp'),
        (problem, algorithm) => {
          const full = expandOverTime(problem, { prune: false });
          const pruned = expandOverTime(problem);
          expect(pruned.network.nodeCount).toBe(full.network.nodeCount);
          expect(pruned.network.arcCount).toBeLessThanOrEqual(full.network.arcCount);
          if (pruned.network.arcCount < full.network.arcCount) prunedSomething++;
          const demand = demandOf(problem);
          const a = computeEvacuationCurve(full, demand, createFlowState(full.network), { algorithm: 'edmonds-karp' });
          const b = computeEvacuationCurve(pruned, demand, createFlowState(pruned.network), { algorithm });
          expect(b.deliveredByStep).toEqual(a.deliveredByStep);
          expect(b.clearanceStep).toBe(a.clearanceStep);
          expect(b.cutHorizon).toBe(a.cutHorizon);
          const cutA = timeExpandedBottlenecks(full, a.takeCutResidual(), a.cutHorizon);
          const cutB = timeExpandedBottlenecks(pruned, b.takeCutResidual(), b.cutHorizon);
          expect(cutB).toEqual(cutA);
        },
      ),
      { numRuns: 400, seed: 1403 },
    );
    // The generator's zones start late, sit far from shelters or cannot reach one often enough
    // for the pruning to be exercised.
    expect(prunedSomething).toBeGreaterThan(100);
  }, 120_000);

  it('lays the arcs out exactly as the generic builder does from the same list', () => {
    fc.assert(
      fc.property(randomEvacuation({ maxNodes: 6, maxRoads: 10, maxHorizon: 8 }), fc.boolean(), (problem, prune) => {
        const { network } = expandOverTime(problem, { prune });
        const m = network.arcCount;
        const tails = new Int32Array(m);
        const heads = new Int32Array(m);
        const caps = new Int32Array(m);
        for (let i = 0; i < m; i++) {
          tails[i] = arcTail(network, i);
          heads[i] = arcHead(network, i);
          caps[i] = arcCapacity(network, i);
        }
        const generic = buildNetworkFromArrays(network.nodeCount, tails, heads, caps);
        expect(Array.from(network.firstOut)).toEqual(Array.from(generic.firstOut));
        expect(Array.from(network.head)).toEqual(Array.from(generic.head));
        expect(Array.from(network.mate)).toEqual(Array.from(generic.mate));
        expect(Array.from(network.capacity)).toEqual(Array.from(generic.capacity));
        expect(Array.from(network.residualOfArc)).toEqual(Array.from(generic.residualOfArc));
      }),
      { numRuns: 200, seed: 1404 },
    );
  }, 120_000);

  it('decomposes the plan into trips without leaving a trace on the residual it reads', () => {
    let withTrips = 0;
    fc.assert(
      fc.property(randomEvacuation({ maxNodes: 7, maxRoads: 10, maxHorizon: 10 }), (problem) => {
        const expanded = expandOverTime(problem);
        const state = createFlowState(expanded.network);
        const curve = computeEvacuationCurve(expanded, demandOf(problem), state, { algorithm: 'incremental-bfs' });
        const before = Array.from(state.residual);
        const trips = decomposeTrips(expanded, state, problem.zones.length, problem.shelters.length);
        expect(Array.from(state.residual)).toEqual(before);
        expect(trips.zoneDelivered.reduce((a, b) => a + b, 0)).toBe(curve.deliveredByStep[curve.finalHorizon]);
        if (trips.assignments.length > 0) withTrips++;
      }),
      { numRuns: 200, seed: 1406 },
    );
    expect(withTrips).toBeGreaterThan(50);
  }, 120_000);
});

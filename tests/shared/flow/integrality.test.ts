// The integrality property (Ford & Fulkerson 1956; common practice to check): with integral
// capacities the linear relaxation's optimum (glpk.js, fractional flows allowed) equals the best
// integral flow (glpk.js as an integer program). Every algorithm must reach that optimum with
// a flow that this test checks itself, arc by arc, in the JSON form the server stores: whole
// vehicles within 0..capacity on every arc, conservation at every other node, and the value
// equal to the source's net outflow. The evacuation result's vehicle counts, which the engine
// sums and decomposes from the expanded flow, must be whole and add up as well.
import fc from 'fast-check';
import { beforeAll, describe, expect, it } from 'vitest';
import { MAX_FLOW_ALGORITHMS, buildNetwork, maxFlow, maxFlowResultToJson, solveEvacuation } from '../../../shared/flow';
import { loadGlpk, solveFlowLp, type Glpk } from './support/glpk';
import { randomEvacuation } from './support/random-evacuations';
import { randomGraph } from './support/random-graphs';

let glpk: Glpk;
beforeAll(async () => {
  glpk = await loadGlpk();
});

describe('integrality', () => {
  it('each algorithm returns a feasible integral flow at the LP optimum, which equals the integer-program optimum', () => {
    fc.assert(
      fc.property(randomGraph({ unbounded: false, maxCapacity: 9 }), (graph) => {
        const relaxed = solveFlowLp(glpk, graph.nodeCount, graph.arcs, graph.source, graph.sink);
        const integer = solveFlowLp(glpk, graph.nodeCount, graph.arcs, graph.source, graph.sink, 1, true);
        expect(Math.abs(relaxed.value - integer.value)).toBeLessThan(1e-6);
        const network = buildNetwork(graph.nodeCount, graph.arcs);
        for (const algorithm of MAX_FLOW_ALGORITHMS) {
          const json = maxFlowResultToJson(maxFlow(network, graph.source, graph.sink, { algorithm }));
          const parsed = JSON.parse(JSON.stringify(json)) as typeof json;
          expect(parsed.flow).toHaveLength(graph.arcs.length);
          const balance = new Array<number>(graph.nodeCount).fill(0);
          graph.arcs.forEach((arc, i) => {
            const f = parsed.flow[i]!;
            expect(Number.isInteger(f) && f >= 0 && f <= arc.capacity).toBe(true);
            balance[arc.from]! -= f;
            balance[arc.to]! += f;
          });
          balance.forEach((b, v) => {
            if (v !== graph.source && v !== graph.sink) expect(b).toBe(0);
          });
          expect(0 - balance[graph.source]!).toBe(parsed.value);
          expect(parsed.value).toBe(Math.round(relaxed.value));
        }
      }),
      { numRuns: 200, seed: 1958 },
    );
  }, 120_000);

  it('evacuation results count whole vehicles that add up', () => {
    fc.assert(
      fc.property(randomEvacuation(), (problem) => {
        const result = solveEvacuation(problem, { algorithm: 'incremental-bfs' });
        const whole = (x: number): boolean => Number.isInteger(x) && x >= 0;
        expect(result.curve.deliveredVehiclesByStep.every(whole)).toBe(true);
        const { plan } = result;
        expect(plan.zones.every((z) => whole(z.deliveredVehicles) && whole(z.releasedVehicles))).toBe(true);
        expect(plan.shelters.every((s) => whole(s.arrivedVehicles))).toBe(true);
        expect(plan.assignments.every((a) => whole(a.vehicles) && a.vehicles > 0)).toBe(true);
        expect(plan.roads.totalVehicles.every(whole)).toBe(true);
        const sum = (xs: number[]): number => xs.reduce((a, b) => a + b, 0);
        expect(sum(plan.zones.map((z) => z.deliveredVehicles))).toBe(plan.deliveredVehicles);
        expect(sum(plan.shelters.map((s) => s.arrivedVehicles))).toBe(plan.deliveredVehicles);
        expect(sum(plan.assignments.map((a) => a.vehicles))).toBe(plan.deliveredVehicles);
      }),
      { numRuns: 150, seed: 1956 },
    );
  }, 120_000);

  it('rejects fractional capacities instead of rounding them silently', () => {
    expect(() => buildNetwork(2, [{ from: 0, to: 1, capacity: 1.5 }])).toThrow(/not an integer/);
  });
});

// The integrality property (Ford & Fulkerson; common practice to check): with integral
// capacities some maximum flow is integral, i.e. the optimum of the linear relaxation solved by
// glpk.js (fractional flows allowed) equals the best integral flow, which glpk.js also finds as
// an integer program. Our flows are integral on every arc (checked on the JSON form the server
// stores, where nothing forces integers) and reach that same optimum.
import fc from 'fast-check';
import { beforeAll, describe, expect, it } from 'vitest';
import { MAX_FLOW_ALGORITHMS, buildNetwork, maxFlow, maxFlowResultToJson } from '../../../shared/flow';
import { loadGlpk, solveFlowLp, type Glpk } from './support/glpk';
import { randomGraph } from './support/random-graphs';

let glpk: Glpk;
beforeAll(async () => {
  glpk = await loadGlpk();
});

describe('integrality', () => {
  it('integral flows reach the fractional LP optimum, which equals the integer-program optimum', () => {
    fc.assert(
      fc.property(randomGraph({ unbounded: false, maxCapacity: 9 }), (graph) => {
        const relaxed = solveFlowLp(glpk, graph.nodeCount, graph.arcs, graph.source, graph.sink);
        const integer = solveFlowLp(glpk, graph.nodeCount, graph.arcs, graph.source, graph.sink, 1, true);
        expect(Math.abs(relaxed.value - integer.value)).toBeLessThan(1e-6);
        const network = buildNetwork(graph.nodeCount, graph.arcs);
        for (const algorithm of MAX_FLOW_ALGORITHMS) {
          const json = maxFlowResultToJson(maxFlow(network, graph.source, graph.sink, { algorithm }));
          const parsed = JSON.parse(JSON.stringify(json)) as typeof json;
          for (const f of parsed.flow) expect(Number.isInteger(f)).toBe(true);
          expect(parsed.value).toBe(Math.round(relaxed.value));
        }
      }),
      { numRuns: 200, seed: 1958 },
    );
  });

  it('rejects fractional capacities instead of rounding them silently', () => {
    expect(() => buildNetwork(2, [{ from: 0, to: 1, capacity: 1.5 }])).toThrow(/not an integer/);
  });
});

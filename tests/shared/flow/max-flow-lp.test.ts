// Outside reference: glpk.js solves maximum flow as the linear program it is (maximise the net
// outflow of s subject to 0 ≤ x ≤ u and conservation). On hundreds of random graphs
// (fast-check) every algorithm must reach the LP optimum, its minimum cut must have exactly that
// capacity, verify() must accept the result, and all algorithms must report the same cut.
import fc from 'fast-check';
import { beforeAll, describe, expect, it } from 'vitest';
import { MAX_FLOW_ALGORITHMS, buildNetwork, maxFlow, verify } from '../../../shared/flow';
import { loadGlpk, solveFlowLp, type Glpk } from './support/glpk';
import { randomGraph } from './support/random-graphs';

let glpk: Glpk;
beforeAll(async () => {
  glpk = await loadGlpk();
});

describe('maximum flow against the glpk.js linear program', () => {
  it('matches the LP value and cut capacity for every algorithm on random graphs', () => {
    fc.assert(
      fc.property(randomGraph(), (graph) => {
        const network = buildNetwork(graph.nodeCount, graph.arcs);
        const lp = solveFlowLp(glpk, graph.nodeCount, graph.arcs, graph.source, graph.sink);
        const sides = new Set<string>();
        for (const algorithm of MAX_FLOW_ALGORITHMS) {
          const result = maxFlow(network, graph.source, graph.sink, { algorithm });
          expect(result.value).toBe(Math.round(lp.value));
          expect(Math.abs(result.value - lp.value)).toBeLessThan(1e-6 * Math.max(1, lp.value));
          expect(result.minCut.capacity).toBe(result.value);
          expect(verify(network, result).problems).toEqual([]);
          sides.add([...result.minCut.sourceSide].join(''));
        }
        expect(sides.size).toBe(1);
      }),
      { numRuns: 300, seed: 20261201 },
    );
  });

  it('also matches on denser graphs with larger capacities', () => {
    fc.assert(
      fc.property(randomGraph({ maxNodes: 25, maxArcs: 120, maxCapacity: 1000, unbounded: false }), (graph) => {
        const network = buildNetwork(graph.nodeCount, graph.arcs);
        const lp = solveFlowLp(glpk, graph.nodeCount, graph.arcs, graph.source, graph.sink);
        for (const algorithm of MAX_FLOW_ALGORITHMS) {
          const result = maxFlow(network, graph.source, graph.sink, { algorithm });
          expect(result.value).toBe(Math.round(lp.value));
          expect(verify(network, result).ok).toBe(true);
        }
      }),
      { numRuns: 150, seed: 7 },
    );
  });

  it('matches with bundles of at least n parallel and antiparallel arcs, shuffled', () => {
    // A node may then have more residual arcs to one child than the graph has nodes (an
    // incremental-BFS repair once dropped children past that count and never finished).
    fc.assert(
      fc.property(randomGraph({ maxNodes: 10, maxArcs: 25, maxCapacity: 4, bundles: 2 }), (graph) => {
        const network = buildNetwork(graph.nodeCount, graph.arcs);
        const lp = solveFlowLp(glpk, graph.nodeCount, graph.arcs, graph.source, graph.sink);
        for (const algorithm of MAX_FLOW_ALGORITHMS) {
          const result = maxFlow(network, graph.source, graph.sink, { algorithm });
          expect(result.value).toBe(Math.round(lp.value));
          expect(verify(network, result).problems).toEqual([]);
        }
      }),
      { numRuns: 300, seed: 1411 },
    );
  }, 120_000);
});

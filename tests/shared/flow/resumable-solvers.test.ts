// The tree-based solvers resume after capacity grows (more nodes visible, or one arc raised)
// and after save/restore; each resumed answer must equal a fresh Edmonds–Karp run (the
// reference) on the changed network, and the final flow must pass verify().
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  UNBOUNDED_CAPACITY,
  buildNetwork,
  createBoykovKolmogorov,
  createFlowState,
  createIncrementalBfs,
  maxFlow,
  minimumCut,
  netOutflow,
  verify,
  arcFlows,
  emptyStats,
  type FlowNetwork,
} from '../../../shared/flow';

import { randomGraph } from './support/random-graphs';

const factories = {
  'incremental-bfs': (n: FlowNetwork, r: Int32Array, s: number, t: number, limit: number) => createIncrementalBfs(n, r, s, t, limit, 2),
  'boykov-kolmogorov': createBoykovKolmogorov,
};

describe('resumable solvers', () => {
  for (const [name, create] of Object.entries(factories)) {
    it(`${name}: growing the node limit step by step gives each prefix's maximum`, () => {
      fc.assert(
        fc.property(fc.oneof(randomGraph({ maxNodes: 12, maxArcs: 45 }), randomGraph({ maxNodes: 9, maxArcs: 20, bundles: 2 })), (graph) => {
          const network = buildNetwork(graph.nodeCount, graph.arcs);
          // Sink 1 and source 0 are in every prefix 0..limit − 1 with limit ≥ 2.
          const source = 0;
          const sink = 1;
          const state = createFlowState(network);
          const solver = create(network, state.residual, source, sink, 2);
          for (let limit = 2; limit <= graph.nodeCount; limit++) {
            if (limit > 2) solver.extendNodeLimit(limit);
            solver.maximise(emptyStats());
            const fresh = maxFlow(network, source, sink, { algorithm: 'edmonds-karp', nodeLimit: limit });
            expect(netOutflow(network, state, source, limit)).toBe(fresh.value);
          }
          const value = netOutflow(network, state, source);
          const report = verify(network, { source, sink, value, flow: arcFlows(network, state), minCut: minimumCut(network, state.residual, source) });
          expect(report.problems).toEqual([]);
        }),
        { numRuns: 250, seed: 42 },
      );
    });
  }

  it('incremental-bfs: raise, maximise, restore gives every what-if and then the original again', () => {
    fc.assert(
      fc.property(fc.oneof(randomGraph({ maxNodes: 10, maxArcs: 35, unbounded: false }), randomGraph({ maxNodes: 8, maxArcs: 15, unbounded: false, bundles: 1 })), fc.array(fc.tuple(fc.nat(), fc.integer({ min: 1, max: 9 })), { minLength: 1, maxLength: 5 }), (graph, raises) => {
        if (graph.arcs.length === 0) return;
        const network = buildNetwork(graph.nodeCount, graph.arcs);
        const state = createFlowState(network);
        const solver = createIncrementalBfs(network, state.residual, graph.source, graph.sink, graph.nodeCount, 2);
        solver.maximise(emptyStats());
        const base = netOutflow(network, state, graph.source);
        const saved = solver.save();
        for (const [pick, amount] of raises) {
          const arc = pick % graph.arcs.length;
          solver.raiseCapacity(network.residualOfArc[arc]!, amount);
          const added = solver.maximise(emptyStats());
          const changed = graph.arcs.map((a, i) => (i === arc ? { ...a, capacity: a.capacity + amount } : a));
          const expected = maxFlow(buildNetwork(graph.nodeCount, changed), graph.source, graph.sink, { algorithm: 'edmonds-karp' }).value;
          expect(base + added).toBe(expected);
          solver.restore(saved);
          expect(netOutflow(network, state, graph.source)).toBe(base);
        }
      }),
      { numRuns: 200, seed: 9 },
    );
  });

  for (const [name, create] of Object.entries(factories)) {
    it(`${name}: raising a capacity stops at UNBOUNDED_CAPACITY instead of wrapping the Int32 residual`, () => {
      // s → a of 2³¹ − 2, a → t without limit. Raised by 10 before or after the flow, s → a has
      // no limit either: the maximum is UNBOUNDED_CAPACITY, and no residual turns negative.
      for (const raiseFirst of [true, false]) {
        const network = buildNetwork(3, [
          { from: 0, to: 1, capacity: UNBOUNDED_CAPACITY - 1 },
          { from: 1, to: 2, capacity: UNBOUNDED_CAPACITY },
        ]);
        const state = createFlowState(network);
        const solver = create(network, state.residual, 0, 2, 3);
        const r = network.residualOfArc[0]!;
        // maximise() returns the flow it added (netOutflow would read the network's recorded capacity).
        let value = raiseFirst ? 0 : solver.maximise(emptyStats());
        if (!raiseFirst) expect(value).toBe(UNBOUNDED_CAPACITY - 1);
        solver.raiseCapacity(r, 10);
        value += solver.maximise(emptyStats());
        expect(value).toBe(UNBOUNDED_CAPACITY);
        expect(state.residual[network.mate[r]!]).toBe(UNBOUNDED_CAPACITY);
        for (const residual of state.residual) expect(residual).toBeGreaterThanOrEqual(0);
        expect(state.residual[r]! + state.residual[network.mate[r]!]!).toBe(UNBOUNDED_CAPACITY);
      }
    });
  }

  it('incremental-bfs: label buckets grow past their initial size on a long path', () => {
    const n = 300;
    const arcs = Array.from({ length: n - 1 }, (_, i) => ({ from: i, to: i + 1, capacity: 1 + (i % 3) }));
    const network = buildNetwork(n, arcs);
    const state = createFlowState(network);
    createIncrementalBfs(network, state.residual, 0, n - 1, n, 2).maximise(emptyStats());
    expect(netOutflow(network, state, 0)).toBe(1);
  });
});

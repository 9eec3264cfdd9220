// The digraph core and the front door: input checks, the unbounded stand-in, the overflow guard,
// node limits and warm starts (common practice; values checked by hand).
import { describe, expect, it } from 'vitest';
import {
  FlowInputError,
  FlowOverflowError,
  FlowAbortedError,
  MAX_FLOW_ALGORITHMS,
  UNBOUNDED_CAPACITY,
  arcCapacity,
  arcHead,
  arcTail,
  buildNetwork,
  buildNetworkFromArrays,
  createFlowState,
  maxFlow,
  verify,
} from '../../../shared/flow';

describe('buildNetwork', () => {
  it('keeps arc order, including parallel, antiparallel and self-loop arcs', () => {
    const arcs = [
      { from: 0, to: 1, capacity: 3 },
      { from: 0, to: 1, capacity: 2 },
      { from: 1, to: 0, capacity: 4 },
      { from: 1, to: 1, capacity: 9 },
      { from: 1, to: 2, capacity: 10 },
    ];
    const network = buildNetwork(3, arcs);
    expect(network.arcCount).toBe(5);
    arcs.forEach((arc, i) => {
      expect([arcTail(network, i), arcHead(network, i), arcCapacity(network, i)]).toEqual([arc.from, arc.to, arc.capacity]);
    });
    for (const algorithm of MAX_FLOW_ALGORITHMS) {
      const result = maxFlow(network, 0, 2, { algorithm });
      expect(result.value).toBe(5);
      expect(result.flow[3]).toBe(0); // a self-loop never carries flow
      expect(verify(network, result).ok).toBe(true);
    }
  });

  it('rejects nodes out of range and invalid capacities, naming the arc', () => {
    expect(() => buildNetwork(2, [{ from: 0, to: 2, capacity: 1 }])).toThrow(/arc 0: to node 2/);
    expect(() => buildNetwork(2, [{ from: 0, to: 1, capacity: -1 }])).toThrow(FlowInputError);
    expect(() => buildNetwork(2, [{ from: 0, to: 1, capacity: UNBOUNDED_CAPACITY + 1 }])).toThrow(/UNBOUNDED_CAPACITY/);
  });
});

describe('maxFlow', () => {
  it('flags a source–sink connection through unbounded arcs only', () => {
    const network = buildNetwork(3, [
      { from: 0, to: 1, capacity: UNBOUNDED_CAPACITY },
      { from: 1, to: 2, capacity: UNBOUNDED_CAPACITY },
    ]);
    for (const algorithm of MAX_FLOW_ALGORITHMS) {
      const result = maxFlow(network, 0, 2, { algorithm });
      expect(result.unbounded).toBe(true);
      expect(result.value).toBe(UNBOUNDED_CAPACITY);
    }
    const bounded = buildNetwork(3, [
      { from: 0, to: 1, capacity: UNBOUNDED_CAPACITY },
      { from: 1, to: 2, capacity: 7 },
    ]);
    expect(maxFlow(bounded, 0, 2).unbounded).toBe(false);
  });

  it('refuses a source whose outgoing capacity cannot be summed exactly in a double', () => {
    // 2^22 + 1 unbounded arcs leave the source: (2^31 − 1)·(2^22 + 1) > 2^53 − 1.
    const count = 2 ** 22 + 1;
    const network = buildNetworkFromArrays(2, new Int32Array(count), new Int32Array(count).fill(1), new Int32Array(count).fill(UNBOUNDED_CAPACITY));
    expect(() => maxFlow(network, 0, 1)).toThrow(FlowOverflowError);
  });

  it('checks its terminals', () => {
    const network = buildNetwork(2, [{ from: 0, to: 1, capacity: 1 }]);
    expect(() => maxFlow(network, 0, 0)).toThrow(/must differ/);
    expect(() => maxFlow(network, 0, 2)).toThrow(/sink 2/);
    expect(() => maxFlow(network, 0, 1, { nodeLimit: 1 })).toThrow(/sink 1/);
  });

  it('ignores nodes at or above nodeLimit', () => {
    // With nodeLimit 3 node 3 is invisible, so only 0 → 1 → 2 (capacity 2) remains.
    const network = buildNetwork(4, [
      { from: 0, to: 1, capacity: 2 },
      { from: 1, to: 2, capacity: 2 },
      { from: 0, to: 3, capacity: 5 },
      { from: 3, to: 2, capacity: 5 },
    ]);
    for (const algorithm of MAX_FLOW_ALGORITHMS) {
      expect(maxFlow(network, 0, 2, { algorithm, nodeLimit: 3 }).value).toBe(2);
      expect(maxFlow(network, 0, 2, { algorithm }).value).toBe(7);
      const limited = maxFlow(network, 0, 2, { algorithm, nodeLimit: 3 });
      expect(verify(network, limited).ok).toBe(true);
    }
  });

  it('continues from a given flow state (warm start) to the same maximum', () => {
    const network = buildNetwork(4, [
      { from: 0, to: 1, capacity: 2 },
      { from: 1, to: 2, capacity: 2 },
      { from: 0, to: 3, capacity: 5 },
      { from: 3, to: 2, capacity: 5 },
    ]);
    for (const algorithm of MAX_FLOW_ALGORITHMS) {
      const state = createFlowState(network);
      expect(maxFlow(network, 0, 2, { algorithm, state, nodeLimit: 3 }).value).toBe(2);
      const resumed = maxFlow(network, 0, 2, { algorithm, state });
      expect(resumed.value).toBe(7);
      expect(verify(network, resumed).ok).toBe(true);
    }
  });

  it('measures time only with a clock, and stops when asked', () => {
    const network = buildNetwork(2, [{ from: 0, to: 1, capacity: 1 }]);
    expect(maxFlow(network, 0, 1).stats.elapsedMs).toBeUndefined();
    let tick = 0;
    expect(maxFlow(network, 0, 1, { now: () => (tick += 5) }).stats.elapsedMs).toBe(5);
    for (const algorithm of ['edmonds-karp', 'dinic'] as const) {
      expect(() => maxFlow(network, 0, 1, { algorithm, shouldAbort: () => true })).toThrow(FlowAbortedError);
    }
  });

  it('regression: a child reached by two parallel arcs is repaired once (incremental-bfs hung)', () => {
    const arcs = [[4, 3, 5], [5, 4, 1], [0, 5, 8], [0, 1, 4], [2, 0, 9], [2, 3, 0], [4, 2, 1], [0, 4, 5], [3, 5, 7], [2, 5, 7], [0, 5, 9], [2, 0, 3], [4, 5, 9], [3, 0, 8], [5, 2, 1], [0, 4, 5], [2, 4, 4]].map(([from, to, capacity]) => ({ from: from!, to: to!, capacity: capacity! }));
    const network = buildNetwork(6, arcs);
    const reference = maxFlow(network, 0, 5, { algorithm: 'edmonds-karp' }).value;
    const result = maxFlow(network, 0, 5, { algorithm: 'incremental-bfs' });
    expect(result.value).toBe(reference);
    expect(verify(network, result).ok).toBe(true);
  });
});

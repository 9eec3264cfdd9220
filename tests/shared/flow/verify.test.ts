// verify() is the certificate check (networkx validate_flows/validate_cuts): it must accept
// every correct result and catch each kind of defect planted in one.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { buildNetwork, maxFlow, verify, type MaxFlowResult } from '../../../shared/flow';
import { randomGraph } from './support/random-graphs';

const clone = (result: MaxFlowResult) => ({
  ...result,
  flow: result.flow.slice(),
  minCut: { ...result.minCut, sourceSide: result.minCut.sourceSide.slice() },
});

describe('verify', () => {
  const network = buildNetwork(4, [
    { from: 0, to: 1, capacity: 3 },
    { from: 0, to: 2, capacity: 2 },
    { from: 1, to: 3, capacity: 2 },
    { from: 2, to: 3, capacity: 3 },
    { from: 1, to: 2, capacity: 1 },
  ]);
  const good = maxFlow(network, 0, 3);

  it('accepts a maximum flow with its cut', () => {
    expect(good.value).toBe(5);
    expect(verify(network, good)).toEqual({ ok: true, problems: [] });
  });

  it('catches a flow above capacity', () => {
    const bad = clone(good);
    bad.flow[2] = 3;
    expect(verify(network, bad).problems.join('\n')).toMatch(/outside \[0, 2\]/);
  });

  it('catches broken conservation', () => {
    const bad = clone(good);
    bad.flow[4] = bad.flow[4]! === 0 ? 1 : 0;
    expect(verify(network, bad).problems.join('\n')).toMatch(/node 1: inflow − outflow/);
  });

  it('catches a wrong value', () => {
    expect(verify(network, { ...good, value: 6 }).problems.join('\n')).toMatch(/value 6 but the source sends 5/);
  });

  it('catches a set that is not a minimum cut', () => {
    const bad = clone(good);
    bad.minCut.sourceSide.fill(0);
    bad.minCut.sourceSide[0] = 1;
    bad.minCut.sourceSide[1] = 1;
    bad.minCut.sourceSide[2] = 1;
    bad.minCut.sourceSide[3] = 1;
    expect(verify(network, bad).ok).toBe(false);
  });

  it('catches a non-integral flow', () => {
    const bad = { ...good, flow: Array.from(good.flow, (f, i) => (i === 0 ? f + 0.5 : f)) };
    expect(verify(network, bad).ok).toBe(false);
  });

  it('rejects any single-arc change of a random maximum flow', () => {
    fc.assert(
      fc.property(randomGraph({ unbounded: false }), fc.nat(), fc.constantFrom(-1, 1), (graph, pick, delta) => {
        const net = buildNetwork(graph.nodeCount, graph.arcs);
        const result = maxFlow(net, graph.source, graph.sink);
        if (graph.arcs.length === 0) return;
        const arc = pick % graph.arcs.length;
        const isSelfLoop = graph.arcs[arc]!.from === graph.arcs[arc]!.to;
        const changed = clone(result);
        changed.flow[arc] = changed.flow[arc]! + delta;
        // A self-loop can carry anything within capacity without breaking conservation.
        if (isSelfLoop && changed.flow[arc]! >= 0 && changed.flow[arc]! <= graph.arcs[arc]!.capacity) return;
        expect(verify(net, changed).ok).toBe(false);
      }),
      { numRuns: 300, seed: 3 },
    );
  });
});

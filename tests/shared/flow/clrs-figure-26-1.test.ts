// Cormen, Leiserson, Rivest & Stein, Introduction to Algorithms, 3rd ed., Figure 26.1: maximum
// flow 23; a minimum cut is S = {s, v1, v2, v4} with cut arcs v1→v3, v4→v3, v4→t (12 + 7 + 4),
// as transcribed in docs/model.md §6. The 2nd edition adds v1→v2 with capacity 10; same answer.
import { describe, expect, it } from 'vitest';
import { MAX_FLOW_ALGORITHMS, arcHead, arcTail, buildNetwork, maxFlow, verify } from '../../../shared/flow';

const [s, v1, v2, v3, v4, t] = [0, 1, 2, 3, 4, 5];
const third = [
  { from: s, to: v1, capacity: 16 },
  { from: s, to: v2, capacity: 13 },
  { from: v2, to: v1, capacity: 4 },
  { from: v1, to: v3, capacity: 12 },
  { from: v3, to: v2, capacity: 9 },
  { from: v2, to: v4, capacity: 14 },
  { from: v4, to: v3, capacity: 7 },
  { from: v3, to: t, capacity: 20 },
  { from: v4, to: t, capacity: 4 },
];
const second = [...third, { from: v1, to: v2, capacity: 10 }];

describe('CLRS 3rd ed. Figure 26.1', () => {
  for (const algorithm of ['auto', ...MAX_FLOW_ALGORITHMS] as const) {
    it(`has maximum flow 23 and the book's minimum cut (${algorithm})`, () => {
      const network = buildNetwork(6, third);
      const result = maxFlow(network, s, t, { algorithm });
      expect(result.value).toBe(23);
      expect(verify(network, result)).toEqual({ ok: true, problems: [] });
      const side = [...result.minCut.sourceSide].flatMap((inSide, v) => (inSide ? [v] : []));
      expect(side).toEqual([s, v1, v2, v4]);
      const cut = [...result.minCut.cutArcs].map((arc) => [arcTail(network, arc), arcHead(network, arc)]);
      expect(cut).toEqual([
        [v1, v3],
        [v4, v3],
        [v4, t],
      ]);
      expect(result.minCut.capacity).toBe(12 + 7 + 4);
      expect(result.unbounded).toBe(false);
    });
  }

  it('keeps the value 23 with the 2nd edition arc v1→v2 (every algorithm)', () => {
    const network = buildNetwork(6, second);
    for (const algorithm of MAX_FLOW_ALGORITHMS) {
      const result = maxFlow(network, s, t, { algorithm });
      expect(result.value).toBe(23);
      expect(verify(network, result).ok).toBe(true);
    }
  });

  it("uses Edmonds–Karp below the size threshold, as 'auto'", () => {
    expect(maxFlow(buildNetwork(6, third), s, t).algorithm).toBe('edmonds-karp');
  });
});

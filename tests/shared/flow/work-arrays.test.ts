// One-shot solves keep their node-sized work arrays for the next one (shared/flow/work-arrays.ts).
// A kept array must come back filled as asked, whatever the last solve left in it, and reuse must
// never change an answer. Outside reference: Edmonds–Karp, the reference method, on each network.
import { describe, expect, it } from 'vitest';
import { buildNetwork, maxFlow, verify } from '../../../shared/flow';
import { KeptWork } from '../../../shared/flow/work-arrays';

describe('work arrays kept between one-shot solves', () => {
  it('hands a released array back, filled as asked', () => {
    const first = new KeptWork();
    const a = first.int32(1234, -1);
    const b = first.uint8(1234);
    a.fill(77);
    b.fill(9);
    first.release();
    const second = new KeptWork();
    const a2 = second.int32(1234, 5);
    const b2 = second.uint8(1234);
    expect(a2).toBe(a);
    expect(b2).toBe(b);
    expect(a2.every((x) => x === 5)).toBe(true);
    expect(b2.every((x) => x === 0)).toBe(true);
    // Two arrays of one length in the same solve are two arrays.
    expect(second.int32(1234, 0)).not.toBe(a2);
    second.release();
  });

  it('gives the same maximum on networks of one size solved one after another', () => {
    // Grids of 12 × 12 with capacities varied by a seed: every solve reuses the last one's arrays.
    for (let seed = 1; seed <= 20; seed++) {
      const arcs: { from: number; to: number; capacity: number }[] = [];
      const id = (x: number, y: number) => y * 12 + x;
      for (let y = 0; y < 12; y++) {
        for (let x = 0; x < 12; x++) {
          if (x + 1 < 12) arcs.push({ from: id(x, y), to: id(x + 1, y), capacity: ((x * 7 + y * 3 + seed * 11) % 9) + 1 });
          if (y + 1 < 12) arcs.push({ from: id(x, y), to: id(x, y + 1), capacity: ((x * 5 + y * 13 + seed * 3) % 7) });
          if (x > 0) arcs.push({ from: id(x, y), to: id(x - 1, y), capacity: (seed + x + y) % 4 });
        }
      }
      const network = buildNetwork(144, arcs);
      const reference = maxFlow(network, 0, 143, { algorithm: 'edmonds-karp' }).value;
      for (const algorithm of ['boykov-kolmogorov', 'incremental-bfs'] as const) {
        const result = maxFlow(network, seed % 12, 143 - (seed % 5), { algorithm });
        expect(result.value).toBe(maxFlow(network, seed % 12, 143 - (seed % 5), { algorithm: 'edmonds-karp' }).value);
        expect(verify(network, result).ok).toBe(true);
        expect(maxFlow(network, 0, 143, { algorithm }).value).toBe(reference);
      }
    }
  });
});

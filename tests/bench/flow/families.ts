// Layered max-flow families beside the road-like ones, generated here from their published
// descriptions (seeded, so every run solves the same graphs):
// - GENRMF-like (Goldfarb & Grigoriadis 1988, "A computational comparison of the Dinic and network
//   simplex methods for maximum flow", Annals of OR 13; the generator as described by Cherkassky &
//   Goldberg 1997, "On implementing push-relabel method for the maximum flow problem",
//   Algorithmica 19): b frames, each an a × a grid whose neighbouring nodes are joined both ways
//   with capacity c2·a², and each frame joined to the next by a random permutation of its nodes
//   with capacities uniform in [c1, c2]; source in a corner of the first frame, sink in the
//   opposite corner of the last.
// - Random level graphs (Cherkassky & Goldberg 1997, the "RLG" family): `levels` levels of `width`
//   nodes; every node has arcs to 3 random nodes of the next level, capacities uniform in [1, 10⁴];
//   the source feeds every node of the first level and every node of the last feeds the sink, with
//   capacities large enough never to bind alone.
import { buildNetworkFromArrays, type FlowNetwork } from '../../../shared/flow';
import { seededRandom } from './seeded-random';

export type FamilyNetwork = { network: FlowNetwork; source: number; sink: number };

function fromLists(nodeCount: number, tails: number[], heads: number[], caps: number[]): FlowNetwork {
  return buildNetworkFromArrays(nodeCount, Int32Array.from(tails), Int32Array.from(heads), Int32Array.from(caps));
}

export function genrmf(a: number, b: number, seed: number, c1 = 1, c2 = 1000): FamilyNetwork {
  const random = seededRandom(seed);
  const id = (frame: number, x: number, y: number) => frame * a * a + y * a + x;
  const tails: number[] = [];
  const heads: number[] = [];
  const caps: number[] = [];
  const arc = (u: number, v: number, c: number) => {
    tails.push(u);
    heads.push(v);
    caps.push(c);
  };
  const inFrame = c2 * a * a;
  for (let f = 0; f < b; f++) {
    for (let y = 0; y < a; y++) {
      for (let x = 0; x < a; x++) {
        if (x + 1 < a) {
          arc(id(f, x, y), id(f, x + 1, y), inFrame);
          arc(id(f, x + 1, y), id(f, x, y), inFrame);
        }
        if (y + 1 < a) {
          arc(id(f, x, y), id(f, x, y + 1), inFrame);
          arc(id(f, x, y + 1), id(f, x, y), inFrame);
        }
      }
    }
    if (f + 1 < b) {
      // A random permutation (Fisher–Yates) of the next frame's nodes.
      const perm = Array.from({ length: a * a }, (_, i) => i);
      for (let i = perm.length - 1; i > 0; i--) {
        const j = Math.floor(random() * (i + 1));
        [perm[i], perm[j]] = [perm[j]!, perm[i]!];
      }
      for (let i = 0; i < a * a; i++) arc(f * a * a + i, (f + 1) * a * a + perm[i]!, c1 + Math.floor(random() * (c2 - c1 + 1)));
    }
  }
  return { network: fromLists(a * a * b, tails, heads, caps), source: id(0, 0, 0), sink: id(b - 1, a - 1, a - 1) };
}

export function randomLevelGraph(width: number, levels: number, seed: number): FamilyNetwork {
  const random = seededRandom(seed);
  const n = width * levels + 2;
  const source = n - 2;
  const sink = n - 1;
  const tails: number[] = [];
  const heads: number[] = [];
  const caps: number[] = [];
  const arc = (u: number, v: number, c: number) => {
    tails.push(u);
    heads.push(v);
    caps.push(c);
  };
  const big = 3 * 10_000;
  for (let i = 0; i < width; i++) arc(source, i, big);
  for (let l = 0; l + 1 < levels; l++) {
    for (let i = 0; i < width; i++) {
      for (let k = 0; k < 3; k++) arc(l * width + i, (l + 1) * width + Math.floor(random() * width), 1 + Math.floor(random() * 10_000));
    }
  }
  for (let i = 0; i < width; i++) arc((levels - 1) * width + i, sink, big);
  return { network: fromLists(n, tails, heads, caps), source, sink };
}

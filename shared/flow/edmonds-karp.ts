// Edmonds & Karp (1972), J. ACM 19(2): repeatedly augment along a shortest s–t path of the
// residual digraph, found by breadth-first search, by that path's bottleneck capacity.
// This is the reference method the product names in its reports; it is kept deliberately plain.

import { FlowAbortedError } from './errors';
import type { SolveContext } from './solve-context';

/**
 * Runs Edmonds–Karp from the flow already in ctx.residual until no augmenting path remains.
 *
 * Complexity O(V·E²): every augmentation saturates at least one arc of a shortest path, and
 * the shortest-path distance to each node never decreases, so there are O(V·E) augmentations
 * of O(E) each. Prefer Dinic or push-relabel when only the optimum matters on large graphs.
 */
export function edmondsKarp(ctx: SolveContext): void {
  const { network, residual, source, sink, nodeLimit, stats, shouldAbort } = ctx;
  const { firstOut, head, mate } = network;
  // parentArc[v] = residual arc by which the search first reached v; NONE = not reached yet.
  const NONE = -1;
  const ROOT = -2;
  const parentArc = new Int32Array(nodeLimit);
  const queue = new Int32Array(nodeLimit);

  for (;;) {
    if (shouldAbort?.()) throw new FlowAbortedError('Edmonds–Karp aborted by the caller');

    // 1. Breadth-first search in the residual digraph: the first path found to the sink is a
    //    shortest one (fewest arcs).
    stats.phases++;
    parentArc.fill(NONE);
    parentArc[source] = ROOT;
    let queueHead = 0;
    let queueTail = 0;
    queue[queueTail++] = source;
    while (queueHead < queueTail && parentArc[sink] === NONE) {
      const u = queue[queueHead++]!;
      for (let r = firstOut[u]!, end = firstOut[u + 1]!; r < end; r++) {
        const v = head[r]!;
        if (v < nodeLimit && residual[r]! > 0 && parentArc[v] === NONE) {
          parentArc[v] = r;
          queue[queueTail++] = v;
        }
      }
    }
    if (parentArc[sink] === NONE) return; // no augmenting path: the flow is maximum

    // 2. The bottleneck: the smallest residual capacity along the path.
    let bottleneck = Infinity;
    for (let v = sink; v !== source; ) {
      const r = parentArc[v]!;
      bottleneck = Math.min(bottleneck, residual[r]!);
      v = head[mate[r]!]!;
    }

    // 3. Augment: push the bottleneck along the path and give it back to the reverse arcs.
    for (let v = sink; v !== source; ) {
      const r = parentArc[v]!;
      residual[r]! -= bottleneck;
      residual[mate[r]!]! += bottleneck;
      v = head[mate[r]!]!;
    }
    stats.augmentations++;
  }
}

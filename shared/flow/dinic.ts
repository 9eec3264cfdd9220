// Dinic (1970): in phases, build the level graph of the residual digraph by breadth-first search
// from the source, then saturate it with a blocking flow found by depth-first search with
// current-arc pointers. The sink's distance grows every phase, so there are at most V phases.

import { FlowAbortedError } from './errors';
import type { SolveContext } from './solve-context';

/**
 * Runs Dinic's algorithm from the flow already in ctx.residual until no augmenting path remains.
 *
 * Complexity O(V²·E) in general; each phase costs O(E) for the search plus O(V) per augmenting
 * path found. The depth-first search is iterative (paths in time-expanded networks are thousands
 * of arcs long) and a node found to be a dead end is removed from the phase.
 */
export function dinic(ctx: SolveContext): void {
  const { network, residual, source, sink, nodeLimit: n, stats, shouldAbort } = ctx;
  const { firstOut, head, mate } = network;
  const level = new Int32Array(n);
  const queue = new Int32Array(n);
  const currentArc = new Int32Array(n);
  const pathArc = new Int32Array(n);

  for (;;) {
    if (shouldAbort?.()) throw new FlowAbortedError('Dinic aborted by the caller');
    stats.phases++;

    // Level graph. Nodes at the sink's level other than the sink lead nowhere, so the search
    // stops before expanding them.
    level.fill(-1);
    level[source] = 0;
    let queueHead = 0;
    let queueTail = 0;
    queue[queueTail++] = source;
    while (queueHead < queueTail) {
      const u = queue[queueHead++]!;
      const nextLevel = level[u]! + 1;
      if (level[sink]! >= 0 && nextLevel > level[sink]!) break;
      for (let r = firstOut[u]!, end = firstOut[u + 1]!; r < end; r++) {
        const v = head[r]!;
        if (v < n && residual[r]! > 0 && level[v]! < 0) {
          level[v] = nextLevel;
          queue[queueTail++] = v;
        }
      }
    }
    const sinkLevel = level[sink]!;
    if (sinkLevel < 0) return; // no augmenting path: the flow is maximum
    for (let i = 0; i < queueTail; i++) {
      const v = queue[i]!;
      currentArc[v] = firstOut[v]!;
    }

    // Blocking flow. pathArc[0..depth) is the current source–u path in the level graph.
    let depth = 0;
    let u = source;
    for (;;) {
      if (u === sink) {
        let bottleneck = residual[pathArc[0]!]!;
        let bottleneckAt = 0;
        for (let i = 1; i < depth; i++) {
          const c = residual[pathArc[i]!]!;
          if (c < bottleneck) {
            bottleneck = c;
            bottleneckAt = i;
          }
        }
        for (let i = 0; i < depth; i++) {
          const r = pathArc[i]!;
          residual[r]! -= bottleneck;
          residual[mate[r]!]! += bottleneck;
        }
        stats.augmentations++;
        // Resume from the tail of the first saturated arc: the path before it is still usable.
        depth = bottleneckAt;
        u = head[mate[pathArc[bottleneckAt]!]!]!;
        continue;
      }
      const nextLevel = level[u]! + 1;
      const end = firstOut[u + 1]!;
      let r = currentArc[u]!;
      for (; r < end; r++) {
        const v = head[r]!;
        if (residual[r]! > 0 && v < n && level[v] === nextLevel && (nextLevel < sinkLevel || v === sink)) {
          break;
        }
      }
      currentArc[u] = r;
      if (r < end) {
        pathArc[depth++] = r;
        u = head[r]!;
        continue;
      }
      // Dead end: no path to the sink leaves u in this phase.
      level[u] = -1;
      if (depth === 0) break;
      depth--;
      u = head[mate[pathArc[depth]!]!]!;
      currentArc[u]!++;
    }
  }
}

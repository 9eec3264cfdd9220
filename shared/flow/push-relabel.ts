// Goldberg & Tarjan (1988), J. ACM 35(4): push-relabel with highest-label selection, the gap
// heuristic and periodic global relabelling (exact distance labels by a backward breadth-first
// search), in two phases: phase 1 finds a maximum preflow (the minimum cut is then known),
// phase 2 returns the excess that cannot reach the sink to the source, turning the preflow into
// a flow. Phase 2 reuses the same discharge loop with the source as its target.

import { FlowAbortedError } from './errors';
import type { SolveContext } from './solve-context';

/** Work between global relabellings, as a multiple of (6·V + E) (the usual choice). */
const GLOBAL_RELABEL_FREQUENCY = 0.5;
const RELABEL_WORK = 12;
const NODE_WORK = 6;

/**
 * Runs push-relabel from the flow already in ctx.residual: every residual arc leaving the source
 * is saturated, then excess is discharged until the flow is maximum again.
 *
 * Complexity O(V²·√E) with highest-label selection; in practice close to linear on road-like
 * networks thanks to the global relabelling and gap heuristics.
 */
export function pushRelabel(ctx: SolveContext): void {
  const { network, residual, source, sink, nodeLimit: n, stats, shouldAbort } = ctx;
  const { firstOut, head, mate } = network;
  const label = new Int32Array(n);
  const excess = new Float64Array(n);
  const currentArc = new Int32Array(n);
  // Active nodes by label (singly linked); all labelled nodes by label (doubly linked, for gaps).
  const activeFirst = new Int32Array(n).fill(-1);
  const activeNext = new Int32Array(n);
  const bucketFirst = new Int32Array(n).fill(-1);
  const bucketNext = new Int32Array(n);
  const bucketPrev = new Int32Array(n);
  const queue = new Int32Array(n);
  const globalRelabelWork = (NODE_WORK * n + firstOut[n]!) / GLOBAL_RELABEL_FREQUENCY;

  let target = sink;
  let excluded = source; // the terminal that is neither target nor ever active
  let maxActive = -1;
  let maxLabel = -1;
  let work = 0;

  // Saturate the source: the preflow's starting excess.
  for (let r = firstOut[source]!, end = firstOut[source + 1]!; r < end; r++) {
    const v = head[r]!;
    const delta = residual[r]!;
    if (v < n && delta > 0 && v !== source) {
      residual[r] = 0;
      residual[mate[r]!]! += delta;
      excess[v]! += delta;
    }
  }

  const addToBucket = (v: number, d: number): void => {
    const first = bucketFirst[d]!;
    bucketNext[v] = first;
    bucketPrev[v] = -1;
    if (first >= 0) bucketPrev[first] = v;
    bucketFirst[d] = v;
  };
  const removeFromBucket = (v: number, d: number): void => {
    const next = bucketNext[v]!;
    const prev = bucketPrev[v]!;
    if (prev >= 0) bucketNext[prev] = next;
    else bucketFirst[d] = next;
    if (next >= 0) bucketPrev[next] = prev;
  };
  const activate = (v: number): void => {
    const d = label[v]!;
    activeNext[v] = activeFirst[d]!;
    activeFirst[d] = v;
    if (d > maxActive) maxActive = d;
  };

  // Exact distances to the target in the residual digraph; unreachable nodes get label n.
  const globalRelabel = (): void => {
    stats.globalRelabels++;
    for (let d = 0; d <= maxLabel; d++) {
      bucketFirst[d] = -1;
      activeFirst[d] = -1;
    }
    label.fill(n);
    label[target] = 0;
    let queueHead = 0;
    let queueTail = 0;
    queue[queueTail++] = target;
    while (queueHead < queueTail) {
      const v = queue[queueHead++]!;
      const d = label[v]! + 1;
      for (let r = firstOut[v]!, end = firstOut[v + 1]!; r < end; r++) {
        const u = head[r]!;
        if (u < n && label[u] === n && u !== excluded && residual[mate[r]!]! > 0) {
          label[u] = d;
          queue[queueTail++] = u;
        }
      }
    }
    maxActive = -1;
    maxLabel = 0;
    for (let i = 0; i < queueTail; i++) {
      const v = queue[i]!;
      const d = label[v]!;
      addToBucket(v, d);
      currentArc[v] = firstOut[v]!;
      if (d > maxLabel) maxLabel = d;
      if (excess[v]! > 0 && v !== target && v !== excluded) activate(v);
    }
    work = 0;


  };

  // Nodes above an emptied label cannot reach the target any more.
  const gap = (emptied: number): void => {
    for (let d = emptied + 1; d <= maxLabel; d++) {
      for (let v = bucketFirst[d]!; v >= 0; v = bucketNext[v]!) label[v] = n;
      bucketFirst[d] = -1;
    }
    maxLabel = emptied - 1;
  };

  const discharge = (u: number): void => {
    const end = firstOut[u + 1]!;
    let du = label[u]!;
    let e = excess[u]!;
    for (;;) {
      let r = currentArc[u]!;
      for (; r < end; r++) {
        const c = residual[r]!;
        if (c === 0) continue;
        const v = head[r]!;
        if (v < n && label[v] === du - 1) {
          const delta = e < c ? e : c;
          residual[r] = c - delta;
          residual[mate[r]!]! += delta;
          if (excess[v] === 0 && v !== target && v !== excluded) activate(v);
          excess[v]! += delta;
          e -= delta;
          stats.pushes++;
          if (e === 0) break;
        }
      }
      if (e === 0) {
        currentArc[u] = r;
        excess[u] = 0;
        return;
      }
      // Relabel: one more than the lowest neighbour reachable by a residual arc.
      stats.relabels++;
      let lowest = n;
      let lowestArc = end;
      const start = firstOut[u]!;
      for (let a = start; a < end; a++) {
        if (residual[a]! > 0) {
          const v = head[a]!;
          if (v < n && label[v]! < lowest) {
            lowest = label[v]!;
            lowestArc = a;
          }
        }
      }
      work += RELABEL_WORK + end - start;
      removeFromBucket(u, du);
      if (bucketFirst[du]! < 0) {
        gap(du);
        label[u] = n;
        break;
      }
      if (lowest + 1 >= n) {
        label[u] = n;
        break;
      }
      du = lowest + 1;
      label[u] = du;
      currentArc[u] = lowestArc;
      addToBucket(u, du);
      if (du > maxLabel) maxLabel = du;
    }
    excess[u] = e;
  };

  const run = (): void => {
    globalRelabel();
    while (maxActive >= 0) {
      const u = activeFirst[maxActive]!;
      if (u < 0) {
        maxActive--;
        continue;
      }
      activeFirst[maxActive] = activeNext[u]!;
      if (label[u] !== maxActive) continue; // stale entry (relabelled or parked meanwhile)
      discharge(u);
      if (work > globalRelabelWork) {
        if (shouldAbort?.()) throw new FlowAbortedError('push-relabel aborted by the caller');
        globalRelabel();
      }
    }
  };

  // Phase 1: maximum preflow. Phase 2: send the stranded excess back to the source.
  stats.phases++;
  run();
  if (shouldAbort?.()) throw new FlowAbortedError('push-relabel aborted by the caller');

  let stranded = false;
  for (let v = 0; v < n; v++) {
    if (excess[v]! > 0 && v !== sink && v !== source) {
      stranded = true;
      break;
    }
  }
  if (!stranded) return;
  stats.phases++;
  target = source;
  excluded = sink;
  run();
}

// Boykov & Kolmogorov (2004), IEEE TPAMI 26(9): two search trees, one grown from the source over
// residual arcs and one grown backwards from the sink, meet in an augmenting path; after the
// augmentation, nodes cut off from their tree (orphans) look for a new parent in the same tree
// or become free. The trees are kept rather than rebuilt, which is why this method needs far
// fewer arc scans than one breadth-first search per path.
//
// The trees stay valid when capacities only grow, so a solver can be resumed after arcs appear:
// extendNodeLimit() reveals further nodes (the next horizon of a time-expanded network) and
// raiseCapacity() adds capacity to one arc; both wake the tree nodes next to the change, and
// the next maximise() continues from there. This is how the evacuation curve stays incremental.

import { raisedResidual } from './capacity';
import { FlowAbortedError } from './errors';
import type { ResidualUndoLog } from './residual-undo-log';
import type { FlowNetwork } from './flow-network';
import type { MaxFlowStats, SolveContext } from './solve-context';

const FREE = 0;
const SOURCE_TREE = 1;
const SINK_TREE = 2;
/** parent[] markers; any value ≥ 0 is a residual arc. */
const NO_PARENT = -1;
const ROOT = -2;
const ORPHAN = -3;
const INFINITE_DISTANCE = 0x3fffffff;

export interface BoykovKolmogorovSolver {
  /**
   * Augments until no augmenting path remains among nodes below the current node limit and
   * returns the flow added (robust even where raiseCapacity() made a residual exceed the
   * network's recorded capacity).
   */
  maximise(stats: MaxFlowStats, shouldAbort?: () => boolean): number;
  /** Lets nodes up to newLimit − 1 take part; their arcs to older nodes wake those nodes. */
  extendNodeLimit(newLimit: number): void;
  /** Adds `amount` to the residual capacity of residual arc r (an arc whose capacity grew). */
  raiseCapacity(r: number, amount: number): void;
  readonly nodeLimit: number;
}

/**
 * A resumable solver on `residual` (updated in place). Memory: 14 bytes per node.
 * Complexity O(V²·E·|C|) in the worst case (|C| the cut capacity); on grids and road networks
 * it is usually the fastest exact method known.
 */
export function createBoykovKolmogorov(
  network: FlowNetwork,
  residual: Int32Array,
  source: number,
  sink: number,
  initialNodeLimit: number,
  undoLog: ResidualUndoLog | null = null,
): BoykovKolmogorovSolver {
  const { firstOut, head, mate } = network;
  const n = network.nodeCount;
  let limit = initialNodeLimit;
  const tree = new Uint8Array(n);
  const parent = new Int32Array(n).fill(NO_PARENT);
  const timestamp = new Int32Array(n);
  const distance = new Int32Array(n);
  // Active nodes: a FIFO ring; inQueue prevents duplicates.
  const active = new Int32Array(n);
  const inQueue = new Uint8Array(n);
  let activeHead = 0;
  let activeCount = 0;
  // Orphans: a ring used as a deque (augmentation orphans at the front, adoption ones at the back).
  const orphans = new Int32Array(n);
  let orphanHead = 0;
  let orphanCount = 0;
  let time = 0;

  const activate = (v: number): void => {
    if (inQueue[v]) return;
    inQueue[v] = 1;
    let slot = activeHead + activeCount;
    if (slot >= n) slot -= n;
    active[slot] = v;
    activeCount++;
  };
  const orphanFront = (v: number): void => {
    parent[v] = ORPHAN;
    orphanHead = orphanHead === 0 ? n - 1 : orphanHead - 1;
    orphans[orphanHead] = v;
    orphanCount++;
  };
  const orphanBack = (v: number): void => {
    parent[v] = ORPHAN;
    let slot = orphanHead + orphanCount;
    if (slot >= n) slot -= n;
    orphans[slot] = v;
    orphanCount++;
  };
  /** The tree neighbour a node's parent arc leads to. */
  const parentNode = (v: number): number => {
    const a = parent[v]!;
    return tree[v] === SOURCE_TREE ? head[mate[a]!]! : head[a]!;
  };

  tree[source] = SOURCE_TREE;
  parent[source] = ROOT;
  tree[sink] = SINK_TREE;
  parent[sink] = ROOT;
  activate(source);
  activate(sink);

  /**
   * Pushes the bottleneck along source ⇝ p → q ⇝ sink, where `bridge` is the residual arc
   * p → q with p in the source tree and q in the sink tree. Saturated tree arcs orphan their child.
   */
  const augment = (bridge: number, stats: MaxFlowStats): number => {
    let bottleneck = residual[bridge]!;
    for (let v = head[mate[bridge]!]!; v !== source; ) {
      const a = parent[v]!;
      if (residual[a]! < bottleneck) bottleneck = residual[a]!;
      v = head[mate[a]!]!;
    }
    for (let v = head[bridge]!; v !== sink; ) {
      const a = parent[v]!;
      if (residual[a]! < bottleneck) bottleneck = residual[a]!;
      v = head[a]!;
    }
    if (undoLog !== null) undoLog.note(bridge);
    residual[bridge]! -= bottleneck;
    residual[mate[bridge]!]! += bottleneck;
    for (let v = head[mate[bridge]!]!; v !== source; ) {
      const a = parent[v]!;
      const up = head[mate[a]!]!;
      if (undoLog !== null) undoLog.note(a);
      residual[a]! -= bottleneck;
      residual[mate[a]!]! += bottleneck;
      if (residual[a] === 0) orphanFront(v);
      v = up;
    }
    for (let v = head[bridge]!; v !== sink; ) {
      const a = parent[v]!;
      const down = head[a]!;
      if (undoLog !== null) undoLog.note(a);
      residual[a]! -= bottleneck;
      residual[mate[a]!]! += bottleneck;
      if (residual[a] === 0) orphanFront(v);
      v = down;
    }
    stats.augmentations++;
    return bottleneck;
  };

  /** Length of the tree path from j to its root, or INFINITE_DISTANCE if it ends in an orphan. */
  const rootDistance = (j: number): number => {
    let d = 0;
    for (let k = j; ; ) {
      if (timestamp[k] === time) return d + distance[k]!;
      const a = parent[k]!;
      if (a === ROOT) {
        timestamp[k] = time;
        distance[k] = 0;
        return d;
      }
      if (a === ORPHAN || a === NO_PARENT) return INFINITE_DISTANCE;
      d++;
      k = parentNode(k);
    }
  };
  /** Caches the distances along j's verified path so later searches stop early. */
  const markPath = (j: number, d: number): void => {
    for (let k = j; timestamp[k] !== time; k = parentNode(k)) {
      timestamp[k] = time;
      distance[k] = d--;
    }
  };

  const adopt = (i: number): void => {
    const side = tree[i]!;
    const fromSource = side === SOURCE_TREE;
    let best = NO_PARENT;
    let bestDistance = INFINITE_DISTANCE;
    for (let r = firstOut[i]!, end = firstOut[i + 1]!; r < end; r++) {
      const j = head[r]!;
      if (j >= limit || tree[j] !== side || parent[j] === NO_PARENT) continue;
      // Source tree: the candidate parent j needs residual j → i; sink tree: i → j.
      const link = fromSource ? mate[r]! : r;
      if (residual[link] === 0) continue;
      const d = rootDistance(j);
      if (d < INFINITE_DISTANCE) {
        if (d < bestDistance) {
          best = link;
          bestDistance = d;
        }
        markPath(j, d);
      }
    }
    if (best !== NO_PARENT) {
      parent[i] = best;
      timestamp[i] = time;
      distance[i] = bestDistance + 1;
      return;
    }
    // No way back to the root: i becomes free, its tree neighbours may pick it up again later.
    for (let r = firstOut[i]!, end = firstOut[i + 1]!; r < end; r++) {
      const j = head[r]!;
      if (j >= limit || tree[j] !== side) continue;
      const a = parent[j]!;
      if (a === NO_PARENT) continue;
      const link = fromSource ? mate[r]! : r;
      if (residual[link]! > 0) activate(j);
      if (a >= 0 && parentNode(j) === i) orphanBack(j);
    }
    tree[i] = FREE;
    parent[i] = NO_PARENT;
  };

  const adoptOrphans = (): void => {
    while (orphanCount > 0) {
      const v = orphans[orphanHead]!;
      orphanHead = orphanHead + 1 === n ? 0 : orphanHead + 1;
      orphanCount--;
      adopt(v);
    }
  };

  const maximise = (stats: MaxFlowStats, shouldAbort?: () => boolean): number => {
    stats.phases++;
    let sinceCheck = 0;
    let added = 0;
    while (activeCount > 0) {
      const p = active[activeHead]!;
      activeHead = activeHead + 1 === n ? 0 : activeHead + 1;
      activeCount--;
      inQueue[p] = 0;
      const side = tree[p]!;
      if (side === FREE) continue;
      const end = firstOut[p + 1]!;
      for (let r = firstOut[p]!; r < end; r++) {
        const q = head[r]!;
        if (q >= limit) continue;
        let bridge = -1;
        if (side === SOURCE_TREE) {
          if (residual[r] === 0) continue;
          const qs = tree[q]!;
          if (qs === FREE) {
            tree[q] = SOURCE_TREE;
            parent[q] = r;
            timestamp[q] = timestamp[p]!;
            distance[q] = distance[p]! + 1;
            activate(q);
            continue;
          }
          if (qs === SOURCE_TREE) {
            if (timestamp[q]! <= timestamp[p]! && distance[q]! > distance[p]! && parent[q]! >= 0) {
              parent[q] = r;
              timestamp[q] = timestamp[p]!;
              distance[q] = distance[p]! + 1;
            }
            continue;
          }
          bridge = r;
        } else {
          const back = mate[r]!; // q → p
          if (residual[back] === 0) continue;
          const qs = tree[q]!;
          if (qs === FREE) {
            tree[q] = SINK_TREE;
            parent[q] = back;
            timestamp[q] = timestamp[p]!;
            distance[q] = distance[p]! + 1;
            activate(q);
            continue;
          }
          if (qs === SINK_TREE) {
            if (timestamp[q]! <= timestamp[p]! && distance[q]! > distance[p]! && parent[q]! >= 0) {
              parent[q] = back;
              timestamp[q] = timestamp[p]!;
              distance[q] = distance[p]! + 1;
            }
            continue;
          }
          bridge = back;
        }
        // The trees touch: augment, repair the trees, and look at this arc again if p survived.
        time++;
        added += augment(bridge, stats);
        adoptOrphans();
        if (++sinceCheck >= 256) {
          sinceCheck = 0;
          if (shouldAbort?.()) throw new FlowAbortedError('Boykov–Kolmogorov aborted by the caller');
        }
        if (tree[p] !== side) break;
        r--;
      }
    }
    return added;
  };

  return {
    maximise,
    extendNodeLimit(newLimit: number): void {
      const old = limit;
      limit = newLimit;
      for (let v = old; v < newLimit; v++) {
        for (let r = firstOut[v]!, end = firstOut[v + 1]!; r < end; r++) {
          const u = head[r]!;
          if (u < old && tree[u] !== FREE) activate(u);
        }
      }
    },
    raiseCapacity(r: number, amount: number): void {
      if (undoLog !== null) undoLog.note(r);
      residual[r] = raisedResidual(residual, mate, r, amount);
      const tail = head[mate[r]!]!;
      if (tree[tail] !== FREE) activate(tail);
      if (tree[head[r]!] !== FREE) activate(head[r]!);
    },
    get nodeLimit() {
      return limit;
    },
  };
}

/** One-shot run for the front door. */
export function boykovKolmogorov(ctx: SolveContext): void {
  createBoykovKolmogorov(ctx.network, ctx.residual, ctx.source, ctx.sink, ctx.nodeLimit).maximise(ctx.stats, ctx.shouldAbort);
}

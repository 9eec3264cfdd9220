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

import { FlowAbortedError } from './errors';
import type { ResidualUndoLog } from './residual-undo-log';
import type { FlowNetwork } from './flow-network';
import { FREE, NO_PARENT, ORPHAN, ROOT, SINK_TREE, SOURCE_TREE, SearchTrees, type GrowthProgress } from './search-trees';
import type { MaxFlowStats, SolveContext } from './solve-context';
import { KeptWork, freshWork, type WorkArrays } from './work-arrays';

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
  work: WorkArrays = freshWork,
): BoykovKolmogorovSolver {
  return new BoykovKolmogorov(network, residual, source, sink, initialNodeLimit, undoLog, work);
}

/** The solver's state and its steps; the hot loops copy the fields they read into locals. */
class BoykovKolmogorov extends SearchTrees implements BoykovKolmogorovSolver {
  private readonly timestamp: Int32Array;
  private readonly distance: Int32Array;
  // Active nodes: a FIFO ring; inQueue prevents duplicates.
  private readonly active: Int32Array;
  private readonly inQueue: Uint8Array;
  private activeHead = 0;
  private activeCount = 0;
  // Orphans: a ring used as a deque (augmentation orphans at the front, adoption ones at the back).
  private readonly orphans: Int32Array;
  private orphanHead = 0;
  private orphanCount = 0;
  private time = 0;

  constructor(network: FlowNetwork, residual: Int32Array, source: number, sink: number, initialNodeLimit: number, undoLog: ResidualUndoLog | null, work: WorkArrays) {
    super(network, residual, source, sink, initialNodeLimit, undoLog, work);
    const n = this.n;
    this.timestamp = work.int32(n, 0);
    this.distance = work.int32(n, 0);
    this.active = work.int32(n, 0);
    this.inQueue = work.uint8(n);
    this.orphans = work.int32(n, 0);
    this.plantRoots();
  }

  protected activate(v: number): void {
    if (this.inQueue[v]) return;
    this.inQueue[v] = 1;
    let slot = this.activeHead + this.activeCount;
    if (slot >= this.n) slot -= this.n;
    this.active[slot] = v;
    this.activeCount++;
  }

  private orphanFront(v: number): void {
    this.parent[v] = ORPHAN;
    this.orphanHead = this.orphanHead === 0 ? this.n - 1 : this.orphanHead - 1;
    this.orphans[this.orphanHead] = v;
    this.orphanCount++;
  }

  private orphanBack(v: number): void {
    this.parent[v] = ORPHAN;
    let slot = this.orphanHead + this.orphanCount;
    if (slot >= this.n) slot -= this.n;
    this.orphans[slot] = v;
    this.orphanCount++;
  }

  /** The tree neighbour a node's parent arc leads to. */
  private parentNode(v: number): number {
    const a = this.parent[v]!;
    return this.tree[v] === SOURCE_TREE ? this.head[this.mate[a]!]! : this.head[a]!;
  }

  /**
   * Pushes the bottleneck along source ⇝ p → q ⇝ sink, where `bridge` is the residual arc
   * p → q with p in the source tree and q in the sink tree. Saturated tree arcs orphan their child.
   */
  private augment(bridge: number, stats: MaxFlowStats): number {
    const { residual, parent, head, mate, source, sink } = this;
    const bottleneck = this.bottleneckOf(bridge);
    this.push(bridge, bottleneck);
    for (let v = head[mate[bridge]!]!; v !== source; ) {
      const a = parent[v]!;
      const up = head[mate[a]!]!;
      this.push(a, bottleneck);
      if (residual[a] === 0) this.orphanFront(v);
      v = up;
    }
    for (let v = head[bridge]!; v !== sink; ) {
      const a = parent[v]!;
      const down = head[a]!;
      this.push(a, bottleneck);
      if (residual[a] === 0) this.orphanFront(v);
      v = down;
    }
    stats.augmentations++;
    return bottleneck;
  }

  /** Length of the tree path from j to its root, or INFINITE_DISTANCE if it ends in an orphan. */
  private rootDistance(j: number): number {
    const { timestamp, distance, parent, time } = this;
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
      k = this.parentNode(k);
    }
  }

  /** Caches the distances along j's verified path so later searches stop early. */
  private markPath(j: number, d: number): void {
    const { timestamp, distance, time } = this;
    for (let k = j; timestamp[k] !== time; k = this.parentNode(k)) {
      timestamp[k] = time;
      distance[k] = d--;
    }
  }

  private adoptOrphans(): void {
    while (this.orphanCount > 0) {
      const v = this.orphans[this.orphanHead]!;
      this.orphanHead = this.orphanHead + 1 === this.n ? 0 : this.orphanHead + 1;
      this.orphanCount--;
      if (!this.adopt(v)) this.setFree(v);
    }
  }

  /** Gives orphan i the tree neighbour closest to the root as its parent; false when none leads there. */
  private adopt(i: number): boolean {
    const { firstOut, head, mate, tree, parent, residual, limit } = this;
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
      const d = this.rootDistance(j);
      if (d < INFINITE_DISTANCE) {
        if (d < bestDistance) {
          best = link;
          bestDistance = d;
        }
        this.markPath(j, d);
      }
    }
    if (best === NO_PARENT) return false;
    parent[i] = best;
    this.timestamp[i] = this.time;
    this.distance[i] = bestDistance + 1;
    return true;
  }

  /** No way back to the root: i becomes free, its tree neighbours may pick it up again later. */
  private setFree(i: number): void {
    const { firstOut, head, mate, tree, parent, residual, limit } = this;
    const side = tree[i]!;
    const fromSource = side === SOURCE_TREE;
    for (let r = firstOut[i]!, end = firstOut[i + 1]!; r < end; r++) {
      const j = head[r]!;
      if (j >= limit || tree[j] !== side) continue;
      const a = parent[j]!;
      if (a === NO_PARENT) continue;
      const link = fromSource ? mate[r]! : r;
      if (residual[link]! > 0) this.activate(j);
      if (a >= 0 && this.parentNode(j) === i) this.orphanBack(j);
    }
    tree[i] = FREE;
    parent[i] = NO_PARENT;
  }

  maximise(stats: MaxFlowStats, shouldAbort?: () => boolean): number {
    stats.phases++;
    const progress: GrowthProgress = { added: 0, sinceCheck: 0 };
    while (this.activeCount > 0) {
      const p = this.active[this.activeHead]!;
      this.activeHead = this.activeHead + 1 === this.n ? 0 : this.activeHead + 1;
      this.activeCount--;
      this.inQueue[p] = 0;
      if (this.tree[p] === FREE) continue;
      this.growFrom(p, stats, progress, shouldAbort);
    }
    return progress.added;
  }

  // Scans the arcs of active node p: free neighbours join p's tree; a neighbour of the same tree
  // whose path to the root is longer and no fresher takes p as its parent; a neighbour in the
  // other tree closes an augmenting path, after which the trees are repaired and the same arc is
  // looked at again if p survived.
  private growFrom(p: number, stats: MaxFlowStats, progress: GrowthProgress, shouldAbort?: () => boolean): void {
    const { firstOut, head, mate, tree, parent, timestamp, distance, residual, limit } = this;
    const side = tree[p]!;
    const end = firstOut[p + 1]!;
    for (let r = firstOut[p]!; r < end; r++) {
      const q = head[r]!;
      if (q >= limit) continue;
      // Source tree: residual p → q; sink tree: q → p.
      const link = side === SOURCE_TREE ? r : mate[r]!;
      if (residual[link] === 0) continue;
      const qs = tree[q]!;
      if (qs === FREE || (qs === side && timestamp[q]! <= timestamp[p]! && distance[q]! > distance[p]! && parent[q]! >= 0)) {
        if (qs === FREE) {
          tree[q] = side;
          this.activate(q);
        }
        parent[q] = link;
        timestamp[q] = timestamp[p]!;
        distance[q] = distance[p]! + 1;
        continue;
      }
      if (qs === side) continue;
      this.time++;
      progress.added += this.augment(link, stats);
      this.adoptOrphans();
      if (++progress.sinceCheck >= 256) {
        progress.sinceCheck = 0;
        if (shouldAbort?.()) throw new FlowAbortedError('Boykov–Kolmogorov aborted by the caller');
      }
      if (tree[p] !== side) break;
      r--;
    }
  }

}

/** One-shot run for the front door, on work arrays kept between one-shot solves. */
export function boykovKolmogorov(ctx: SolveContext): void {
  const work = new KeptWork();
  try {
    createBoykovKolmogorov(ctx.network, ctx.residual, ctx.source, ctx.sink, ctx.nodeLimit, null, work).maximise(ctx.stats, ctx.shouldAbort);
  } finally {
    work.release();
  }
}

// Bidirectional search trees repaired in label order, a variant of incremental breadth-first
// search (Goldberg, Hed, Kaplan, Tarjan & Werneck, ESA 2011). As in Boykov–Kolmogorov, a source
// tree and a sink tree grow towards each other (lowest label first, so growth is breadth-first)
// and are repaired after each augmentation instead of being rebuilt. Every tree node carries a
// label that grows along tree paths (a child's label exceeds its parent's), which keeps the
// parent pointers acyclic. Orphans are repaired in increasing label order, so when an orphan with
// label d is repaired every tree node below d that is not an orphan is known to be rooted: the
// orphan simply takes the lowest such neighbour as its parent, with no walk to the root. Failing
// that, it rises to one above its lowest tree neighbour (children it would no longer sit below
// become orphans), or becomes free when it has none. Unlike the paper, a parent may sit any number of
// levels below its child (not exactly one): on time-expanded networks this avoids cascades of
// relabels along waiting arcs and measured markedly faster.
//
// Capacities that only grow keep the trees valid, so the solver can be resumed after more nodes
// become visible (the next horizon) or after an arc gains capacity (a what-if run).

import { FlowAbortedError } from './errors';
import type { ResidualUndoLog } from './residual-undo-log';
import type { FlowNetwork } from './flow-network';
import { FREE, NO_PARENT, ORPHAN, SINK_TREE, SOURCE_TREE, SearchTrees, type GrowthProgress } from './search-trees';
import type { MaxFlowStats, SolveContext } from './solve-context';
import { KeptWork, freshWork, type WorkArrays } from './work-arrays';

/**
 * Label gap between a node and a child found by growth. Leaving room means a parent that has to
 * rise a little still sits below its children, so they keep it; 4 measured best on the bench's
 * time-expanded network (1 and 64 did clearly more repairs).
 */
const GROWTH_STEP = 4;

export interface IncrementalSolver {
  /**
   * Augments until no augmenting path remains among nodes below the current node limit and
   * returns the flow added (robust even where raiseCapacity() made a residual exceed the
   * network's recorded capacity). With `augmentationLimit`, it stops early once
   * stats.augmentations reaches it (see stoppedAtLimit); a later call carries on.
   */
  maximise(stats: MaxFlowStats, shouldAbort?: () => boolean, augmentationLimit?: number): number;
  /**
   * True when the last maximise() stopped because stats.augmentations reached its
   * augmentationLimit with work left: the flow is feasible but may not be maximum yet.
   */
  readonly stoppedAtLimit: boolean;
  /** Lets nodes up to newLimit − 1 take part; their arcs to older nodes wake those nodes. */
  extendNodeLimit(newLimit: number): void;
  /** Adds `amount` to the residual capacity of residual arc r (an arc whose capacity grew). */
  raiseCapacity(r: number, amount: number): void;
  /** A copy of the trees and the residual capacities, taken between maximise() calls. */
  save(): IncrementalSolverSnapshot;
  /** Returns to a saved point (the residual array is overwritten). */
  restore(snapshot: IncrementalSolverSnapshot): void;
  readonly nodeLimit: number;
}

export interface IncrementalSolverSnapshot {
  readonly tree: Uint8Array;
  readonly parent: Int32Array;
  readonly label: Int32Array;
  readonly residual: Int32Array;
  readonly limit: number;
}

/**
 * A resumable solver on `residual` (updated in place). Memory: 22 bytes per node plus the label
 * buckets. No polynomial bound is claimed for this variant; like Boykov–Kolmogorov it
 * terminates because every augmentation adds at least one unit of flow.
 */
export function createIncrementalBfs(
  network: FlowNetwork,
  residual: Int32Array,
  source: number,
  sink: number,
  initialNodeLimit: number,
  initialBuckets = 1 << 16,
  undoLog: ResidualUndoLog | null = null,
  work: WorkArrays = freshWork,
): IncrementalSolver {
  return new IncrementalBfs(network, residual, source, sink, initialNodeLimit, initialBuckets, undoLog, work);
}

/** The solver's state and its steps; the hot loops copy the fields they read into locals. */
class IncrementalBfs extends SearchTrees implements IncrementalSolver {
  private readonly label: Int32Array;
  // Active nodes, bucketed by label, one bucket array per tree (singly linked lists); orphans
  // bucketed the same way (one tree at a time is repaired, so one array suffices). Labels have no
  // fixed ceiling, so the bucket arrays grow on demand.
  private readonly activeNext: Int32Array;
  private readonly isActive: Uint8Array;
  private readonly orphanNext: Int32Array;
  private buckets: number;
  private activeFirstS: Int32Array;
  private activeFirstT: Int32Array;
  private orphanFirst: Int32Array;
  private lowestActiveS: number;
  private lowestActiveT: number;
  private lowestOrphan: number;
  private activeCountS = 0;
  private activeCountT = 0;
  private orphanCount = 0;
  /** maximise()'s stopping point in stats.augmentations, and whether it was reached. */
  private augmentationLimit = Infinity;
  stoppedAtLimit = false;
  /** Scratch for repair(): the orphan's children, each listed once. */
  private readonly children: Int32Array;

  constructor(
    network: FlowNetwork,
    residual: Int32Array,
    source: number,
    sink: number,
    initialNodeLimit: number,
    initialBuckets: number,
    undoLog: ResidualUndoLog | null,
    work: WorkArrays,
  ) {
    super(network, residual, source, sink, initialNodeLimit, undoLog, work);
    const n = this.n;
    this.label = work.int32(n, 0);
    this.activeNext = work.int32(n, 0);
    this.isActive = work.uint8(n);
    this.orphanNext = work.int32(n, 0);
    this.children = work.int32(n, 0);
    this.buckets = Math.max(2, Math.min(n + 2, initialBuckets));
    this.activeFirstS = work.int32(this.buckets, -1);
    this.activeFirstT = work.int32(this.buckets, -1);
    this.orphanFirst = work.int32(this.buckets, -1);
    this.lowestActiveS = this.buckets;
    this.lowestActiveT = this.buckets;
    this.lowestOrphan = this.buckets;
    this.plantRoots();
  }

  /** Makes room for label d in the bucket arrays (doubling them). */
  private ensureBucket(d: number): void {
    if (d < this.buckets) return;
    let size = this.buckets;
    while (size <= d) size *= 2;
    this.activeFirstS = grown(this.activeFirstS, size);
    this.activeFirstT = grown(this.activeFirstT, size);
    this.orphanFirst = grown(this.orphanFirst, size);
    if (this.lowestActiveS === this.buckets) this.lowestActiveS = size;
    if (this.lowestActiveT === this.buckets) this.lowestActiveT = size;
    if (this.lowestOrphan === this.buckets) this.lowestOrphan = size;
    this.buckets = size;
  }

  protected activate(v: number): void {
    if (this.isActive[v]) return;
    this.isActive[v] = 1;
    const d = this.label[v]!;
    if (this.tree[v] === SOURCE_TREE) {
      this.activeNext[v] = this.activeFirstS[d]!;
      this.activeFirstS[d] = v;
      if (d < this.lowestActiveS) this.lowestActiveS = d;
      this.activeCountS++;
    } else {
      this.activeNext[v] = this.activeFirstT[d]!;
      this.activeFirstT[d] = v;
      if (d < this.lowestActiveT) this.lowestActiveT = d;
      this.activeCountT++;
    }
  }

  private addOrphan(v: number): void {
    this.parent[v] = ORPHAN;
    const d = this.label[v]!;
    this.orphanNext[v] = this.orphanFirst[d]!;
    this.orphanFirst[d] = v;
    if (d < this.lowestOrphan) this.lowestOrphan = d;
    this.orphanCount++;
  }

  /** The active node of lowest label in the source tree (fromSource) or the sink tree. */
  private popActive(fromSource: boolean): number {
    const { activeNext, isActive } = this;
    if (fromSource) {
      while (this.activeFirstS[this.lowestActiveS]! < 0) this.lowestActiveS++;
      const v = this.activeFirstS[this.lowestActiveS]!;
      this.activeFirstS[this.lowestActiveS] = activeNext[v]!;
      this.activeCountS--;
      isActive[v] = 0;
      return v;
    }
    while (this.activeFirstT[this.lowestActiveT]! < 0) this.lowestActiveT++;
    const v = this.activeFirstT[this.lowestActiveT]!;
    this.activeFirstT[this.lowestActiveT] = activeNext[v]!;
    this.activeCountT--;
    isActive[v] = 0;
    return v;
  }

  // Source ⇝ tail(bridge) → head(bridge) ⇝ sink; saturated tree arcs orphan their child, and
  // each tree is repaired in turn.
  private augment(bridge: number, stats: MaxFlowStats): number {
    const { residual, parent, head, mate, source, sink } = this;
    const bottleneck = this.bottleneckOf(bridge);
    this.push(bridge, bottleneck);
    let sourceOrphans = 0;
    for (let v = head[mate[bridge]!]!; v !== source; ) {
      const a = parent[v]!;
      const up = head[mate[a]!]!;
      this.push(a, bottleneck);
      if (residual[a] === 0) {
        this.addOrphan(v);
        sourceOrphans++;
      }
      v = up;
    }
    if (sourceOrphans > 0) this.adoptOrphans(SOURCE_TREE);
    for (let v = head[bridge]!; v !== sink; ) {
      const a = parent[v]!;
      const down = head[a]!;
      this.push(a, bottleneck);
      if (residual[a] === 0) this.addOrphan(v);
      v = down;
    }
    if (this.orphanCount > 0) this.adoptOrphans(SINK_TREE);
    stats.augmentations++;
    return bottleneck;
  }

  /** Repairs the orphans of `side` in increasing label order. */
  private adoptOrphans(side: number): void {
    const { orphanNext, parent, label } = this;
    while (this.orphanCount > 0) {
      while (this.orphanFirst[this.lowestOrphan]! < 0) this.lowestOrphan++;
      const v = this.orphanFirst[this.lowestOrphan]!;
      this.orphanFirst[this.lowestOrphan] = orphanNext[v]!;
      this.orphanCount--;
      if (parent[v] !== ORPHAN || label[v] !== this.lowestOrphan) continue; // re-queued at a higher label
      this.repair(v, side);
    }
    this.lowestOrphan = this.buckets;
  }

  // Re-attach or relabel one orphan of `side`, in one pass over its arcs: the lowest rooted
  // neighbour below it becomes its parent; failing that it rises to one above its lowest tree
  // neighbour that is not its child (a pending one is checked again when v's new bucket comes
  // up), and only the children that would no longer sit above it become orphans; with no
  // candidate at all it becomes free.
  private repair(v: number, side: number): void {
    const { firstOut, head, mate, tree, parent, label, residual, children, limit } = this;
    const fromSource = side === SOURCE_TREE;
    const d = label[v]!;
    let best = -1;
    let bestLabel = d;
    let lowest = -1;
    let childCount = 0;
    for (let r = firstOut[v]!, end = firstOut[v + 1]!; r < end; r++) {
      const u = head[r]!;
      if (u >= limit || tree[u] !== side || u === v) continue;
      const pu = parent[u]!;
      if (pu === NO_PARENT || pu === ORPHAN) continue; // an unrepaired orphan is no reference
      if (pu >= 0 && (fromSource ? head[mate[pu]!]! : head[pu]!) === v) {
        // A child is listed once, at its own parent arc: parallel arcs repeat the neighbour, and
        // a list sized by node count must never receive more entries than there are nodes.
        if (pu === (fromSource ? r : mate[r]!)) children[childCount++] = u;
        continue;
      }
      const link = fromSource ? mate[r]! : r;
      if (residual[link] === 0) continue;
      const lu = label[u]!;
      if (lu < bestLabel) {
        best = link;
        bestLabel = lu;
      }
      if (lowest < 0 || lu < lowest) lowest = lu;
    }
    if (best >= 0) parent[v] = best;
    else if (lowest >= 0) this.rise(v, lowest + 1, childCount);
    else this.setFree(v, side, childCount);
  }

  /** The orphan v takes label `next`; children that would no longer sit above it are orphaned. */
  private rise(v: number, next: number, childCount: number): void {
    const { children, label } = this;
    this.ensureBucket(next);
    label[v] = next;
    for (let k = 0; k < childCount; k++) {
      const c = children[k]!;
      if (label[c]! <= next) this.addOrphan(c);
    }
    this.addOrphan(v);
  }

  // Nothing of this tree leads into v any more: v becomes free; neighbours that could reach it
  // later are woken so the tree can grow back into it.
  private setFree(v: number, side: number, childCount: number): void {
    const { firstOut, head, mate, tree, parent, residual, children, limit } = this;
    const fromSource = side === SOURCE_TREE;
    for (let k = 0; k < childCount; k++) this.addOrphan(children[k]!);
    tree[v] = FREE;
    parent[v] = NO_PARENT;
    for (let r = firstOut[v]!, end = firstOut[v + 1]!; r < end; r++) {
      const u = head[r]!;
      if (u >= limit || tree[u] !== side || parent[u] === NO_PARENT) continue;
      const link = fromSource ? mate[r]! : r;
      if (residual[link]! > 0) this.activate(u);
    }
  }

  maximise(stats: MaxFlowStats, shouldAbort?: () => boolean, augmentationLimit = Infinity): number {
    stats.phases++;
    const progress: GrowthProgress = { added: 0, sinceCheck: 0 };
    this.augmentationLimit = augmentationLimit;
    this.stoppedAtLimit = false;
    while (this.activeCountS + this.activeCountT > 0) {
      if (stats.augmentations >= augmentationLimit) {
        this.stoppedAtLimit = true;
        break;
      }
      const growSource = this.activeCountT === 0 || (this.activeCountS > 0 && this.lowestActiveS <= this.lowestActiveT);
      const p = this.popActive(growSource);
      if (this.tree[p] === FREE) continue;
      this.growFrom(p, stats, progress, shouldAbort);
    }
    return progress.added;
  }

  // Scans the arcs of active node p: free neighbours join p's tree one growth step above it; a
  // neighbour in the other tree closes an augmenting path. p stops when it leaves its tree, or
  // is re-queued when a repair relabelled it.
  private growFrom(p: number, stats: MaxFlowStats, progress: GrowthProgress, shouldAbort?: () => boolean): void {
    const { firstOut, head, mate, tree, parent, label, residual, limit } = this;
    const side = tree[p]!;
    const d = label[p]!;
    const end = firstOut[p + 1]!;
    for (let r = firstOut[p]!; r < end; r++) {
      const q = head[r]!;
      if (q >= limit) continue;
      const link = side === SOURCE_TREE ? r : mate[r]!;
      if (residual[link] === 0) continue;
      const qs = tree[q]!;
      if (qs === side) continue;
      if (qs === FREE) {
        tree[q] = side;
        parent[q] = link;
        this.ensureBucket(d + GROWTH_STEP);
        label[q] = d + GROWTH_STEP;
        this.activate(q);
        continue;
      }
      progress.added += this.augment(link, stats);
      if (++progress.sinceCheck >= 256) {
        progress.sinceCheck = 0;
        if (shouldAbort?.()) throw new FlowAbortedError('incremental BFS aborted by the caller');
      }
      if (tree[p] !== side) break;
      if (label[p] !== d || stats.augmentations >= this.augmentationLimit) {
        // Relabelled: p is queued again at its new label. At the limit: queued so that a later
        // maximise() resumes its scan.
        this.activate(p);
        break;
      }
      r--; // the same arc may carry more
    }
  }


  save(): IncrementalSolverSnapshot {
    return { tree: this.tree.slice(), parent: this.parent.slice(), label: this.label.slice(), residual: this.residual.slice(), limit: this.limit };
  }

  restore(snapshot: IncrementalSolverSnapshot): void {
    // Between maximise() calls the active and orphan queues are empty, so the trees, labels
    // and residual capacities are the whole state.
    this.tree.set(snapshot.tree);
    this.parent.set(snapshot.parent);
    this.label.set(snapshot.label);
    this.residual.set(snapshot.residual);
    this.limit = snapshot.limit;
    while (this.activeCountS + this.activeCountT > 0) this.isActive[this.popActive(this.activeCountS > 0)] = 0;
  }
}

function grown(array: Int32Array, size: number): Int32Array {
  const bigger = new Int32Array(size).fill(-1);
  bigger.set(array);
  return bigger;
}

/** One-shot run for the front door, on work arrays kept between one-shot solves. */
export function incrementalBfs(ctx: SolveContext): void {
  const work = new KeptWork();
  try {
    createIncrementalBfs(ctx.network, ctx.residual, ctx.source, ctx.sink, ctx.nodeLimit, undefined, null, work).maximise(ctx.stats, ctx.shouldAbort);
  } finally {
    work.release();
  }
}

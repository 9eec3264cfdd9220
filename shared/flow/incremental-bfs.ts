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

import { raisedResidual } from './capacity';
import { FlowAbortedError } from './errors';
import type { ResidualUndoLog } from './residual-undo-log';
import type { FlowNetwork } from './flow-network';
import type { MaxFlowStats, SolveContext } from './solve-context';

const FREE = 0;
const SOURCE_TREE = 1;
const SINK_TREE = 2;
/** parent[] markers; any value ≥ 0 is a residual arc (from the parent in the source tree, to it in the sink tree). */
const NO_PARENT = -1;
const ROOT = -2;
const ORPHAN = -3;
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
   * network's recorded capacity).
   */
  maximise(stats: MaxFlowStats, shouldAbort?: () => boolean): number;
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
): IncrementalSolver {
  const { firstOut, head, mate } = network;
  const n = network.nodeCount;
  let limit = initialNodeLimit;
  const tree = new Uint8Array(n);
  const parent = new Int32Array(n).fill(NO_PARENT);
  const label = new Int32Array(n);
  // Active nodes, bucketed by label, one bucket array per tree (singly linked lists); orphans
  // bucketed the same way (one tree at a time is repaired, so one array suffices). Labels have no
  // fixed ceiling, so the bucket arrays grow on demand.
  const activeNext = new Int32Array(n);
  const isActive = new Uint8Array(n);
  const orphanNext = new Int32Array(n);
  let buckets = Math.max(2, Math.min(n + 2, initialBuckets));
  let activeFirstS = new Int32Array(buckets).fill(-1);
  let activeFirstT = new Int32Array(buckets).fill(-1);
  let orphanFirst = new Int32Array(buckets).fill(-1);
  let lowestActiveS = buckets;
  let lowestActiveT = buckets;
  let lowestOrphan = buckets;
  let activeCountS = 0;
  let activeCountT = 0;
  let orphanCount = 0;
  const grown = (array: Int32Array, size: number): Int32Array<ArrayBuffer> => {
    const bigger = new Int32Array(size).fill(-1);
    bigger.set(array);
    return bigger;
  };
  const ensureBucket = (d: number): void => {
    if (d < buckets) return;
    let size = buckets;
    while (size <= d) size *= 2;
    activeFirstS = grown(activeFirstS, size);
    activeFirstT = grown(activeFirstT, size);
    orphanFirst = grown(orphanFirst, size);
    if (lowestActiveS === buckets) lowestActiveS = size;
    if (lowestActiveT === buckets) lowestActiveT = size;
    if (lowestOrphan === buckets) lowestOrphan = size;
    buckets = size;
  };

  const activate = (v: number): void => {
    if (isActive[v]) return;
    isActive[v] = 1;
    const d = label[v]!;
    if (tree[v] === SOURCE_TREE) {
      activeNext[v] = activeFirstS[d]!;
      activeFirstS[d] = v;
      if (d < lowestActiveS) lowestActiveS = d;
      activeCountS++;
    } else {
      activeNext[v] = activeFirstT[d]!;
      activeFirstT[d] = v;
      if (d < lowestActiveT) lowestActiveT = d;
      activeCountT++;
    }
  };
  const addOrphan = (v: number): void => {
    parent[v] = ORPHAN;
    const d = label[v]!;
    orphanNext[v] = orphanFirst[d]!;
    orphanFirst[d] = v;
    if (d < lowestOrphan) lowestOrphan = d;
    orphanCount++;
  };
  /** The tree neighbour v's parent arc leads to (v must have a parent arc). */
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

  // Source ⇝ tail(bridge) → head(bridge) ⇝ sink; saturated tree arcs orphan their child.
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
    let sourceOrphans = 0;
    for (let v = head[mate[bridge]!]!; v !== source; ) {
      const a = parent[v]!;
      const up = head[mate[a]!]!;
      if (undoLog !== null) undoLog.note(a);
      residual[a]! -= bottleneck;
      residual[mate[a]!]! += bottleneck;
      if (residual[a] === 0) {
        addOrphan(v);
        sourceOrphans++;
      }
      v = up;
    }
    if (sourceOrphans > 0) adoptOrphans(SOURCE_TREE);
    for (let v = head[bridge]!; v !== sink; ) {
      const a = parent[v]!;
      const down = head[a]!;
      if (undoLog !== null) undoLog.note(a);
      residual[a]! -= bottleneck;
      residual[mate[a]!]! += bottleneck;
      if (residual[a] === 0) addOrphan(v);
      v = down;
    }
    if (orphanCount > 0) adoptOrphans(SINK_TREE);
    stats.augmentations++;
    return bottleneck;
  };

  // Re-attach or relabel one orphan of `side`, in one pass over its arcs: the lowest rooted
  // neighbour below it becomes its parent; failing that it rises to one above its lowest tree
  // neighbour that is not its child (a pending one is checked again when v's new bucket comes
  // up), and only the children that would no longer sit above it become orphans; with no
  // candidate at all it becomes free.
  const children = new Int32Array(n);
  const repair = (v: number, side: number): void => {
    const fromSource = side === SOURCE_TREE;
    const d = label[v]!;
    const start = firstOut[v]!;
    const end = firstOut[v + 1]!;
    let best = -1;
    let bestLabel = d;
    let lowest = -1;
    let childCount = 0;
    for (let r = start; r < end; r++) {
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
    if (best >= 0) {
      parent[v] = best;
      return;
    }
    if (lowest >= 0) {
      const next = lowest + 1;
      ensureBucket(next);
      label[v] = next;
      for (let k = 0; k < childCount; k++) {
        const c = children[k]!;
        if (label[c]! <= next) addOrphan(c);
      }
      addOrphan(v);
      return;
    }
    // Nothing of this tree leads into v any more: v becomes free; neighbours that could reach it
    // later are woken so the tree can grow back into it.
    for (let k = 0; k < childCount; k++) addOrphan(children[k]!);
    tree[v] = FREE;
    parent[v] = NO_PARENT;
    for (let r = start; r < end; r++) {
      const u = head[r]!;
      if (u >= limit || tree[u] !== side || parent[u] === NO_PARENT) continue;
      const link = fromSource ? mate[r]! : r;
      if (residual[link]! > 0) activate(u);
    }
  };

  const adoptOrphans = (side: number): void => {
    while (orphanCount > 0) {
      while (orphanFirst[lowestOrphan]! < 0) lowestOrphan++;
      const v = orphanFirst[lowestOrphan]!;
      orphanFirst[lowestOrphan] = orphanNext[v]!;
      orphanCount--;
      if (parent[v] !== ORPHAN || label[v] !== lowestOrphan) continue; // re-queued at a higher label
      repair(v, side);
    }
    lowestOrphan = buckets;
  };

  const popActive = (fromSource: boolean): number => {
    if (fromSource) {
      while (activeFirstS[lowestActiveS]! < 0) lowestActiveS++;
      const v = activeFirstS[lowestActiveS]!;
      activeFirstS[lowestActiveS] = activeNext[v]!;
      activeCountS--;
      isActive[v] = 0;
      return v;
    }
    while (activeFirstT[lowestActiveT]! < 0) lowestActiveT++;
    const v = activeFirstT[lowestActiveT]!;
    activeFirstT[lowestActiveT] = activeNext[v]!;
    activeCountT--;
    isActive[v] = 0;
    return v;
  };

  const maximise = (stats: MaxFlowStats, shouldAbort?: () => boolean): number => {
    stats.phases++;
    let sinceCheck = 0;
    let added = 0;
    while (activeCountS + activeCountT > 0) {
      const growSource = activeCountT === 0 || (activeCountS > 0 && lowestActiveS <= lowestActiveT);
      const p = popActive(growSource);
      const side = tree[p]!;
      if (side === FREE) continue;
      const d = label[p]!;
      const end = firstOut[p + 1]!;
      for (let r = firstOut[p]!; r < end; r++) {
        const q = head[r]!;
        if (q >= limit) continue;
        let bridge: number;
        if (side === SOURCE_TREE) {
          if (residual[r] === 0) continue;
          const qs = tree[q]!;
          if (qs === SOURCE_TREE) continue;
          if (qs === FREE) {
            tree[q] = SOURCE_TREE;
            parent[q] = r;
            ensureBucket(d + GROWTH_STEP);
            label[q] = d + GROWTH_STEP;
            activate(q);
            continue;
          }
          bridge = r;
        } else {
          const back = mate[r]!;
          if (residual[back] === 0) continue;
          const qs = tree[q]!;
          if (qs === SINK_TREE) continue;
          if (qs === FREE) {
            tree[q] = SINK_TREE;
            parent[q] = back;
            ensureBucket(d + GROWTH_STEP);
            label[q] = d + GROWTH_STEP;
            activate(q);
            continue;
          }
          bridge = back;
        }
        added += augment(bridge, stats);
        if (++sinceCheck >= 256) {
          sinceCheck = 0;
          if (shouldAbort?.()) throw new FlowAbortedError('incremental BFS aborted by the caller');
        }
        if (tree[p] !== side) break;
        if (label[p] !== d) {
          activate(p);
          break;
        }
        r--; // the same arc may carry more
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
    save(): IncrementalSolverSnapshot {
      return { tree: tree.slice(), parent: parent.slice(), label: label.slice(), residual: residual.slice(), limit };
    },
    restore(snapshot: IncrementalSolverSnapshot): void {
      // Between maximise() calls the active and orphan queues are empty, so the trees, labels
      // and residual capacities are the whole state.
      tree.set(snapshot.tree);
      parent.set(snapshot.parent);
      label.set(snapshot.label);
      residual.set(snapshot.residual);
      limit = snapshot.limit;
      while (activeCountS + activeCountT > 0) isActive[popActive(activeCountS > 0)] = 0;
    },
    get nodeLimit() {
      return limit;
    },
  };
}

/** One-shot run for the front door. */
export function incrementalBfs(ctx: SolveContext): void {
  createIncrementalBfs(ctx.network, ctx.residual, ctx.source, ctx.sink, ctx.nodeLimit).maximise(ctx.stats, ctx.shouldAbort);
}

// What the two tree-keeping solvers (Boykov–Kolmogorov and incremental BFS) share: a source tree
// and a sink tree over residual arcs, each node's parent arc, the path through a bridge arc and
// its bottleneck, and the resumable operations that wake tree nodes next to a change.

import { raisedResidual } from './capacity';
import type { FlowNetwork } from './flow-network';
import type { ResidualUndoLog } from './residual-undo-log';
import type { WorkArrays } from './work-arrays';

export const FREE = 0;
export const SOURCE_TREE = 1;
export const SINK_TREE = 2;
/** parent[] markers; any value ≥ 0 is a residual arc (from the parent in the source tree, to it in the sink tree). */
export const NO_PARENT = -1;
export const ROOT = -2;
export const ORPHAN = -3;

/** Counters a maximise() call carries between its growth steps. */
export interface GrowthProgress {
  added: number;
  sinceCheck: number;
}

export abstract class SearchTrees {
  protected readonly firstOut: Int32Array;
  protected readonly head: Int32Array;
  protected readonly mate: Int32Array;
  protected readonly n: number;
  protected limit: number;
  protected readonly tree: Uint8Array;
  protected readonly parent: Int32Array;

  constructor(
    network: FlowNetwork,
    protected readonly residual: Int32Array,
    protected readonly source: number,
    protected readonly sink: number,
    initialNodeLimit: number,
    protected readonly undoLog: ResidualUndoLog | null,
    work: WorkArrays,
  ) {
    this.firstOut = network.firstOut;
    this.head = network.head;
    this.mate = network.mate;
    this.n = network.nodeCount;
    this.limit = initialNodeLimit;
    this.tree = work.uint8(this.n);
    this.parent = work.int32(this.n, NO_PARENT);
  }

  /** Queues a tree node for growth (no-op when already queued). */
  protected abstract activate(v: number): void;

  /** Roots both trees; called by the subclass once its own arrays exist. */
  protected plantRoots(): void {
    this.tree[this.source] = SOURCE_TREE;
    this.parent[this.source] = ROOT;
    this.tree[this.sink] = SINK_TREE;
    this.parent[this.sink] = ROOT;
    this.activate(this.source);
    this.activate(this.sink);
  }

  get nodeLimit(): number {
    return this.limit;
  }

  /** The smallest residual along source ⇝ tail(bridge) → head(bridge) ⇝ sink. */
  protected bottleneckOf(bridge: number): number {
    const { residual, parent, head, mate, source, sink } = this;
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
    return bottleneck;
  }

  /** Moves `amount` units over residual arc r (logged for the undo log first). */
  protected push(r: number, amount: number): void {
    if (this.undoLog !== null) this.undoLog.note(r);
    this.residual[r]! -= amount;
    this.residual[this.mate[r]!]! += amount;
  }

  /** Lets nodes up to newLimit − 1 take part; their arcs to older nodes wake those nodes. */
  extendNodeLimit(newLimit: number): void {
    const { firstOut, head, tree } = this;
    const old = this.limit;
    this.limit = newLimit;
    for (let v = old; v < newLimit; v++) {
      for (let r = firstOut[v]!, end = firstOut[v + 1]!; r < end; r++) {
        const u = head[r]!;
        if (u < old && tree[u] !== FREE) this.activate(u);
      }
    }
  }

  /** Adds `amount` to the residual capacity of residual arc r and wakes its tree ends. */
  raiseCapacity(r: number, amount: number): void {
    const { head, mate, tree } = this;
    if (this.undoLog !== null) this.undoLog.note(r);
    this.residual[r] = raisedResidual(this.residual, mate, r, amount);
    const tail = head[mate[r]!]!;
    if (tree[tail] !== FREE) this.activate(tail);
    if (tree[head[r]!] !== FREE) this.activate(head[r]!);
  }
}

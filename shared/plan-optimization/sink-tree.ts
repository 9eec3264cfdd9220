// A search tree grown backwards from the sink over residual arcs (the sink half of Boykov &
// Kolmogorov 2004, IEEE TPAMI 26(9)): every node that can reach the sink hangs on it by a residual
// arc towards the sink, so a node with excess finds its way out by walking up, in the length of
// the path. After an augmentation or any other change of residual capacities, nodes whose tree
// arc ran dry (orphans) look for another parent in the tree or leave it, and tree nodes next to
// new residual capacity grow the tree again, so it keeps holding exactly the nodes that can reach
// the sink. The tree of a base flow is grown once and copied for each what-if (a closed road),
// which then costs what its changes touch instead of a search over the whole network.

import type { FlowNetwork, FlowState } from '../flow';

const FREE = -1;
const ROOT = -2;
const ORPHAN = -3;

export interface SinkTreeSnapshot {
  readonly parent: Int32Array;
}

export class SinkTree {
  /** Residual arc from the node towards its parent; FREE (not in the tree), ROOT (the sink) or ORPHAN. */
  readonly parent: Int32Array;
  private readonly stamp: Int32Array;
  private readonly verdict: Uint8Array;
  private time = 1;
  // Woken tree nodes, first in first out so the tree grows breadth-first and stays shallow
  // (every walk to the root is as long as the node's depth).
  private active: number[] = [];
  private activeAt = 0;
  private readonly orphans: number[] = [];

  constructor(
    private readonly network: FlowNetwork,
    private readonly residual: Int32Array,
    private readonly sink: number,
    private readonly limit: number,
    from?: SinkTreeSnapshot,
  ) {
    const n = network.nodeCount;
    this.stamp = new Int32Array(n);
    this.verdict = new Uint8Array(n);
    if (from) this.parent = from.parent.slice();
    else {
      this.parent = new Int32Array(n).fill(FREE);
      this.parent[sink] = ROOT;
      this.active.push(sink);
      this.settle();
    }
  }

  snapshot(): SinkTreeSnapshot {
    return { parent: this.parent.slice() };
  }

  inTree(v: number): boolean {
    return this.parent[v]! !== FREE;
  }

  /**
   * To be called after residual[r] changed: an arc that ran dry orphans its tail if it was the
   * tail's tree arc; an arc that gained capacity into the tree lets its tail join (by waking the head).
   */
  changed(r: number): void {
    const { head, mate } = this.network;
    const tail = head[mate[r]!]!;
    if (this.residual[r] === 0) {
      if (this.parent[tail] === r) {
        this.parent[tail] = ORPHAN;
        this.orphans.push(tail);
      }
    } else if (this.parent[tail] === FREE && this.parent[head[r]!] !== FREE) this.active.push(head[r]!);
  }

  /** Adopts or frees the orphans, then grows from the woken nodes; afterwards the tree is exact. */
  settle(): void {
    const { firstOut, head, mate } = this.network;
    const { parent, residual, limit } = this;
    // Paths verified to reach the sink stay valid for the whole round: adoption only hangs orphans
    // on verified nodes, and a node that leaves the tree never had a verified path.
    this.time++;
    while (this.orphans.length > 0 || this.activeAt < this.active.length) {
      if (this.activeAt > 65536 && this.activeAt * 2 > this.active.length) {
        this.active = this.active.slice(this.activeAt);
        this.activeAt = 0;
      }
      while (this.orphans.length > 0) {
        const i = this.orphans.pop()!;
        if (parent[i] !== ORPHAN) continue;
        let best = -1;
        for (let r = firstOut[i]!, end = firstOut[i + 1]!; r < end; r++) {
          const j = head[r]!;
          if (j >= limit || residual[r]! <= 0) continue;
          const pj = parent[j]!;
          if (pj === FREE || pj === ORPHAN) continue;
          if (this.reachesRoot(j)) {
            best = r;
            break;
          }
        }
        if (best >= 0) {
          parent[i] = best;
          // Free nodes that reach i could not join while it was an orphan.
          this.active.push(i);
          continue;
        }
        // No way back to the sink: i leaves the tree; its children are orphans, and tree
        // neighbours that i could reach are woken so i may rejoin once they are settled.
        parent[i] = FREE;
        for (let r = firstOut[i]!, end = firstOut[i + 1]!; r < end; r++) {
          const j = head[r]!;
          if (j >= limit) continue;
          const pj = parent[j]!;
          if (pj === mate[r]) {
            parent[j] = ORPHAN;
            this.orphans.push(j);
          } else if (pj !== FREE && pj !== ORPHAN && residual[r]! > 0) this.active.push(j);
        }
      }
      // Growth: free nodes with a residual arc into a woken tree node join the tree.
      while (this.activeAt < this.active.length && this.orphans.length === 0) {
        const w = this.active[this.activeAt++]!;
        const pw = parent[w]!;
        if (pw === FREE || pw === ORPHAN) continue;
        for (let r = firstOut[w]!, end = firstOut[w + 1]!; r < end; r++) {
          const q = head[r]!;
          if (q >= limit || parent[q] !== FREE) continue;
          const link = mate[r]!;
          if (residual[link]! <= 0) continue;
          parent[q] = link;
          this.active.push(q);
        }
      }
    }
  }

  /**
   * Whether j's tree path ends at the sink (not at an orphan). Verdicts are cached for the round:
   * a valid path stays valid (adoption only hangs orphans on verified nodes); an invalid one may
   * turn valid when its orphan is adopted later in the round, which then costs only a node that
   * leaves the tree and is grown back.
   */
  private reachesRoot(j: number): boolean {
    const { parent, stamp, verdict, time } = this;
    const { head } = this.network;
    let k = j;
    let ok: boolean;
    for (;;) {
      if (stamp[k] === time) {
        ok = verdict[k] === 1;
        break;
      }
      const a = parent[k]!;
      if (a === ROOT) {
        ok = true;
        break;
      }
      if (a < 0) {
        ok = false;
        break;
      }
      k = head[a]!;
    }
    const mark = ok ? 1 : 0;
    for (let m = j; stamp[m] !== time; ) {
      stamp[m] = time;
      verdict[m] = mark;
      const a = parent[m]!;
      if (a < 0) break;
      m = head[a]!;
    }
    return ok;
  }

  /**
   * Sends up to `amount` from node v to the sink along tree paths, keeping the tree exact;
   * returns what was sent (less only when v can no longer reach the sink).
   */
  sendToSink(state: FlowState, v: number, amount: number): number {
    const { head, mate } = this.network;
    const { residual } = state;
    let sent = 0;
    while (sent < amount && this.inTree(v)) {
      let bottleneck = amount - sent;
      for (let k = v; k !== this.sink; k = head[this.parent[k]!]!) bottleneck = Math.min(bottleneck, residual[this.parent[k]!]!);
      const path: number[] = [];
      for (let k = v; k !== this.sink; k = head[this.parent[k]!]!) path.push(this.parent[k]!);
      for (const r of path) {
        residual[r]! -= bottleneck;
        residual[mate[r]!]! += bottleneck;
      }
      for (const r of path) {
        this.changed(r);
        this.changed(mate[r]!);
      }
      sent += bottleneck;
      this.settle();
    }
    return sent;
  }
}

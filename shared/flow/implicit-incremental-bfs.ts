// Incremental BFS (incremental-bfs.ts: bidirectional search trees repaired in label order, a
// variant of Goldberg, Hed, Kaplan, Tarjan & Werneck, ESA 2011) on the implicit time-expanded
// network (implicit-expanded.ts), where a residual arc's head and mate are computed from its
// layer and template entry instead of read from arrays. The steps are those of incremental-bfs.ts,
// taken in the same order over arcs listed in the same order, so on the same problem it finds the
// same flow as incremental-bfs.ts on the explicit layout (checked arc by arc in
// tests/shared/flow/implicit-expanded.test.ts). A change to the growth or repair rule there must
// be made here too.
//
// Why a second copy of the algorithm rather than one solver reading both layouts through an
// interface (first, end, head and mate as methods): that was built and measured (same flows arc by
// arc), and it cost the expanded-5m bench's curve about a third more CPU time (12.9 and 13.5 s
// against 10.8 and 9.1 s here, alternating runs at load 14–15): the interface computes an arc's
// layer with a division on every head and mate, where this copy takes the layer of the node it
// scans once and reads the template entries directly.
//
// Memory: 18 bytes per node (tree 1, parent 4, label 4, active link 4 and flag 1, orphan link 4)
// plus the label buckets; the residuals belong to the caller.

import { FlowAbortedError } from './errors';
import type { ImplicitExpandedNetwork } from './implicit-expanded';
import type { MaxFlowStats } from './solve-context';

const FREE = 0;
const SOURCE_TREE = 1;
const SINK_TREE = 2;
const NO_PARENT = -1;
const ROOT = -2;
const ORPHAN = -3;
/** As incremental-bfs.ts's GROWTH_STEP. */
const GROWTH_STEP = 4;

/** Called before residual[r] or residual[mate(r)] changes (the curve's undo log). */
export interface ResidualChangeNote {
  note(r: number): void;
}

export class ImplicitIncrementalBfs {
  private readonly net: ImplicitExpandedNetwork;
  private readonly residual: Int32Array;
  private readonly n: number;
  private limit: number;
  /** Layers 0..limitLayer take part (limit = net.nodeLimitAtHorizon(limitLayer)). */
  private limitLayer: number;
  private readonly tree: Uint8Array;
  private readonly parent: Int32Array;
  private readonly label: Int32Array;
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
  private readonly children: Int32Array;
  private readonly undoLog: ResidualChangeNote | null;
  private added = 0;
  private sinceCheck = 0;

  constructor(net: ImplicitExpandedNetwork, residual: Int32Array, horizon: number, undoLog: ResidualChangeNote | null = null, initialBuckets = 1 << 16) {
    this.net = net;
    this.residual = residual;
    const n = (this.n = net.nodeCount);
    this.limitLayer = horizon;
    this.limit = net.nodeLimitAtHorizon(horizon);
    this.tree = new Uint8Array(n);
    this.parent = new Int32Array(n).fill(NO_PARENT);
    this.label = new Int32Array(n);
    this.activeNext = new Int32Array(n);
    this.isActive = new Uint8Array(n);
    this.orphanNext = new Int32Array(n);
    this.children = new Int32Array(net.maxDegree + 1);
    this.undoLog = undoLog;
    this.buckets = Math.max(2, Math.min(n + 2, initialBuckets));
    this.activeFirstS = new Int32Array(this.buckets).fill(-1);
    this.activeFirstT = new Int32Array(this.buckets).fill(-1);
    this.orphanFirst = new Int32Array(this.buckets).fill(-1);
    this.lowestActiveS = this.buckets;
    this.lowestActiveT = this.buckets;
    this.lowestOrphan = this.buckets;
    const { source, sink } = net;
    this.tree[source] = SOURCE_TREE;
    this.parent[source] = ROOT;
    this.tree[sink] = SINK_TREE;
    this.parent[sink] = ROOT;
    this.activate(source);
    this.activate(sink);
  }

  get nodeLimit(): number {
    return this.limit;
  }

  private headOf(r: number): number {
    return this.net.headOf(r);
  }

  private mateOf(r: number): number {
    return this.net.mateOf(r);
  }

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

  private activate(v: number): void {
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

  private push(r: number, amount: number): void {
    if (this.undoLog !== null) this.undoLog.note(r);
    this.residual[r]! -= amount;
    this.residual[this.mateOf(r)]! += amount;
  }

  private bottleneckOf(bridge: number): number {
    const { residual, parent, net } = this;
    const { source, sink } = net;
    let bottleneck = residual[bridge]!;
    for (let v = this.headOf(this.mateOf(bridge)); v !== source; ) {
      const a = parent[v]!;
      if (residual[a]! < bottleneck) bottleneck = residual[a]!;
      v = this.headOf(this.mateOf(a));
    }
    for (let v = this.headOf(bridge); v !== sink; ) {
      const a = parent[v]!;
      if (residual[a]! < bottleneck) bottleneck = residual[a]!;
      v = this.headOf(a);
    }
    return bottleneck;
  }

  private augment(bridge: number, stats: MaxFlowStats): number {
    const { residual, parent, net } = this;
    const { source, sink } = net;
    const bottleneck = this.bottleneckOf(bridge);
    this.push(bridge, bottleneck);
    let sourceOrphans = 0;
    for (let v = this.headOf(this.mateOf(bridge)); v !== source; ) {
      const a = parent[v]!;
      const up = this.headOf(this.mateOf(a));
      this.push(a, bottleneck);
      if (residual[a] === 0) {
        this.addOrphan(v);
        sourceOrphans++;
      }
      v = up;
    }
    if (sourceOrphans > 0) this.adoptOrphans(SOURCE_TREE);
    for (let v = this.headOf(bridge); v !== sink; ) {
      const a = parent[v]!;
      const down = this.headOf(a);
      this.push(a, bottleneck);
      if (residual[a] === 0) this.addOrphan(v);
      v = down;
    }
    if (this.orphanCount > 0) this.adoptOrphans(SINK_TREE);
    stats.augmentations++;
    return bottleneck;
  }

  private adoptOrphans(side: number): void {
    const { orphanNext, parent, label } = this;
    while (this.orphanCount > 0) {
      while (this.orphanFirst[this.lowestOrphan]! < 0) this.lowestOrphan++;
      const v = this.orphanFirst[this.lowestOrphan]!;
      this.orphanFirst[this.lowestOrphan] = orphanNext[v]!;
      this.orphanCount--;
      if (parent[v] !== ORPHAN || label[v] !== this.lowestOrphan) continue;
      this.repair(v, side);
    }
    this.lowestOrphan = this.buckets;
  }

  // The arcs of a node, as [first, end) over template entries of its layer (layer nodes) or over
  // a terminal's list; `arcAt`/`otherEnd` read them. Entries whose other end lies outside the
  // layers 0..limitLayer, or before step 0, give −1 (the explicit layout has no such arc below
  // the limit).

  // Re-attach or relabel one orphan (incremental-bfs.ts's repair).
  private repair(v: number, side: number): void {
    const { tree, parent, label, residual, children, net } = this;
    const fromSource = side === SOURCE_TREE;
    const d = label[v]!;
    let best = -1;
    let bestLabel = d;
    let lowest = -1;
    let childCount = 0;
    const terminal = v < net.layerBase;
    const list = terminal ? net.terminalArcs[v]! : null;
    const layer = terminal ? 0 : Math.floor((v - net.layerBase) / net.layerSize);
    const x = terminal ? 0 : v - net.layerBase - layer * net.layerSize;
    const base = net.prefix + layer * net.arcsPerLayer;
    const K = net.arcsPerLayer;
    const { entryMateShift, entryOther, entryMate, layerBase, layerSize, prefix } = net;
    const limitLayer = this.limitLayer;
    const start = terminal ? 0 : net.entryStart[x]!;
    const end = terminal ? list!.length : net.entryStart[x + 1]!;
    for (let k = start; k < end; k++) {
      let r: number;
      let u: number;
      let m: number;
      if (list !== null) {
        r = list[k]!;
        u = this.headOf(r);
        if (u >= this.limit) continue;
        m = this.mateOf(r);
      } else {
        const ol = layer + entryMateShift[k]!;
        if (ol < 0 || ol > limitLayer) continue;
        r = base + k;
        const o = entryOther[k]!;
        u = o < 0 ? -1 - o : layerBase + ol * layerSize + o;
        m = prefix + ol * K + entryMate[k]!;
      }
      if (tree[u] !== side || u === v) continue;
      const pu = parent[u]!;
      if (pu === NO_PARENT || pu === ORPHAN) continue;
      if (pu >= 0 && (fromSource ? this.headOf(this.mateOf(pu)) : this.headOf(pu)) === v) {
        if (pu === (fromSource ? r : m)) children[childCount++] = u;
        continue;
      }
      const link = fromSource ? m : r;
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

  private setFree(v: number, side: number, childCount: number): void {
    const { tree, parent, residual, children, net } = this;
    const fromSource = side === SOURCE_TREE;
    for (let k = 0; k < childCount; k++) this.addOrphan(children[k]!);
    tree[v] = FREE;
    parent[v] = NO_PARENT;
    const terminal = v < net.layerBase;
    const list = terminal ? net.terminalArcs[v]! : null;
    const layer = terminal ? 0 : Math.floor((v - net.layerBase) / net.layerSize);
    const x = terminal ? 0 : v - net.layerBase - layer * net.layerSize;
    const base = net.prefix + layer * net.arcsPerLayer;
    const K = net.arcsPerLayer;
    const { entryMateShift, entryOther, entryMate, layerBase, layerSize, prefix } = net;
    const limitLayer = this.limitLayer;
    const start = terminal ? 0 : net.entryStart[x]!;
    const end = terminal ? list!.length : net.entryStart[x + 1]!;
    for (let k = start; k < end; k++) {
      let r: number;
      let u: number;
      let m: number;
      if (list !== null) {
        r = list[k]!;
        u = this.headOf(r);
        if (u >= this.limit) continue;
        m = this.mateOf(r);
      } else {
        const ol = layer + entryMateShift[k]!;
        if (ol < 0 || ol > limitLayer) continue;
        r = base + k;
        const o = entryOther[k]!;
        u = o < 0 ? -1 - o : layerBase + ol * layerSize + o;
        m = prefix + ol * K + entryMate[k]!;
      }
      if (tree[u] !== side || parent[u] === NO_PARENT) continue;
      const link = fromSource ? m : r;
      if (residual[link]! > 0) this.activate(u);
    }
  }

  /** Augments until no augmenting path remains below the node limit; returns the flow added. */
  maximise(stats: MaxFlowStats, shouldAbort?: () => boolean): number {
    stats.phases++;
    this.added = 0;
    this.sinceCheck = 0;
    while (this.activeCountS + this.activeCountT > 0) {
      const growSource = this.activeCountT === 0 || (this.activeCountS > 0 && this.lowestActiveS <= this.lowestActiveT);
      const p = this.popActive(growSource);
      if (this.tree[p] === FREE) continue;
      this.growFrom(p, stats, shouldAbort);
    }
    return this.added;
  }

  private growFrom(p: number, stats: MaxFlowStats, shouldAbort?: () => boolean): void {
    const { tree, parent, label, residual, net } = this;
    const side = tree[p]!;
    const d = label[p]!;
    const terminal = p < net.layerBase;
    const list = terminal ? net.terminalArcs[p]! : null;
    const layer = terminal ? 0 : Math.floor((p - net.layerBase) / net.layerSize);
    const x = terminal ? 0 : p - net.layerBase - layer * net.layerSize;
    const base = net.prefix + layer * net.arcsPerLayer;
    const K = net.arcsPerLayer;
    const { entryMateShift, entryOther, entryMate, layerBase, layerSize, prefix } = net;
    const start = terminal ? 0 : net.entryStart[x]!;
    const end = terminal ? list!.length : net.entryStart[x + 1]!;
    for (let k = start; k < end; k++) {
      let r: number;
      let q: number;
      let m: number;
      if (list !== null) {
        r = list[k]!;
        q = this.headOf(r);
        if (q >= this.limit) continue;
        m = this.mateOf(r);
      } else {
        const ol = layer + entryMateShift[k]!;
        if (ol < 0 || ol > this.limitLayer) continue;
        r = base + k;
        const o = entryOther[k]!;
        q = o < 0 ? -1 - o : layerBase + ol * layerSize + o;
        m = prefix + ol * K + entryMate[k]!;
      }
      const link = side === SOURCE_TREE ? r : m;
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
      this.added += this.augment(link, stats);
      if (++this.sinceCheck >= 256) {
        this.sinceCheck = 0;
        if (shouldAbort?.()) throw new FlowAbortedError('incremental BFS aborted by the caller');
      }
      if (tree[p] !== side) break;
      if (label[p] !== d) {
        this.activate(p);
        break;
      }
      k--; // the same arc may carry more
    }
  }

  /** Lets the layers up to `horizon` take part; their present arcs to older nodes wake those nodes. */
  extendToHorizon(horizon: number): void {
    const { tree, net } = this;
    const old = this.limit;
    const oldLayer = this.limitLayer;
    this.limit = net.nodeLimitAtHorizon(horizon);
    this.limitLayer = horizon;
    const { entryStart, entryBack, entrySlot, entryMateShift, entryOther, layerBase, layerSize, layerSize: L } = net;
    for (let layer = oldLayer + 1; layer <= horizon; layer++) {
      for (let x = 0; x < L; x++) {
        for (let t = entryStart[x]!, end = entryStart[x + 1]!; t < end; t++) {
          const step = layer - entryBack[t]!;
          if (step < 0 || !net.isPresent(step, entrySlot[t]!)) continue;
          const o = entryOther[t]!;
          const u = o < 0 ? -1 - o : layerBase + (layer + entryMateShift[t]!) * layerSize + o;
          if (u < old && tree[u] !== FREE) this.activate(u);
        }
      }
    }
  }
}

function grown(array: Int32Array, size: number): Int32Array {
  const bigger = new Int32Array(size).fill(-1);
  bigger.set(array);
  return bigger;
}

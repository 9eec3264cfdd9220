// The time-expanded network without its copies written out. The explicit layout
// (time-expanded.ts) stores head, mate and capacity of both residual arcs of every expanded arc,
// 28 bytes, plus 5 bytes to map it back and 8 bytes of residual: about 41 bytes per expanded arc,
// 7.6 GiB for the generated county at 60 s over 6 h. Here only the residuals are stored; the rest
// follows from the road (or zone, node or shelter) and the step:
//
//   - Every step has the same slots: the arcs the explicit layout would write for that step if
//     nothing were left out (per zone its release, waiting, gate and entry arcs; every road; every
//     node's waiting arc; every shelter's arrival arc). Slot j of step σ is the arc of kind
//     slotKind[j] departing in step σ; it joins base node slotTail[j] in layer σ to base node
//     slotHead[j] in layer σ + slotSpan[j] (the road's steps τ, 1 for waiting, 0 otherwise).
//     The shelter totals (collector → sink) come before step 0.
//   - A slot is present when the explicit layout would write it (capacity above 0, open in that
//     step, inside the step window of step-window.ts, arriving by the horizon): one bit per slot.
//   - Each layer holds the residual arcs of its nodes in one block of `arcsPerLayer` entries, laid
//     out as a forward star: node x's entries are template entries entryStart[x] .. entryStart[x+1] − 1,
//     in the order the explicit layout gives them (step of departure, then slot, forward before
//     backward), so every solver sees the arcs in the same order and finds the same flow. The
//     source's and the collectors' ends follow the nodes' entries in each layer.
//   - residual[r] for residual arc r = PREFIX + layer·arcsPerLayer + entry: 8 bytes per slot, 4 per
//     residual arc. An entry's mate lies in the layer `entryMateShift` away, at entry `entryMate`,
//     and its other end in the layer `entryMateShift` away, at base node `entryOther`.
//
// Absent slots keep residual 0 at both ends, so they carry nothing; the enumeration skips them
// where the explicit layout would not list them (`isPresentEntry`). Memory: 8 bytes per slot of
// every layer (absent ones included: the pruning saves no memory here, only search), one bit per
// slot, and per-layer templates; the solver adds its per-node arrays.

import { UNBOUNDED_CAPACITY, floorCapacity } from './capacity';
import type { EvacuationProblem } from './evacuation-problem';
import { perStepCapacity } from './road-timing';
import type { RouteTimingError } from './route-timing';
import { ExpandedArcKind, expansionBasics, type ExpandOptions, type TimeExpandedNetwork } from './time-expanded';

/** A base node that is a terminal: −1 − its node id (0 source, 2 + s collector of shelter s). */
const terminal = (id: number): number => -1 - id;

export class ImplicitExpandedNetwork {
  readonly source = 0;
  readonly sink = 1;
  readonly horizonSteps: number;
  readonly timeStepSeconds: number;
  readonly layerBase: number;
  readonly layerSize: number;
  readonly roadNodeCount: number;
  readonly nodeCount: number;
  /** Present slots: the explicit layout's arc count. */
  readonly arcCount: number;
  readonly roadTravelSteps: Int32Array;
  readonly routeTiming: RouteTimingError;
  readonly roadStepCapacity: Int32Array;
  readonly releases: readonly Int32Array[];
  readonly holdoverCapacity: Int32Array;
  readonly zoneCount: number;
  readonly shelterCount: number;

  /** Slots per step, and per slot: kind, reference, base ends (terminal(id) for a terminal), span in steps, capacity (−1: the zone's release of that step). */
  readonly slotsPerLayer: number;
  readonly slotKind: Uint8Array;
  readonly slotRef: Int32Array;
  readonly slotTail: Int32Array;
  readonly slotHead: Int32Array;
  readonly slotSpan: Int32Array;
  readonly slotCapacity: Int32Array;
  /** The shelters' totals, slots before step 0 (capacity per shelter). */
  readonly totalCapacity: Int32Array;
  /** Bit σ·slotsPerLayer + j: slot j of step σ is present. */
  private readonly presence: Uint32Array;

  /** Residual ids below PREFIX are the totals' (2s at the collector, 2s + 1 at the sink). */
  readonly prefix: number;
  readonly arcsPerLayer: number;
  /** Node x's entries: entryStart[x] .. entryStart[x + 1] − 1; the terminals' ends follow (nodeEntries = entryStart[layerSize]). */
  readonly entryStart: Int32Array;
  readonly nodeEntries: number;
  readonly entrySlot: Int32Array;
  /** 1 for the tail end of its slot (the forward residual arc), 0 for the head end. */
  readonly entryForward: Uint8Array;
  /** Layer of this entry − departure step of its slot (0 at the tail, the span at the head). */
  readonly entryBack: Int32Array;
  /** Mate's entry, and its layer − this entry's layer (the other end lies in the same layer). */
  readonly entryMate: Int32Array;
  readonly entryMateShift: Int32Array;
  /** The other end's base node (≥ 0) or terminal(id). */
  readonly entryOther: Int32Array;
  /** Per slot, its tail's and head's entries (−1 where that end is a terminal handled apart: never). */
  readonly slotTailEntry: Int32Array;
  readonly slotHeadEntry: Int32Array;
  /** Residual arcs per terminal in the explicit order: the source's, the sink's, each collector's. */
  readonly terminalArcs: Int32Array[];
  /** A residual id past every layer whose residual stays 0: the mate of an entry whose mate lies outside the horizon. */
  readonly deadArc: number;
  /** Length of a residual array for this network. */
  readonly residualLength: number;
  /** Most residual arcs of one node. */
  readonly maxDegree: number;

  constructor(problem: EvacuationProblem, options: ExpandOptions = {}) {
    const basics = expansionBasics(problem, options);
    const { N, R, Z, S, layerBase, gateOf, layerSize, nodeTotal, entries, earliest, latest, closed, intake } = basics;
    const { timeStepSeconds: dt, horizonSteps: T, zones, shelters, roads } = problem;
    this.horizonSteps = T;
    this.timeStepSeconds = dt;
    this.layerBase = layerBase;
    this.layerSize = layerSize;
    this.roadNodeCount = N;
    this.nodeCount = nodeTotal;
    this.roadTravelSteps = basics.roadTravelSteps;
    this.routeTiming = basics.routeTiming;
    this.roadStepCapacity = basics.roadStepCapacity;
    this.releases = basics.releases;
    this.holdoverCapacity = basics.holdoverCapacity;
    this.zoneCount = Z;
    this.shelterCount = S;

    // Slots of one step, in the explicit layout's order of emission.
    let F = 0;
    for (let z = 0; z < Z; z++) F += 2 + (gateOf[z]! >= 0 ? 1 : 0) + entries[z]!.length;
    F += R + N + S;
    this.slotsPerLayer = F;
    const kind = (this.slotKind = new Uint8Array(F));
    const ref = (this.slotRef = new Int32Array(F));
    const tail = (this.slotTail = new Int32Array(F));
    const head = (this.slotHead = new Int32Array(F));
    const span = (this.slotSpan = new Int32Array(F));
    const cap = (this.slotCapacity = new Int32Array(F));
    let j = 0;
    const slot = (k: ExpandedArcKind, r: number, t: number, h: number, sp: number, c: number): number => {
      kind[j] = k;
      ref[j] = r;
      tail[j] = t;
      head[j] = h;
      span[j] = sp;
      cap[j] = c;
      return j++;
    };
    const zoneSlots = zones.map((zone, z) => {
      const zoneNode = N + z;
      const release = slot(ExpandedArcKind.Release, z, terminal(0), zoneNode, 0, -1);
      const wait = slot(ExpandedArcKind.ZoneWait, z, zoneNode, zoneNode, 1, UNBOUNDED_CAPACITY);
      let exit = zoneNode;
      let gate = -1;
      if (gateOf[z]! >= 0) {
        exit = N + Z + gateOf[z]!;
        gate = slot(ExpandedArcKind.ZoneGate, z, zoneNode, exit, 0, perStepCapacity(zone.releaseVehPerHour!, dt));
      }
      const entrySlots = entries[z]!.map((v) => slot(ExpandedArcKind.ZoneEntry, z, exit, v, 0, UNBOUNDED_CAPACITY));
      return { release, wait, gate, entrySlots };
    });
    const roadSlot0 = j;
    roads.forEach((road, e) => slot(ExpandedArcKind.Road, e, road.from, road.to, basics.roadTravelSteps[e]!, basics.roadStepCapacity[e]!));
    const holdSlot0 = j;
    for (let v = 0; v < N; v++) slot(ExpandedArcKind.Holdover, v, v, v, 1, basics.holdoverCapacity[v]!);
    const arrivalSlot0 = j;
    shelters.forEach((shelter, s) => slot(ExpandedArcKind.ShelterArrival, s, shelter.node, terminal(2 + s), 0, intake[s]!));
    this.totalCapacity = Int32Array.from(shelters, (s) => (s.capacityVehicles === null ? UNBOUNDED_CAPACITY : floorCapacity(s.capacityVehicles)));

    // Presence, by the explicit layout's rules (expandOverTime's emit).
    const presence = (this.presence = new Uint32Array(Math.ceil(((T + 1) * F) / 32) + 1));
    let present = 0;
    const mark = (step: number, k: number, capacity: number): void => {
      if (capacity <= 0) return;
      const bit = step * F + k;
      presence[bit >>> 5]! |= 1 << (bit & 31);
      present++;
    };
    for (let s = 0; s < S; s++) if (this.totalCapacity[s]! > 0) present++;
    for (let step = 0; step <= T; step++) {
      zones.forEach((_, z) => {
        const zs = zoneSlots[z]!;
        mark(step, zs.release, basics.releases[z]![step]!);
        if (step < T) mark(step, zs.wait, UNBOUNDED_CAPACITY);
        if (zs.gate >= 0) mark(step, zs.gate, cap[zs.gate]!);
        entries[z]!.forEach((v, k) => {
          if (step >= earliest[v]! && step <= latest[v]!) mark(step, zs.entrySlots[k]!, UNBOUNDED_CAPACITY);
        });
      });
      for (let e = 0; e < R; e++) {
        const road = roads[e]!;
        const arrival = step + basics.roadTravelSteps[e]!;
        if (arrival > T || step < earliest[road.from]! || arrival > latest[road.to]!) continue;
        if (closed !== null && closed[e] !== undefined && closed[e]![step] === 1) continue;
        mark(step, roadSlot0 + e, cap[roadSlot0 + e]!);
      }
      if (step < T) {
        for (let v = 0; v < N; v++) {
          if (step >= earliest[v]! && step < latest[v]!) mark(step, holdSlot0 + v, cap[holdSlot0 + v]!);
        }
      }
      for (let s = 0; s < S; s++) {
        if (step >= earliest[shelters[s]!.node]!) mark(step, arrivalSlot0 + s, cap[arrivalSlot0 + s]!);
      }
    }
    this.arcCount = present;

    // Template entries: each slot's ends at base nodes, grouped by node, in the explicit order.
    const count = new Int32Array(layerSize + 1);
    for (let k = 0; k < F; k++) {
      if (tail[k]! >= 0) count[tail[k]! + 1]!++;
      if (head[k]! >= 0) count[head[k]! + 1]!++;
    }
    for (let x = 0; x < layerSize; x++) count[x + 1]! += count[x]!;
    const nodeEntries = count[layerSize]!;
    const K = nodeEntries + Z + S; // the source's end of each release, each collector's end of each arrival
    this.nodeEntries = nodeEntries;
    this.arcsPerLayer = K;
    this.entryStart = count;
    const entrySlot = (this.entrySlot = new Int32Array(K));
    const entryForward = (this.entryForward = new Uint8Array(K));
    const entryBack = (this.entryBack = new Int32Array(K));
    const fill = count.slice(0, layerSize);
    const slotTailEntry = (this.slotTailEntry = new Int32Array(F).fill(-1));
    const slotHeadEntry = (this.slotHeadEntry = new Int32Array(F).fill(-1));
    for (let k = 0; k < F; k++) {
      if (tail[k]! >= 0) {
        const t = fill[tail[k]!]!++;
        entrySlot[t] = k;
        entryForward[t] = 1;
        entryBack[t] = 0;
      }
      if (head[k]! >= 0) {
        const t = fill[head[k]!]!++;
        entrySlot[t] = k;
        entryForward[t] = 0;
        entryBack[t] = span[k]!;
      }
    }
    // Within a node: departure step first (a larger back is an earlier step), then slot, forward first.
    for (let x = 0; x < layerSize; x++) {
      const from = count[x]!;
      const to = count[x + 1]!;
      if (to - from < 2) continue;
      const order = Array.from({ length: to - from }, (_, i) => from + i).sort(
        (a, b) => entryBack[b]! - entryBack[a]! || entrySlot[a]! - entrySlot[b]! || entryForward[b]! - entryForward[a]!,
      );
      const slots = order.map((t) => entrySlot[t]!);
      const forwards = order.map((t) => entryForward[t]!);
      const backs = order.map((t) => entryBack[t]!);
      for (let i = 0; i < order.length; i++) {
        entrySlot[from + i] = slots[i]!;
        entryForward[from + i] = forwards[i]!;
        entryBack[from + i] = backs[i]!;
      }
    }
    for (let t = 0; t < nodeEntries; t++) {
      if (entryForward[t] === 1) slotTailEntry[entrySlot[t]!] = t;
      else slotHeadEntry[entrySlot[t]!] = t;
    }
    zones.forEach((_, z) => {
      const t = nodeEntries + z;
      entrySlot[t] = zoneSlots[z]!.release;
      entryForward[t] = 1;
      slotTailEntry[zoneSlots[z]!.release] = t;
    });
    for (let s = 0; s < S; s++) {
      const t = nodeEntries + Z + s;
      entrySlot[t] = arrivalSlot0 + s;
      entryForward[t] = 0;
      slotHeadEntry[arrivalSlot0 + s] = t;
    }
    const entryMate = (this.entryMate = new Int32Array(K));
    const entryMateShift = (this.entryMateShift = new Int32Array(K));
    const entryOther = (this.entryOther = new Int32Array(K));
    for (let t = 0; t < K; t++) {
      const k = entrySlot[t]!;
      if (entryForward[t] === 1) {
        entryMate[t] = slotHeadEntry[k]!;
        entryMateShift[t] = span[k]!;
        entryOther[t] = head[k]!;
      } else {
        entryMate[t] = slotTailEntry[k]!;
        entryMateShift[t] = -span[k]!;
        entryOther[t] = tail[k]!;
      }
    }

    const prefix = (this.prefix = 2 * S);
    this.deadArc = prefix + (T + 1) * K;
    this.residualLength = this.deadArc + 1;
    if (this.residualLength > 0x7fffffff) throw new RangeError(`time-expanded network too large: ${this.residualLength} residual arcs`);
    const source: number[] = [];
    for (let step = 0; step <= T; step++) for (let z = 0; z < Z; z++) if (this.isPresent(step, zoneSlots[z]!.release)) source.push(prefix + step * K + nodeEntries + z);
    const sink: number[] = [];
    for (let s = 0; s < S; s++) if (this.totalCapacity[s]! > 0) sink.push(2 * s + 1);
    const collectors = shelters.map((_, s) => {
      const arcs: number[] = this.totalCapacity[s]! > 0 ? [2 * s] : [];
      for (let step = 0; step <= T; step++) if (this.isPresent(step, arrivalSlot0 + s)) arcs.push(prefix + step * K + nodeEntries + Z + s);
      return Int32Array.from(arcs);
    });
    this.terminalArcs = [Int32Array.from(source), Int32Array.from(sink), ...collectors];
    let maxDegree = 0;
    for (let x = 0; x < layerSize; x++) maxDegree = Math.max(maxDegree, count[x + 1]! - count[x]!);
    for (const arcs of this.terminalArcs) maxDegree = Math.max(maxDegree, arcs.length);
    this.maxDegree = maxDegree;
  }

  /** Whether slot j of step σ is present. */
  isPresent(step: number, j: number): boolean {
    const bit = step * this.slotsPerLayer + j;
    return (this.presence[bit >>> 5]! & (1 << (bit & 31))) !== 0;
  }

  /** Capacity of slot j in step σ (0 when absent). */
  capacityAt(step: number, j: number): number {
    if (!this.isPresent(step, j)) return 0;
    const c = this.slotCapacity[j]!;
    return c >= 0 ? c : this.releases[this.slotRef[j]!]![step]!;
  }

  /** Residual capacities of the empty flow. */
  createResidual(): Int32Array {
    const { prefix, arcsPerLayer: K, slotsPerLayer: F, slotTailEntry, horizonSteps: T } = this;
    const residual = new Int32Array(this.residualLength);
    for (let s = 0; s < this.shelterCount; s++) residual[2 * s] = this.totalCapacity[s]!;
    for (let step = 0; step <= T; step++) {
      const base = prefix + step * K;
      for (let j = 0; j < F; j++) {
        const c = this.capacityAt(step, j);
        if (c > 0) residual[base + slotTailEntry[j]!] = c;
      }
    }
    return residual;
  }

  /** Residual id of slot j of step σ's forward arc (at its tail) and backward arc (at its head). */
  forwardArc(step: number, j: number): number {
    return this.prefix + step * this.arcsPerLayer + this.slotTailEntry[j]!;
  }

  backwardArc(step: number, j: number): number {
    return this.prefix + (step + this.slotSpan[j]!) * this.arcsPerLayer + this.slotHeadEntry[j]!;
  }

  /** Layer of a node (−1 for a terminal). */
  layerOf(u: number): number {
    return u < this.layerBase ? -1 : Math.floor((u - this.layerBase) / this.layerSize);
  }

  /** The node at the head of residual arc r. */
  headOf(r: number): number {
    const { prefix } = this;
    if (r < prefix) return (r & 1) === 0 ? this.sink : 2 + (r >> 1);
    const q = r - prefix;
    const layer = Math.floor(q / this.arcsPerLayer);
    const t = q - layer * this.arcsPerLayer;
    const other = this.entryOther[t]!;
    return other < 0 ? -1 - other : this.layerBase + (layer + this.entryMateShift[t]!) * this.layerSize + other;
  }

  /** The mate of residual arc r (deadArc when it would lie outside the horizon). */
  mateOf(r: number): number {
    const { prefix } = this;
    if (r < prefix) return r ^ 1;
    const q = r - prefix;
    const K = this.arcsPerLayer;
    const layer = Math.floor(q / K);
    const t = q - layer * K;
    const other = layer + this.entryMateShift[t]!;
    return other < 0 || other > this.horizonSteps ? this.deadArc : prefix + other * K + this.entryMate[t]!;
  }

  /** Whether residual arc r stands for a present slot (the explicit layout lists exactly these). */
  isPresentArc(r: number): boolean {
    if (r < this.prefix) return this.totalCapacity[r >> 1]! > 0;
    if (r >= this.deadArc) return false;
    const q = r - this.prefix;
    const K = this.arcsPerLayer;
    const layer = Math.floor(q / K);
    const t = q - layer * K;
    const step = layer - this.entryBack[t]!;
    return step >= 0 && this.isPresent(step, this.entrySlot[t]!);
  }

  /**
   * The residual arcs of node u that the explicit layout lists, in its order, into `into`; returns
   * how many. Arcs whose other end lies past the horizon are listed (they are present only if
   * that end exists), as in the explicit layout.
   */
  arcsOf(u: number, into: Int32Array): number {
    if (u < this.layerBase) {
      const list = this.terminalArcs[u === 0 ? 0 : u === 1 ? 1 : u]!;
      into.set(list);
      return list.length;
    }
    const layer = Math.floor((u - this.layerBase) / this.layerSize);
    const x = u - this.layerBase - layer * this.layerSize;
    const base = this.prefix + layer * this.arcsPerLayer;
    let n = 0;
    for (let t = this.entryStart[x]!, end = this.entryStart[x + 1]!; t < end; t++) {
      const step = layer - this.entryBack[t]!;
      if (step >= 0 && this.isPresent(step, this.entrySlot[t]!)) into[n++] = base + t;
    }
    return n;
  }

  /** Kind, reference and departure step of the slot of residual arc r. */
  slotOfArc(r: number): { step: number; slot: number; total: boolean } {
    if (r < this.prefix) return { step: -1, slot: r >> 1, total: true };
    const q = r - this.prefix;
    const K = this.arcsPerLayer;
    const layer = Math.floor(q / K);
    const t = q - layer * K;
    return { step: layer - this.entryBack[t]!, slot: this.entrySlot[t]!, total: false };
  }

  /** Nodes below this id take part at horizon t (as nodeLimitAtHorizon). */
  nodeLimitAtHorizon(horizon: number): number {
    return this.layerBase + (horizon + 1) * this.layerSize;
  }

  /**
   * Visits the present arcs in the explicit layout's order (its arc index i), with their forward
   * and backward residual ids: the totals, then step by step, slot by slot.
   */
  forEachArc(visit: (i: number, forward: number, backward: number, step: number, slot: number) => void): void {
    let i = 0;
    for (let s = 0; s < this.shelterCount; s++) if (this.totalCapacity[s]! > 0) visit(i++, 2 * s, 2 * s + 1, -1, s);
    const F = this.slotsPerLayer;
    for (let step = 0; step <= this.horizonSteps; step++) {
      for (let j = 0; j < F; j++) if (this.isPresent(step, j)) visit(i++, this.forwardArc(step, j), this.backwardArc(step, j), step, j);
    }
  }

  /** The explicit network's residual (time-expanded.ts, same problem and options) in this layout. */
  residualFromExplicit(explicit: TimeExpandedNetwork, explicitResidual: Int32Array): Int32Array {
    const { residualOfArc, mate } = explicit.network;
    const residual = new Int32Array(this.residualLength);
    this.forEachArc((i, forward, backward) => {
      residual[forward] = explicitResidual[residualOfArc[i]!]!;
      residual[backward] = explicitResidual[mate[residualOfArc[i]!]!]!;
    });
    return residual;
  }
}

/** Builds the implicit time-expanded network of a validated problem (same options as expandOverTime). */
export function expandImplicitly(problem: EvacuationProblem, options: ExpandOptions = {}): ImplicitExpandedNetwork {
  return new ImplicitExpandedNetwork(problem, options);
}

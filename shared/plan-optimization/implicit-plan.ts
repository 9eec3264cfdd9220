// The searches over time on the implicit time-expanded network (shared/flow/implicit-expanded.ts:
// residuals only, about 10 bytes per arc for a whole solve against about 49 for the written-out
// layout), for plans whose written-out network would not fit the run budget:
//   - implicitCurve: the evacuation curve (incremental BFS horizon by horizon), its clearance
//     step and the maximum flow of its last horizon, kept in place for the read-outs;
//   - forEachImplicitPath: that flow decomposed into source–sink paths, reported as flow-paths.ts
//     reports them on the written-out layout (same zone, shelter, steps and roads per path);
//   - implicitDeliveredBy: one maximum flow at a given horizon.
// Every figure equals the written-out layout's (tests/shared/plan-optimization/layouts.test.ts
// runs each search on both).

import {
  computeImplicitCurve,
  emptyStats,
  ExpandedArcKind,
  ImplicitExpandedNetwork,
  ImplicitIncrementalBfs,
  validateEvacuationProblem,
  type EvacuationProblem,
  type ResidualChangeNote,
} from '../flow';
import type { ExpandedPath } from './flow-paths';

/** Which layout of the time-expanded network a search solves on. */
export type ExpandedLayout = 'explicit' | 'implicit';

export interface ImplicitPlan {
  net: ImplicitExpandedNetwork;
  /** The maximum flow of the last horizon solved (finalHorizon), in the implicit layout. */
  residual: Int32Array;
  clearanceStep: number | null;
  deliveredAtHorizon: number;
  deliveredByStep: number[];
  finalHorizon: number;
}

const demandOf = (problem: EvacuationProblem): number => problem.zones.reduce((sum, zone) => sum + zone.vehicles, 0);

/** The evacuation curve on the implicit network: stops at clearance, else runs to T. */
export function implicitCurve(problem: EvacuationProblem, shouldAbort?: () => boolean): ImplicitPlan {
  validateEvacuationProblem(problem);
  const net = new ImplicitExpandedNetwork(problem);
  const residual = net.createResidual();
  // The cut residual is never taken, so the residual keeps the last horizon's flow.
  const curve = computeImplicitCurve(net, demandOf(problem), residual, { shouldAbort });
  return {
    net,
    residual,
    clearanceStep: curve.clearanceStep,
    deliveredAtHorizon: curve.deliveredByStep[curve.finalHorizon] ?? 0,
    deliveredByStep: curve.deliveredByStep,
    finalHorizon: curve.finalHorizon,
  };
}

/** Most vehicles delivered by the end of step `horizon`: one maximum flow on the implicit network. */
export function implicitDeliveredBy(problem: EvacuationProblem, horizon: number, shouldAbort?: () => boolean): number {
  validateEvacuationProblem(problem);
  const net = new ImplicitExpandedNetwork(problem);
  const residual = net.createResidual();
  return new ImplicitIncrementalBfs(net, residual, horizon).maximise(emptyStats(), shouldAbort);
}

/** Flow on residual arc r when it is the forward arc of a present slot (capacity less residual), else 0. */
export function implicitFlowOn(net: ImplicitExpandedNetwork, residual: Int32Array, r: number): number {
  if (r < net.prefix) return (r & 1) === 0 ? net.totalCapacity[r >> 1]! - residual[r]! : 0;
  if (r >= net.deadArc) return 0;
  const q = r - net.prefix;
  const K = net.arcsPerLayer;
  const layer = Math.floor(q / K);
  const t = q - layer * K;
  if (net.entryForward[t] !== 1) return 0;
  return net.capacityAt(layer, net.entrySlot[t]!) - residual[r]!;
}

export interface ImplicitPathOptions {
  /** Keep each path's residual arc ids in `arcs` (default false: `arcs` is empty). */
  withArcs?: boolean;
}

/**
 * Calls visit once per source–sink path of the flow in `residual` (flow decomposition); the
 * residual is unchanged when this returns (the paths are taken off in place and put back). A
 * circulation met on the way (a cycle of arcs within a step) is cancelled for the walk and
 * reported nowhere: it carries no vehicle from a zone to a shelter. `arcs` holds residual ids of
 * the implicit layout, not arc indices of the written-out one.
 */
export function forEachImplicitPath(
  net: ImplicitExpandedNetwork,
  residual: Int32Array,
  visit: (path: ExpandedPath) => void,
  options: ImplicitPathOptions = {},
): void {
  const { source, sink, slotKind, slotRef } = net;
  const nextArc = new Int32Array(net.nodeCount);
  const arcs = new Int32Array(net.maxDegree + 1);
  let path = new Int32Array(net.horizonSteps * 4 + 16);
  let tails = new Int32Array(path.length);
  const onPath = new Map<number, number>();
  const flowOn = (r: number): number => implicitFlowOn(net, residual, r);
  try {
    for (;;) {
      let depth = 0;
      let v = source;
      onPath.clear();
      while (v !== sink) {
        const count = net.arcsOf(v, arcs);
        let k = nextArc[v]!;
        while (k < count && flowOn(arcs[k]!) <= 0) k++;
        nextArc[v] = k;
        if (k === count) break;
        const r = arcs[k]!;
        if (depth === path.length) {
          const longer = new Int32Array(path.length * 2);
          longer.set(path);
          path = longer;
          const longerTails = new Int32Array(tails.length * 2);
          longerTails.set(tails);
          tails = longerTails;
        }
        onPath.set(v, depth);
        tails[depth] = v;
        path[depth++] = r;
        v = net.headOf(r);
        const back = onPath.get(v);
        if (back !== undefined) {
          // A circulation: cancel it and walk on from where it started.
          let amount = Infinity;
          for (let i = back; i < depth; i++) amount = Math.min(amount, flowOn(path[i]!));
          for (let i = back; i < depth; i++) residual[path[i]!]! += amount;
          for (let i = back; i < depth; i++) onPath.delete(tails[i]!);
          depth = back;
        }
      }
      if (v !== sink) break;
      let amount = Infinity;
      for (let i = 0; i < depth; i++) amount = Math.min(amount, flowOn(path[i]!));
      for (let i = 0; i < depth; i++) residual[path[i]!]! += amount;
      let zone = -1;
      let shelter = -1;
      let entryStep = -1;
      let waits = 0;
      let counting = false;
      let arrivalStep = -1;
      const roads: number[] = [];
      for (let i = 0; i < depth; i++) {
        const r = path[i]!;
        if (r < net.prefix) continue; // the shelter's total
        const { step, slot } = net.slotOfArc(r);
        const kind = slotKind[slot];
        if (kind === ExpandedArcKind.Release) zone = slotRef[slot]!;
        else if (kind === ExpandedArcKind.ZoneEntry) {
          entryStep = step;
          counting = true;
        } else if (kind === ExpandedArcKind.Holdover) {
          if (counting) waits++;
        } else if (kind === ExpandedArcKind.Road) {
          counting = false;
          roads.push(slotRef[slot]!);
        } else if (kind === ExpandedArcKind.ShelterArrival) {
          counting = false;
          shelter = slotRef[slot]!;
          arrivalStep = step;
        }
      }
      visit({ arcs: options.withArcs ? Array.from(path.subarray(0, depth)) : [], vehicles: amount, zone, shelter, entryStep, waitsAtEntry: waits, arrivalStep, roads });
    }
  } finally {
    // Only forward arcs were raised; their mates still hold each arc's flow.
    net.forEachArc((_, forward, backward, step, slot) => {
      const c = step < 0 ? net.totalCapacity[slot]! : net.capacityAt(step, slot);
      residual[forward] = c - residual[backward]!;
    });
  }
}

/**
 * Every change to a residual, noted before it is made (the solver notes its own pushes through
 * ResidualChangeNote), so that undo() puts the residual back exactly: replayed backwards, each
 * entry restores the values its change overwrote. Lets one base flow serve as the warm start of
 * many what-ifs without a copy of the whole residual for each.
 */
export class ResidualJournal implements ResidualChangeNote {
  private arcs = new Int32Array(1 << 12);
  private values = new Int32Array(1 << 13);
  private count = 0;

  constructor(
    private readonly net: ImplicitExpandedNetwork,
    private readonly residual: Int32Array,
  ) {}

  note(r: number): void {
    if (this.count === this.arcs.length) {
      const arcs = new Int32Array(this.arcs.length * 2);
      arcs.set(this.arcs);
      const values = new Int32Array(this.values.length * 2);
      values.set(this.values);
      this.arcs = arcs;
      this.values = values;
    }
    this.arcs[this.count] = r;
    this.values[2 * this.count] = this.residual[r]!;
    this.values[2 * this.count + 1] = this.residual[this.net.mateOf(r)]!;
    this.count++;
  }

  /** Puts back every noted value, last change first, and empties the journal. */
  undo(): void {
    const { arcs, values, residual, net } = this;
    for (let i = this.count - 1; i >= 0; i--) {
      const r = arcs[i]!;
      residual[net.mateOf(r)] = values[2 * i + 1]!;
      residual[r] = values[2 * i]!;
    }
    this.count = 0;
  }
}

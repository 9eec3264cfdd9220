// The closures that hurt most: for each road that carries flow in the plan (or a chosen set,
// such as bridges and ramps), what closing it at the order or at a chosen time costs, in
// vehicles per hour (steady state) and in clearance time (time-expanded). Every what-if starts
// from the base maximum flow: the closed road's flow is rerouted or taken back (removeArcFromFlow),
// then the flow is maximised again, which is exact by max-flow optimality from any feasible flow.
// For the clearance, the base plan at its clearance step stays a warm start: the plan is split
// into paths once (flow decomposition), the paths through the closed road's departures are cut
// there and their vehicles rerouted from where they left the road (closedClearance); if everyone
// is still delivered by then, the clearance does not move, otherwise a bracketed search over
// later horizons (gallop, then bisect) finds the closed clearance with a few maximum flows.

import {
  buildSteadyStateNetwork,
  closedAtInstant,
  closedAtStep,
  copyFlowState,
  ExpandedArcKind,
  maxFlow,
  maximiseInPlace,
  netOutflow,
  nodeLimitAtHorizon,
  implicitRoadUsage,
  type EvacuationProblem,
} from '../flow';
import { implicitClosedClearances, type ImplicitClosureOutcome } from './implicit-closures';
import { implicitCurve, type ExpandedLayout } from './implicit-plan';
import { augmentBetween, removeArcFromFlow } from './bounded-augment';
import { SinkTree, type SinkTreeSnapshot } from './sink-tree';
import { forEachFlowPath, stepOfNode } from './flow-paths';
import { demandOf, evaluateCurve, type CurveEvaluation, type OptimisationHooks } from './problem-tools';

/** The solver for the warm-started closed networks; measured on the demo town (tests/bench/optimization). */
const WARM_ALGORITHM = 'dinic' as const;

export interface ClosureOptions extends OptimisationHooks {
  /** Roads to test (engine indices); default the roads carrying flow in the steady state or the plan. */
  candidates?: readonly number[];
  /** When the road closes (seconds after the order; default 0). It stays closed to the end. */
  closeAtSeconds?: number;
  /** Most roads tested (default 200): the ones carrying the most vehicles in the plan first. */
  maxCandidates?: number;
  /** Also compute the clearance-time loss (default true). */
  clearance?: boolean;
  /**
   * Most roads whose clearance loss is computed (default 20): those losing the most veh/h in
   * the steady state, then carrying the most vehicles in the plan. Each costs a maximum flow of
   * the time-expanded network; the rest report the steady-state loss only.
   */
  maxClearanceTests?: number;
}

export interface ClosureImpact {
  road: number;
  /** veh/h the road carries in the base steady state at the closing instant, and vehicles in the base plan. */
  baseFlowVehPerHour: number;
  basePlanVehicles: number;
  lossVehPerHour: number;
  /** Clearance step with the road closed (null = not within the horizon). */
  clearanceStep: number | null;
  /** Later clearance in steps (null when either the base or the closed case does not clear within the horizon, or not tested). */
  clearanceLossSteps: number | null;
  /** False when only the steady-state loss was computed for this road (maxClearanceTests). */
  clearanceTested: boolean;
  /** Fewer vehicles delivered by the end of the horizon. */
  deliveredLossVehicles: number;
}

export interface ClosureRanking {
  closeAtSeconds: number;
  baseVehPerHour: number;
  baseClearanceStep: number | null;
  baseDeliveredAtHorizon: number;
  /** Largest clearance loss first (a road that stops the evacuation from clearing ranks first), then vehicles per hour. */
  impacts: ClosureImpact[];
  /** Roads with flow left out by maxCandidates. */
  truncated: boolean;
  /**
   * How the clearance was searched (null: not at all): on the written-out network, warm-started
   * from the base plan; or on the implicit one (implicit-closures.ts), warm-started from the base
   * flow, with `freshSolves` roads solved afresh instead.
   */
  clearanceLayout: ExpandedLayout | null;
  freshSolves: number;
}

const closureFrom = (at: number) => [{ fromSeconds: at, untilSeconds: null }];

interface PlanPath {
  arcs: number[];
  vehicles: number;
}
/** A path of the plan that uses a road: the arc's place on the path and its departure step. */
interface PathUse {
  path: number;
  position: number;
  step: number;
}

/**
 * The clearance with road e closed from `at` on, warm-started from the base plan at its final
 * horizon (its clearance step, or T when it does not clear):
 *  1. each plan path that departs on the road once it is closed is cancelled from that arc on,
 *     which leaves its vehicles as excess at the arc's tail and no flow on the closed arcs;
 *  2. that excess is sent on to the sink along the base plan's sink tree (kept exact under the
 *     changes, sink-tree.ts) where the residual network allows, the rest returned to the source,
 *     which gives a feasible flow of the closed network;
 *  3. that flow is already a maximum, so nothing is solved again. If nothing went back, its value
 *     equals the base maximum, which a network with one road fewer cannot exceed. If some excess
 *     went back, its tail was outside the tree (it could not reach the sink) yet reached the
 *     source, so the source could not reach the sink either (the source, node 0, may join the
 *     tree); returning the excess only adds residual arcs towards that tail, and later sends only
 *     add arcs pointing back along their own tree paths, so the source never reaches the sink
 *     again: no augmenting path is left. The property tests compare every answer with a fresh
 *     solve of the closed network;
 *  4. if the demand is not met by the base's clearance step, the closed clearance lies later: the
 *     search gallops over horizons (c + 1, c + 2, c + 4, …, T) and bisects the last bracket, each
 *     probe maximising from the largest failing horizon's flow (horizons are nested, so that flow
 *     stays feasible) instead of solving every horizon in between.
 */
function closedClearance(
  problem: EvacuationProblem,
  curve: CurveEvaluation,
  paths: readonly PlanPath[],
  baseTree: SinkTreeSnapshot,
  uses: readonly PathUse[],
  arcsOfRoad: readonly number[],
  at: number,
  demand: number,
  shouldAbort: (() => boolean) | undefined,
): { clearanceStep: number | null; delivered: number; probes: number } {
  const { expanded } = curve;
  const { network, source, sink } = expanded;
  const { residualOfArc, mate, head } = network;
  const dt = problem.timeStepSeconds;
  const T = problem.horizonSteps;
  const closed = closureFrom(at);
  const state = copyFlowState(curve.state);
  const { residual } = state;
  const firstHorizon = curve.finalHorizon;
  const firstLimit = nodeLimitAtHorizon(expanded, firstHorizon);
  const tree = new SinkTree(network, residual, sink, firstLimit, baseTree);

  const cutAt = new Map<number, number>();
  for (const { path, position, step } of uses) {
    if (!closedAtStep(closed, step, dt)) continue;
    const known = cutAt.get(path);
    if (known === undefined || position < known) cutAt.set(path, position);
  }
  const excess = new Map<number, number>();
  for (const [path, position] of cutAt) {
    const { arcs, vehicles } = paths[path]!;
    for (let i = position; i < arcs.length; i++) {
      const r = residualOfArc[arcs[i]!]!;
      residual[r]! += vehicles;
      residual[mate[r]!]! -= vehicles;
      tree.changed(r);
      tree.changed(mate[r]!);
    }
    const tail = head[mate[residualOfArc[arcs[position]!]!]!]!;
    excess.set(tail, (excess.get(tail) ?? 0) + vehicles);
  }
  // The closed departures now carry nothing; they take nothing either.
  for (const arc of arcsOfRoad) {
    const tail = head[mate[residualOfArc[arc]!]!]!;
    if (closedAtStep(closed, stepOfNode(expanded, tail), dt)) {
      residual[residualOfArc[arc]!] = 0;
      tree.changed(residualOfArc[arc]!);
    }
  }
  tree.settle();
  for (const [tail, amount] of [...excess].sort((a, b) => a[0] - b[0])) {
    const rest = amount - tree.sendToSink(state, tail, amount);
    if (rest > 0 && augmentBetween(network, state, tail, source, rest, firstLimit) !== rest) {
      throw new Error('flow repair failed: the excess could not return to the source');
    }
  }
  let delivered = netOutflow(network, state, source, firstLimit);
  let probes = 1;
  if (delivered >= demand) return { clearanceStep: firstHorizon, delivered, probes };
  if (firstHorizon >= T) return { clearanceStep: null, delivered, probes };

  // Gallop: the flow at `low` (largest horizon known to fall short) is the warm start of every probe.
  let low = firstHorizon;
  let lowState = state;
  let lowDelivered = delivered;
  let high: number | null = null;
  const probe = (horizon: number) => {
    probes++;
    const work = copyFlowState(lowState);
    const limit = nodeLimitAtHorizon(expanded, horizon);
    maximiseInPlace(network, source, sink, work, { nodeLimit: limit, shouldAbort, algorithm: WARM_ALGORITHM });
    return { work, delivered: netOutflow(network, work, source, limit) };
  };
  for (let stride = 1; high === null && low < T; stride *= 2) {
    const horizon = Math.min(T, low + stride);
    const next = probe(horizon);
    if (next.delivered >= demand) high = horizon;
    else {
      low = horizon;
      lowState = next.work;
      lowDelivered = next.delivered;
    }
  }
  if (high === null) return { clearanceStep: null, delivered: lowDelivered, probes };
  let found: number = high;
  while (found - low > 1) {
    const middle: number = (low + found) >> 1;
    const next = probe(middle);
    if (next.delivered >= demand) found = middle;
    else {
      low = middle;
      lowState = next.work;
    }
  }
  return { clearanceStep: found, delivered: demand, probes };
}

export function rankClosures(problem: EvacuationProblem, options: ClosureOptions = {}): ClosureRanking {
  const at = options.closeAtSeconds ?? 0;
  const abort = options.shouldAbort;
  const R = problem.roads.length;

  const steady = buildSteadyStateNetwork(problem, at);
  const base = maxFlow(steady.network, steady.source, steady.sink, { shouldAbort: abort });
  const withClearance = options.clearance !== false;
  const layout = options.layout ?? 'explicit';
  const curve = withClearance && layout === 'explicit' ? evaluateCurve(problem, abort) : null;
  const implicitPlan = withClearance && layout === 'implicit' ? implicitCurve(problem, abort) : null;
  const planVehicles = new Float64Array(R);
  if (implicitPlan) planVehicles.set(implicitRoadUsage(implicitPlan.net, implicitPlan.residual, R).totalVehicles);
  const roadArcs: number[][] = Array.from({ length: R }, () => []);
  // The plan as paths; per road, the paths that use it (with the step they enter it).
  const paths: PlanPath[] = [];
  const pathsOfRoad: PathUse[][] = Array.from({ length: R }, () => []);
  if (curve) {
    const { expanded, state } = curve;
    const { network, arcKind, arcRef } = expanded;
    for (let i = 0; i < network.arcCount; i++) {
      if (arcKind[i] !== ExpandedArcKind.Road) continue;
      roadArcs[arcRef[i]!]!.push(i);
      planVehicles[arcRef[i]!]! += state.residual[network.mate[network.residualOfArc[i]!]!]!;
    }
    forEachFlowPath(expanded, state, (path) => {
      const id = paths.length;
      paths.push({ arcs: path.arcs, vehicles: path.vehicles });
      path.arcs.forEach((a, position) => {
        if (arcKind[a] !== ExpandedArcKind.Road) return;
        const tail = network.head[network.mate[network.residualOfArc[a]!]!]!;
        pathsOfRoad[arcRef[a]!]!.push({ path: id, position, step: stepOfNode(expanded, tail) });
      });
    });
  }

  let pool: number[];
  if (options.candidates) pool = [...new Set(options.candidates)].filter((e) => e >= 0 && e < R);
  else pool = [...Array(R).keys()].filter((e) => base.flow[e]! > 0 || planVehicles[e]! > 0);
  pool = pool.filter((e) => !closedAtInstant(problem.roads[e]!.closures, at) || planVehicles[e]! > 0);
  pool.sort((a, b) => planVehicles[b]! - planVehicles[a]! || base.flow[b]! - base.flow[a]! || a - b);
  const limit = options.maxCandidates ?? 200;
  const truncated = pool.length > limit;
  pool = pool.slice(0, limit);

  const demand = demandOf(problem);
  const impacts: ClosureImpact[] = [];
  // Steady state at the closing instant, every candidate.
  const steadyLoss = new Map<number, number>();
  pool.forEach((e) => {
    const work = copyFlowState(base.state);
    removeArcFromFlow(steady.network, work, e, steady.source, steady.sink);
    maximiseInPlace(steady.network, steady.source, steady.sink, work, { shouldAbort: abort });
    steadyLoss.set(e, base.value - netOutflow(steady.network, work, steady.source));
  });
  options.onProgress?.(0.2);
  const tested = new Set(
    [...pool]
      .sort((a, b) => steadyLoss.get(b)! - steadyLoss.get(a)! || planVehicles[b]! - planVehicles[a]! || a - b)
      .slice(0, curve || implicitPlan ? (options.maxClearanceTests ?? 20) : 0),
  );
  let done = 0;
  const implicitOutcomes: Map<number, ImplicitClosureOutcome> | null = implicitPlan
    ? implicitClosedClearances(problem, implicitPlan, [...tested], at, abort, () => options.onProgress?.(0.2 + (0.8 * ++done) / Math.max(1, tested.size)))
    : null;
  // The base plan's sink tree, grown once; every tested closure starts from a copy.
  const baseTree = curve && tested.size > 0
    ? new SinkTree(curve.expanded.network, curve.state.residual, curve.expanded.sink, nodeLimitAtHorizon(curve.expanded, curve.finalHorizon)).snapshot()
    : null;
  pool.forEach((e) => {
    let clearanceStep: number | null = null;
    let deliveredLoss = 0;
    let clearanceLoss: number | null = null;
    if (curve && tested.has(e)) {
      const outcome = closedClearance(problem, curve, paths, baseTree!, pathsOfRoad[e]!, roadArcs[e]!, at, demand, abort);
      clearanceStep = outcome.clearanceStep;
      deliveredLoss = curve.deliveredAtHorizon - outcome.delivered;
      clearanceLoss = clearanceStep !== null && curve.clearanceStep !== null ? clearanceStep - curve.clearanceStep : null;
    } else if (implicitPlan && implicitOutcomes!.has(e)) {
      const outcome = implicitOutcomes!.get(e)!;
      clearanceStep = outcome.clearanceStep;
      deliveredLoss = implicitPlan.deliveredAtHorizon - outcome.delivered;
      clearanceLoss = clearanceStep !== null && implicitPlan.clearanceStep !== null ? clearanceStep - implicitPlan.clearanceStep : null;
    }
    impacts.push({
      road: e,
      baseFlowVehPerHour: base.flow[e]!,
      basePlanVehicles: planVehicles[e]!,
      lossVehPerHour: steadyLoss.get(e)!,
      clearanceStep: tested.has(e) ? clearanceStep : null,
      clearanceLossSteps: clearanceLoss,
      deliveredLossVehicles: deliveredLoss,
      clearanceTested: tested.has(e),
    });
    if (curve && tested.has(e)) options.onProgress?.(0.2 + (0.8 * ++done) / Math.max(1, tested.size));
  });

  const baseClearanceStep = curve?.clearanceStep ?? implicitPlan?.clearanceStep ?? null;
  const severity = (i: ClosureImpact): number =>
    i.clearanceTested && baseClearanceStep !== null && i.clearanceStep === null ? Number.MAX_SAFE_INTEGER : (i.clearanceLossSteps ?? 0);
  impacts.sort(
    (a, b) =>
      severity(b) - severity(a) ||
      b.deliveredLossVehicles - a.deliveredLossVehicles ||
      b.lossVehPerHour - a.lossVehPerHour ||
      a.road - b.road,
  );
  return {
    closeAtSeconds: at,
    baseVehPerHour: base.value,
    baseClearanceStep,
    baseDeliveredAtHorizon: curve?.deliveredAtHorizon ?? implicitPlan?.deliveredAtHorizon ?? 0,
    impacts,
    truncated,
    clearanceLayout: curve ? 'explicit' : implicitPlan ? 'implicit' : null,
    freshSolves: implicitOutcomes ? [...implicitOutcomes.values()].filter((o) => o.fresh).length : 0,
  };
}

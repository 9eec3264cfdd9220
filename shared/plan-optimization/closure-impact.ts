// The closures that hurt most: for each road that carries flow in the plan (or a chosen set,
// such as bridges and ramps), what closing it at the order or at a chosen time costs, in
// vehicles per hour (steady state) and in clearance time (time-expanded). Every what-if starts
// from the base maximum flow: the closed road's flow is rerouted or taken back (removeArcFromFlow),
// then the flow is maximised again, which is exact by max-flow optimality from any feasible flow.
// For the clearance, the base plan at its clearance step stays a warm start: if the repaired
// flow still delivers everyone by then, the clearance does not move; otherwise later horizons
// are added one at a time, as the evacuation curve does.

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
  type EvacuationProblem,
} from '../flow';
import { removeArcFromFlow } from './bounded-augment';
import { demandOf, evaluateCurve, type OptimisationHooks } from './problem-tools';

export interface ClosureOptions extends OptimisationHooks {
  /** Roads to test (engine indices); default the roads carrying flow in the steady state or the plan. */
  candidates?: readonly number[];
  /** When the road closes (seconds after the order; default 0). It stays closed to the end. */
  closeAtSeconds?: number;
  /** Most roads tested (default 200): the ones carrying the most vehicles in the plan first. */
  maxCandidates?: number;
  /** Also compute the clearance-time loss (default true). */
  clearance?: boolean;
}

export interface ClosureImpact {
  road: number;
  /** veh/h the road carries in the base steady state at the closing instant, and vehicles in the base plan. */
  baseFlowVehPerHour: number;
  basePlanVehicles: number;
  lossVehPerHour: number;
  /** Clearance step with the road closed (null = not within the horizon). */
  clearanceStep: number | null;
  /** Later clearance in steps (null when either the base or the closed case does not clear within the horizon). */
  clearanceLossSteps: number | null;
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
}

const closureFrom = (at: number) => [{ fromSeconds: at, untilSeconds: null }];

export function rankClosures(problem: EvacuationProblem, options: ClosureOptions = {}): ClosureRanking {
  const at = options.closeAtSeconds ?? 0;
  const abort = options.shouldAbort;
  const R = problem.roads.length;

  const steady = buildSteadyStateNetwork(problem, at);
  const base = maxFlow(steady.network, steady.source, steady.sink, { shouldAbort: abort });
  const withClearance = options.clearance !== false;
  const curve = withClearance ? evaluateCurve(problem, abort) : null;
  const planVehicles = new Float64Array(R);
  const roadArcs: number[][] = Array.from({ length: R }, () => []);
  if (curve) {
    const { expanded, state } = curve;
    const { network, arcKind, arcRef } = expanded;
    for (let i = 0; i < network.arcCount; i++) {
      if (arcKind[i] !== ExpandedArcKind.Road) continue;
      roadArcs[arcRef[i]!]!.push(i);
      planVehicles[arcRef[i]!]! += state.residual[network.mate[network.residualOfArc[i]!]!]!;
    }
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
  pool.forEach((e, k) => {
    // Steady state at the closing instant.
    const work = copyFlowState(base.state);
    removeArcFromFlow(steady.network, work, e, steady.source, steady.sink);
    maximiseInPlace(steady.network, steady.source, steady.sink, work, { shouldAbort: abort });
    const value = netOutflow(steady.network, work, steady.source);

    let clearanceStep: number | null = null;
    let deliveredLoss = 0;
    let clearanceLoss: number | null = null;
    if (curve) {
      const { expanded } = curve;
      const { network, source, sink } = expanded;
      const dt = problem.timeStepSeconds;
      const T = problem.horizonSteps;
      const state = copyFlowState(curve.state);
      let horizon = curve.finalHorizon;
      const limitNow = nodeLimitAtHorizon(expanded, horizon);
      for (const arc of roadArcs[e]!) {
        const step = Math.floor((network.head[network.mate[network.residualOfArc[arc]!]!]! - expanded.layerBase) / expanded.layerSize);
        if (closedAtStep(closureFrom(at), step, dt)) removeArcFromFlow(network, state, arc, source, sink, limitNow);
      }
      maximiseInPlace(network, source, sink, state, { nodeLimit: limitNow, shouldAbort: abort });
      let delivered = netOutflow(network, state, source, limitNow);
      while (delivered < demand && horizon < T) {
        horizon++;
        const limitNext = nodeLimitAtHorizon(expanded, horizon);
        maximiseInPlace(network, source, sink, state, { nodeLimit: limitNext, shouldAbort: abort });
        delivered = netOutflow(network, state, source, limitNext);
      }
      clearanceStep = delivered >= demand ? horizon : null;
      deliveredLoss = curve.deliveredAtHorizon - delivered;
      clearanceLoss = clearanceStep !== null && curve.clearanceStep !== null ? clearanceStep - curve.clearanceStep : null;
    }
    impacts.push({
      road: e,
      baseFlowVehPerHour: base.flow[e]!,
      basePlanVehicles: planVehicles[e]!,
      lossVehPerHour: base.value - value,
      clearanceStep,
      clearanceLossSteps: clearanceLoss,
      deliveredLossVehicles: deliveredLoss,
    });
    options.onProgress?.((k + 1) / pool.length);
  });

  const severity = (i: ClosureImpact): number =>
    curve && curve.clearanceStep !== null && i.clearanceStep === null ? Number.MAX_SAFE_INTEGER : (i.clearanceLossSteps ?? 0);
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
    baseClearanceStep: curve?.clearanceStep ?? null,
    baseDeliveredAtHorizon: curve?.deliveredAtHorizon ?? 0,
    impacts,
    truncated,
  };
}

// The closures that hurt most: for each road that carries flow in the plan (or a chosen set,
// such as bridges and ramps), what closing it at the order or at a chosen time costs, in
// vehicles per hour (steady state) and in clearance time (time-expanded). Every what-if starts
// from the base maximum flow: the closed road's flow is rerouted or taken back (removeArcFromFlow),
// then the flow is maximised again, which is exact by max-flow optimality from any feasible flow.
// For the clearance, the base plan at its clearance step stays a warm start: the plan is split
// into paths once (flow decomposition), the paths through the closed road's departures are taken
// out (a feasible flow without it), and the flow is maximised again; if it still delivers
// everyone by then, the clearance does not move, otherwise later horizons are added one at a
// time, as the evacuation curve does.

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
import { forEachFlowPath, stepOfNode } from './flow-paths';
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
  // The plan as paths; per road, the paths that use it (with the step they enter it).
  const paths: { arcs: number[]; vehicles: number }[] = [];
  const pathsOfRoad: { path: number; step: number }[][] = Array.from({ length: R }, () => []);
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
      for (const a of path.arcs) {
        if (arcKind[a] !== ExpandedArcKind.Road) continue;
        const tail = network.head[network.mate[network.residualOfArc[a]!]!]!;
        pathsOfRoad[arcRef[a]!]!.push({ path: id, step: stepOfNode(expanded, tail) });
      }
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
      .slice(0, curve ? (options.maxClearanceTests ?? 20) : 0),
  );
  let done = 0;
  pool.forEach((e) => {
    let clearanceStep: number | null = null;
    let deliveredLoss = 0;
    let clearanceLoss: number | null = null;
    if (curve && tested.has(e)) {
      const { expanded } = curve;
      const { network, source, sink } = expanded;
      const dt = problem.timeStepSeconds;
      const T = problem.horizonSteps;
      const state = copyFlowState(curve.state);
      let horizon = curve.finalHorizon;
      const limitNow = nodeLimitAtHorizon(expanded, horizon);
      // Take out every path that departs on the road once it is closed (each path once).
      const taken = new Set<number>();
      for (const { path, step } of pathsOfRoad[e]!) {
        if (taken.has(path) || !closedAtStep(closureFrom(at), step, dt)) continue;
        taken.add(path);
        const { arcs, vehicles } = paths[path]!;
        for (const a of arcs) {
          const r = network.residualOfArc[a]!;
          state.residual[r]! += vehicles;
          state.residual[network.mate[r]!]! -= vehicles;
        }
      }
      // Then the road's closed departures carry nothing and take nothing.
      for (const arc of roadArcs[e]!) {
        const tail = network.head[network.mate[network.residualOfArc[arc]!]!]!;
        if (closedAtStep(closureFrom(at), stepOfNode(expanded, tail), dt)) state.residual[network.residualOfArc[arc]!] = 0;
      }
      // Boykov–Kolmogorov measured fastest for this warm start on the demo town (tests/bench/optimization).
      maximiseInPlace(network, source, sink, state, { nodeLimit: limitNow, shouldAbort: abort, algorithm: 'boykov-kolmogorov' });
      let delivered = netOutflow(network, state, source, limitNow);
      while (delivered < demand && horizon < T) {
        horizon++;
        const limitNext = nodeLimitAtHorizon(expanded, horizon);
        maximiseInPlace(network, source, sink, state, { nodeLimit: limitNext, shouldAbort: abort, algorithm: 'boykov-kolmogorov' });
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
      lossVehPerHour: steadyLoss.get(e)!,
      clearanceStep: tested.has(e) ? clearanceStep : null,
      clearanceLossSteps: clearanceLoss,
      deliveredLossVehicles: deliveredLoss,
      clearanceTested: tested.has(e),
    });
    if (tested.has(e)) options.onProgress?.(0.2 + (0.8 * ++done) / Math.max(1, tested.size));
  });

  const severity = (i: ClosureImpact): number =>
    i.clearanceTested && curve && curve.clearanceStep !== null && i.clearanceStep === null ? Number.MAX_SAFE_INTEGER : (i.clearanceLossSteps ?? 0);
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

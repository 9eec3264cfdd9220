// Best contraflow: which two-way roads should run one way, outbound, to carry the most vehicles.
//
// Steady state (exact, polynomial): with a super source and a super sink the question is a
// single-source, single-sink maximum flow with arc reversals. Solve the maximum flow on the
// network whose road pairs carry their pooled capacity in both directions, then orient each pair
// by its net flow (Rebennack, Arulselvan, Elefteriadou & Pardalos 2010, "Complexity analysis for
// maximum flow problems with arc reversals", J. Comb. Optim. 19). A pair whose net flow exceeds
// its own direction's capacity is reversed; every other pair keeps its lanes. The oriented
// network carries the pooled flow's net flows, so it reaches the pooled optimum, which bounds
// every orientation from above.
//
// At most k corridors: the reversals are grouped into corridors (reversed pairs that share a
// node). Corridors whose removal keeps the optimum are dropped first (each check an exact solve).
// When more than k remain, a greedy search adds one corridor at a time, the one with the largest
// exactly evaluated throughput. That is a heuristic; the pooled optimum is reported beside it as
// the bound, with the gap.
//
// Time-expanded: a reversal must hold for the whole horizon. The pooled network expanded over
// time is an upper bound on every orientation's curve. A consistent orientation is derived from
// the pooled plan (each pair by its net vehicles over the horizon, reversed where the plan uses
// more than its own capacity in some step); it and the steady-state orientation are evaluated
// exactly, the better one is kept, and its gap to the bound is reported.

import { buildSteadyStateNetwork, floorCapacity, maxFlow, maximiseInPlace, netOutflow, perStepCapacity, type EvacuationProblem } from '../flow';
import type { ExpandedLayout } from './implicit-plan';
import { clearanceOutcome, cloneProblem, planOverTime, type OptimisationHooks } from './problem-tools';
import { applyContraflow, poolPairs, reversiblePair, type PairOrientation, type RoadPair } from './road-pairs';

export interface ContraflowOptions extends OptimisationHooks {
  /** Indices into `pairs` that may be reversed (class or drawn-area limits); default all reversible pairs. */
  candidates?: readonly number[];
  /** At most this many corridors (default no limit). */
  maxCorridors?: number;
  /** The instant whose closures the steady state reflects (default 0). */
  atSeconds?: number;
  /** Also derive and evaluate the time-expanded orientation (default true). */
  timeExpanded?: boolean;
}

export interface ContraflowCorridor {
  orientations: PairOrientation[];
  /** Steady-state gain when this corridor was added (greedy order), else its gain alone. */
  gainVehPerHour: number;
}

export interface SteadyContraflow {
  baseVehPerHour: number;
  /** Maximum flow of the pooled network: no orientation of the candidates can exceed it. */
  boundVehPerHour: number;
  /** Exact steady-state throughput of the chosen orientation. */
  achievedVehPerHour: number;
  corridors: ContraflowCorridor[];
  /** 'exact': the bound is reached (every pooled corridor fits within k). 'greedy-with-bound': k limited the choice. */
  method: 'exact' | 'greedy-with-bound';
  /** Corridors the pooled optimum needs after pruning (more than maxCorridors when greedy ran). */
  corridorsNeeded: number;
  unbounded: boolean;
}

export interface TimeExpandedContraflow {
  base: { clearanceStep: number | null; deliveredAtHorizon: number };
  /** The pooled network over time: a lower bound on clearance and an upper bound on vehicles delivered. */
  bound: { clearanceStep: number | null; deliveredAtHorizon: number };
  chosen: { from: 'steady-state' | 'time-expanded'; orientations: PairOrientation[]; clearanceStep: number | null; deliveredAtHorizon: number };
  /** Chosen clearance minus the bound's, in steps (null when either does not clear within the horizon). */
  gapSteps: number | null;
  gapVehicles: number;
}

export interface ContraflowResult {
  pairs: RoadPair[];
  candidates: number[];
  steady: SteadyContraflow;
  timeExpanded: TimeExpandedContraflow | null;
}

/** Groups orientations into corridors: reversed pairs that share a node. Stable order. */
export function groupCorridors(problem: EvacuationProblem, pairs: readonly RoadPair[], orientations: readonly PairOrientation[]): PairOrientation[][] {
  const parent = orientations.map((_, i) => i);
  const find = (i: number): number => {
    while (parent[i] !== i) i = parent[i] = parent[parent[i]!]!;
    return i;
  };
  const byNode = new Map<number, number>();
  orientations.forEach((o, i) => {
    const road = problem.roads[pairs[o.pair]!.forward]!;
    for (const v of [road.from, road.to]) {
      const j = byNode.get(v);
      if (j === undefined) byNode.set(v, i);
      else parent[find(i)] = find(j);
    }
  });
  const groups = new Map<number, PairOrientation[]>();
  orientations.forEach((o, i) => {
    const root = find(i);
    (groups.get(root) ?? groups.set(root, []).get(root)!).push(o);
  });
  return [...groups.values()];
}

/**
 * Exact steady-state throughput of any orientation, without copying the problem: the steady
 * network is built once and each evaluation starts from its empty residual with the oriented
 * pairs' capacities written in (the outbound road gets the floor of both directions' capacity,
 * the inbound road none), as a scenario's contraflow builds them (road-pairs.ts applyContraflow,
 * then buildSteadyStateNetwork). On the generated county this cut each evaluation from about
 * 1.5 s (copy and build) plus the solve to the solve alone (tests/bench/optimization).
 */
export function steadyEvaluator(problem: EvacuationProblem, pairs: readonly RoadPair[], atSeconds = 0, shouldAbort?: () => boolean) {
  const steady = buildSteadyStateNetwork(problem, atSeconds);
  const { network, source, sink, roadClosed } = steady;
  const evaluate = (orientations: readonly PairOrientation[]): number => {
    const residual = network.capacity.slice();
    for (const { pair, direction } of orientations) {
      const p = pairs[pair]!;
      const out = direction === 'forward' ? p.forward : p.backward;
      const inn = direction === 'forward' ? p.backward : p.forward;
      const pooled = problem.roads[out]!.capacityVehPerHour + problem.roads[inn]!.capacityVehPerHour;
      residual[network.residualOfArc[out]!] = roadClosed[out] ? 0 : floorCapacity(pooled);
      residual[network.residualOfArc[inn]!] = 0;
    }
    const state = { residual };
    maximiseInPlace(network, source, sink, state, { shouldAbort });
    return netOutflow(network, state, source);
  };
  return { evaluate, ownCapacity: steady.roadCapacity };
}

/** The steady-state orientation of the pooled maximum flow, and the pooled value. */
export function pooledSteadyOrientation(
  problem: EvacuationProblem,
  pairs: readonly RoadPair[],
  candidates: readonly number[],
  atSeconds = 0,
  shouldAbort?: () => boolean,
  ownCapacity?: Int32Array,
): { bound: number; unbounded: boolean; orientations: PairOrientation[] } {
  const pooled = cloneProblem(problem);
  poolPairs(pooled, pairs, candidates);
  const steady = buildSteadyStateNetwork(pooled, atSeconds);
  const result = maxFlow(steady.network, steady.source, steady.sink, { shouldAbort });
  // Own capacities as the base network counts them (integer veh/h).
  const own = ownCapacity ?? buildSteadyStateNetwork(problem, atSeconds).roadCapacity;
  const orientations: PairOrientation[] = [];
  for (const i of candidates) {
    const p = pairs[i]!;
    const net = result.flow[p.forward]! - result.flow[p.backward]!;
    if (net > own[p.forward]!) orientations.push({ pair: i, direction: 'forward' });
    else if (-net > own[p.backward]!) orientations.push({ pair: i, direction: 'backward' });
  }
  return { bound: result.value, unbounded: result.unbounded, orientations };
}

export function bestSteadyContraflow(
  problem: EvacuationProblem,
  pairs: readonly RoadPair[],
  candidates: readonly number[],
  options: Omit<ContraflowOptions, 'candidates' | 'timeExpanded'> = {},
): SteadyContraflow {
  const at = options.atSeconds ?? 0;
  const abort = options.shouldAbort;
  const { evaluate, ownCapacity } = steadyEvaluator(problem, pairs, at, abort);
  const throughputWith = (orientations: readonly PairOrientation[]) => evaluate(orientations);
  const base = evaluate([]);
  const { bound, unbounded, orientations } = pooledSteadyOrientation(problem, pairs, candidates, at, abort, ownCapacity);
  let corridors = groupCorridors(problem, pairs, orientations);

  // Drop corridors the optimum does not need (exact check each).
  for (let i = corridors.length - 1; i >= 0 && !unbounded; i--) {
    const without = corridors.filter((_, j) => j !== i);
    if (throughputWith(without.flat()) >= bound) corridors = without;
    options.onProgress?.(0.5 * (1 - i / Math.max(1, corridors.length)));
  }
  const needed = corridors.length;
  const k = options.maxCorridors ?? Infinity;

  if (needed <= k) {
    const gains = corridors.map((c) => throughputWith(c) - base);
    const order = corridors.map((c, i) => ({ c, gain: gains[i]! })).sort((a, b) => b.gain - a.gain);
    const achieved = throughputWith(corridors.flat());
    options.onProgress?.(1);
    return {
      baseVehPerHour: base,
      boundVehPerHour: bound,
      achievedVehPerHour: achieved,
      corridors: order.map(({ c, gain }) => ({ orientations: c, gainVehPerHour: gain })),
      method: achieved >= bound ? 'exact' : 'greedy-with-bound',
      corridorsNeeded: needed,
      unbounded,
    };
  }

  // Greedy: add the corridor with the best exact throughput, k times.
  const chosen: ContraflowCorridor[] = [];
  let current = base;
  let remaining = corridors;
  for (let step = 0; step < k && remaining.length > 0; step++) {
    let best = -1;
    let bestValue = current;
    remaining.forEach((c, i) => {
      const value = throughputWith([...chosen.flatMap((x) => x.orientations), ...c]);
      if (value > bestValue) {
        bestValue = value;
        best = i;
      }
    });
    options.onProgress?.(0.5 + (0.5 * (step + 1)) / k);
    if (best < 0) break; // no single corridor adds anything more
    chosen.push({ orientations: remaining[best]!, gainVehPerHour: bestValue - current });
    current = bestValue;
    remaining = remaining.filter((_, i) => i !== best);
  }
  return {
    baseVehPerHour: base,
    boundVehPerHour: bound,
    achievedVehPerHour: current,
    corridors: chosen,
    method: current >= bound ? 'exact' : 'greedy-with-bound',
    corridorsNeeded: needed,
    unbounded,
  };
}

/** Orientation from the pooled time-expanded plan: net vehicles per pair, reversed where it uses more than its own lanes. */
function timeExpandedOrientation(
  problem: EvacuationProblem,
  pairs: readonly RoadPair[],
  candidates: readonly number[],
  shouldAbort: (() => boolean) | undefined,
  layout: ExpandedLayout,
) {
  const pooled = cloneProblem(problem);
  poolPairs(pooled, pairs, candidates);
  const curve = planOverTime(pooled, layout, shouldAbort);
  const usage = curve.roadUsage(pooled.roads.length);
  const ownStep = evaluateStepCapacities(problem);
  const orientations: PairOrientation[] = [];
  const vehicles: number[] = [];
  for (const i of candidates) {
    const p = pairs[i]!;
    const net = usage.totalVehicles[p.forward]! - usage.totalVehicles[p.backward]!;
    if (net > 0 && usage.peakVehiclesPerStep[p.forward]! > ownStep[p.forward]!) {
      orientations.push({ pair: i, direction: 'forward' });
      vehicles.push(net);
    } else if (net < 0 && usage.peakVehiclesPerStep[p.backward]! > ownStep[p.backward]!) {
      orientations.push({ pair: i, direction: 'backward' });
      vehicles.push(-net);
    }
  }
  return { bound: { clearanceStep: curve.clearanceStep, deliveredAtHorizon: curve.deliveredAtHorizon }, orientations, vehicles };
}

function evaluateStepCapacities(problem: EvacuationProblem): number[] {
  return problem.roads.map((road) => perStepCapacity(road.capacityVehPerHour, problem.timeStepSeconds));
}

function curveWith(
  problem: EvacuationProblem,
  pairs: readonly RoadPair[],
  orientations: readonly PairOrientation[],
  shouldAbort: (() => boolean) | undefined,
  layout: ExpandedLayout,
) {
  const copy = cloneProblem(problem);
  applyContraflow(copy, pairs, orientations);
  return clearanceOutcome(copy, shouldAbort, layout);
}

const sameOrientations = (a: readonly PairOrientation[], b: readonly PairOrientation[]): boolean => {
  const key = (list: readonly PairOrientation[]) => list.map((o) => `${o.pair}:${o.direction}`).sort().join(',');
  return key(a) === key(b);
};

/** Better: clears earlier, else delivers more by the horizon. */
function better(a: { clearanceStep: number | null; deliveredAtHorizon: number }, b: { clearanceStep: number | null; deliveredAtHorizon: number }): boolean {
  if (a.clearanceStep !== null && b.clearanceStep !== null) return a.clearanceStep < b.clearanceStep;
  if (a.clearanceStep !== null) return true;
  if (b.clearanceStep !== null) return false;
  return a.deliveredAtHorizon > b.deliveredAtHorizon;
}

export function bestContraflow(problem: EvacuationProblem, pairs: readonly RoadPair[], options: ContraflowOptions = {}): ContraflowResult {
  const candidates = [...(options.candidates ?? pairs.map((_, i) => i))].filter((i) => pairs[i] && reversiblePair(problem, pairs[i]!));
  const steady = bestSteadyContraflow(problem, pairs, candidates, {
    ...options,
    onProgress: (f) => options.onProgress?.(options.timeExpanded === false ? f : 0.5 * f),
  });
  if (options.timeExpanded === false) return { pairs: [...pairs], candidates, steady, timeExpanded: null };

  const abort = options.shouldAbort;
  const layout = options.layout ?? 'explicit';
  const base = curveWith(problem, pairs, [], abort, layout);
  options.onProgress?.(0.6);
  const derived = timeExpandedOrientation(problem, pairs, candidates, abort, layout);
  options.onProgress?.(0.75);
  let fromCurve = derived.orientations;
  const k = options.maxCorridors ?? Infinity;
  const groups = groupCorridors(problem, pairs, fromCurve);
  if (groups.length > k) {
    // Keep the k corridors that carry the most vehicles in the pooled plan.
    const load = new Map(fromCurve.map((o, i) => [o.pair, derived.vehicles[i]!]));
    const ranked = groups.map((g) => ({ g, v: g.reduce((s, o) => s + (load.get(o.pair) ?? 0), 0) })).sort((a, b) => b.v - a.v);
    fromCurve = ranked.slice(0, k).flatMap((x) => x.g);
  }
  const steadyChoice = steady.corridors.flatMap((c) => c.orientations);
  const a = curveWith(problem, pairs, steadyChoice, abort, layout);
  options.onProgress?.(0.9);
  // The same orientation twice needs one exact evaluation.
  const b = sameOrientations(fromCurve, steadyChoice) ? a : curveWith(problem, pairs, fromCurve, abort, layout);
  options.onProgress?.(1);
  const chosen = better(b, a)
    ? { from: 'time-expanded' as const, orientations: fromCurve, ...b }
    : { from: 'steady-state' as const, orientations: steadyChoice, ...a };
  return {
    pairs: [...pairs],
    candidates,
    steady,
    timeExpanded: {
      base,
      bound: derived.bound,
      chosen,
      gapSteps: chosen.clearanceStep !== null && derived.bound.clearanceStep !== null ? chosen.clearanceStep - derived.bound.clearanceStep : null,
      gapVehicles: derived.bound.deliveredAtHorizon - chosen.deliveredAtHorizon,
    },
  };
}

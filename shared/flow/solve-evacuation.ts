// solveEvacuation: everything the product reports about one evacuation problem, as plain JSON.
// Phases, in order: steady state (static maximum flow and its cut), time expansion, the
// evacuation curve (incremental over horizons), plan read-out (road use, trips, bottlenecks),
// fix ranking, and on request the independent verification of every flow returned.

import type { TimeExpandedBottlenecks } from './bottlenecks';
import { computeEvacuationCurve, type CurveComputation, type CurveMarks } from './evacuation-curve';
import { validateEvacuationProblem, type EvacuationProblem } from './evacuation-problem';
import type { PlannedRouteTiming, RoadUsage, TripSummary } from './expanded-usage';
import { rankFixes, type RoadFix } from './fixes';
import { createFlowState } from './flow-state';
import { computeImplicitCurve } from './implicit-curve';
import { ImplicitExpandedNetwork } from './implicit-expanded';
import { implicitArrivalsByStep, implicitBottlenecks, implicitDecomposeTrips, implicitRoadUsage, verifyImplicit } from './implicit-readout';
import { type MaxFlowAlgorithm, type MaxFlowAlgorithmChoice, type MaxFlowResult } from './max-flow';
import { perStepCapacity } from './road-timing';
import { suggestedTimeStepSeconds, type RouteTimingError } from './route-timing';
import { buildSteadyStateNetwork, solveSteadyState, type SteadyStateNetwork, type SteadyStateSummary } from './steady-state';
import { expandOverTime } from './time-expanded';
import { verify } from './verify';

/** The time-expanded network every read-out works on (implicit-expanded.ts). */
type TimeExpandedNetwork = ImplicitExpandedNetwork;

export type EvacuationPhase = 'steady-state' | 'expand' | 'curve' | 'bottlenecks' | 'fixes' | 'verify';

/** Options of solveEvacuation; all optional. */
export interface SolveEvacuationOptions {
  /** Max-flow algorithm; 'auto' (default) picks by size, and the curve then uses 'incremental-bfs'. */
  algorithm?: MaxFlowAlgorithmChoice;
  /** Instant (seconds from the start) whose closures the steady state reflects; default 0. */
  steadyStateAtSeconds?: number;
  /** Horizon whose time-expanded cut is reported; default: the step before clearance, else T. */
  bottleneckStep?: number;
  /** Most fix what-ifs to solve; default 200. */
  maxFixEvaluations?: number;
  /** Run verify() on every flow returned and report the findings; default false. */
  verify?: boolean;
  /** Called with a phase and its completed share (0..1), often enough for a progress bar. */
  onProgress?: (phase: EvacuationPhase, fraction: number) => void;
  /** A millisecond clock; when given, the result carries per-phase timings. */
  now?: () => number;
  /** Polled between steps; returning true throws FlowAbortedError. */
  shouldAbort?: () => boolean;
  /** Whole steps per road instead of routeTravelSteps (ExpandOptions.roadTravelSteps). */
  roadTravelSteps?: Int32Array;
}

export interface EvacuationWarning {
  code:
    | 'capacity-rounds-to-zero'
    | 'road-longer-than-horizon'
    | 'release-incomplete'
    | 'release-rate-rounds-to-zero'
    | 'steady-state-unbounded'
    | 'route-time-error';
  message: string;
  road?: number;
  zone?: string;
}

export interface ZoneOutcome {
  id: string;
  vehicles: number;
  /** Vehicles that depart within the horizon according to the departure curve. */
  releasedVehicles: number;
  /** Vehicles of this zone delivered in the plan found for the final horizon. */
  deliveredVehicles: number;
  /** Last arrival step of this zone's vehicles in that plan (null if none arrive). */
  lastArrivalStep: number | null;
  steadyStateVehPerHour: number;
}

export interface ShelterOutcome {
  id: string;
  capacityVehicles: number | null;
  arrivedVehicles: number;
  lastArrivalStep: number | null;
  steadyStateVehPerHour: number;
}

export interface EvacuationResult {
  timeStepSeconds: number;
  horizonSteps: number;
  demandVehicles: number;
  steadyState: SteadyStateSummary;
  curve: {
    /** Index t = 0..T: the most vehicles that can have arrived by the end of step t (exact). */
    deliveredVehiclesByStep: number[];
    /** First step with all demand delivered, null = not within the horizon. */
    clearanceStep: number | null;
    marks: CurveMarks;
  };
  /**
   * The plan behind the last horizon solved (min(T, clearanceStep)): one maximum flow of the
   * time-expanded network, of possibly many with the same total.
   */
  plan: {
    horizonStep: number;
    deliveredVehicles: number;
    /**
     * Index t = 0..T: vehicles this plan has delivered by the end of step t. The plan is the
     * maximum flow of its horizon, built up horizon by horizon; it may deliver fewer than the
     * curve at an earlier step (with several shelters whose totals bind, no single plan need
     * reach every step's maximum). Flat after horizonStep.
     */
    deliveredVehiclesByStep: number[];
    /** True when deliveredVehiclesByStep equals the curve at every step: an earliest-arrival plan. */
    earliestArrival: boolean;
    zones: ZoneOutcome[];
    shelters: ShelterOutcome[];
    /** Zone → shelter vehicle counts (indices into problem.zones and problem.shelters). */
    assignments: { zone: number; shelter: number; vehicles: number }[];
    /** Per road (index = road): vehicles over the horizon, the busiest step, and its load. */
    roads: {
      totalVehicles: number[];
      peakVehiclesPerStep: number[];
      /** −1 for an unused road. */
      peakStep: number[];
      /** Peak vehicles per step / per-step capacity. */
      peakUtilisation: number[];
      /** Per-step capacity ⌊veh/h · Δ / 3600⌋ and travel time in steps. */
      stepCapacity: number[];
      travelSteps: number[];
    };
  };
  bottlenecks: TimeExpandedBottlenecks;
  /**
   * How far the time model's route times are from free flow: for every zone and shelter the
   * fastest modelled trip against the fastest free-flow trip (route-timing.ts states the bound).
   */
  routeTiming: RouteTimingError;
  /**
   * The routes the plan's vehicles drive (its decomposition into trips), each route's modelled
   * driving time against its own free-flow time: what the rounding costs the trips actually made.
   */
  plannedRoutes: PlannedRouteTiming;
  /** Ranked, largest gain first. */
  fixes: RoadFix[];
  /** True when some fix candidates were not evaluated (maxFixEvaluations). */
  fixesTruncated: boolean;
  warnings: EvacuationWarning[];
  stats: {
    algorithm: { steadyState: MaxFlowAlgorithm; curve: MaxFlowAlgorithm };
    steadyStateNetwork: { nodes: number; arcs: number };
    timeExpandedNetwork: { nodes: number; arcs: number };
    augmentations: number;
    /** Present when options.now was given. */
    timingsMs?: Partial<Record<EvacuationPhase, number>>;
  };
  /** Present when options.verify was set: verify() on the steady-state and time-expanded flows. */
  verification?: { ok: boolean; problems: string[] };
}

const DEFAULT_MAX_FIX_EVALUATIONS = 200;

/**
 * Solves an evacuation problem. Pure and synchronous (meant for a worker thread); the result is
 * plain JSON. Road, zone and shelter indices in the result are those of `problem`.
 *
 * @throws EvacuationInputError for an invalid problem; FlowAbortedError on shouldAbort.
 * @example
 *   // One road, 2 vehicles per step, 3 steps long, 13 vehicles (docs/model.md §6): clearance at step 9.
 *   solveEvacuation({ nodeCount: 2, timeStepSeconds: 60, horizonSteps: 12,
 *     roads: [{ from: 0, to: 1, capacityVehPerHour: 120, travelTimeSeconds: 180 }],
 *     zones: [{ id: 'z', entryNodes: [0], vehicles: 13 }],
 *     shelters: [{ id: 's', node: 1, capacityVehicles: null }] }).curve.clearanceStep; // 9
 */
export function solveEvacuation(problem: EvacuationProblem, options: SolveEvacuationOptions = {}): EvacuationResult {
  validateEvacuationProblem(problem);
  const run = startRun(problem, options);
  const steady = steadyStatePhase(run);
  const expanded = expansionPhase(run);
  const curve = curvePhase(run, expanded);
  // Read-out of the final plan, then the cut: taking the cut may turn the flow state back into
  // the flow of the horizon before clearance (see takeCutResidual), so the final flow is read first.
  const plan = planReadOut(run, expanded, curve);
  const planWarning = plannedRoutesWarning(plan.trips.plannedRoutes!, expanded.routeTiming, problem);
  if (planWarning) run.warnings.push(planWarning);
  const bottlenecks = cutPhase(run, expanded, curve);
  const fixes = fixesPhase(run, steady);
  const result = assembleResult(run, { steady, expanded, curve, plan, bottlenecks, fixes });
  if (options.verify) result.verification = { ok: run.problems.length === 0, problems: run.problems };
  return result;
}

/** What every phase of one solve shares: the problem, the options, progress, timings and findings. */
interface SolveRun {
  readonly problem: EvacuationProblem;
  readonly options: SolveEvacuationOptions;
  readonly choice: MaxFlowAlgorithmChoice;
  readonly demand: number;
  readonly progress: (phase: EvacuationPhase, fraction: number) => void;
  /** Adds the time since the last lap to `phase` (when options.now was given). */
  readonly lap: (phase: EvacuationPhase) => void;
  readonly timings: Partial<Record<EvacuationPhase, number>>;
  readonly warnings: EvacuationWarning[];
  /** verify()'s findings, when options.verify is set. */
  readonly problems: string[];
}

function startRun(problem: EvacuationProblem, options: SolveEvacuationOptions): SolveRun {
  const timings: Partial<Record<EvacuationPhase, number>> = {};
  let clock = options.now?.();
  const lap = (phase: EvacuationPhase): void => {
    if (!options.now || clock === undefined) return;
    const t = options.now();
    timings[phase] = (timings[phase] ?? 0) + t - clock;
    clock = t;
  };
  return {
    problem,
    options,
    choice: options.algorithm ?? 'auto',
    demand: problem.zones.reduce((sum, zone) => sum + zone.vehicles, 0),
    progress: options.onProgress ?? (() => {}),
    lap,
    timings,
    warnings: collectWarnings(problem),
    problems: [],
  };
}

type SteadyPhase = { steady: SteadyStateNetwork; summary: SteadyStateSummary; result: MaxFlowResult };

/** The static maximum flow at one instant and its cut. */
function steadyStatePhase(run: SolveRun): SteadyPhase {
  const { problem, options, choice } = run;
  run.progress('steady-state', 0);
  const steady = buildSteadyStateNetwork(problem, options.steadyStateAtSeconds ?? 0);
  // Under 'auto' the front door decides by the network's shape (network-shape.ts) and may hand over.
  const { summary, result } = solveSteadyState(problem, steady, { algorithm: choice, shouldAbort: options.shouldAbort });
  if (summary.unbounded) {
    run.warnings.push({
      code: 'steady-state-unbounded',
      message: 'a zone reaches a shelter through roads without a capacity limit; the steady state has no finite bottleneck',
    });
  }
  if (options.verify) collect(run.problems, 'steady state', verify(steady.network, result).problems);
  run.lap('steady-state');
  run.progress('steady-state', 1);
  return { steady, summary, result };
}

/** The time-expanded network, and the warning when its route times drift past one step. */
function expansionPhase(run: SolveRun): TimeExpandedNetwork {
  run.progress('expand', 0);
  const expanded = new ImplicitExpandedNetwork(run.problem, { roadTravelSteps: run.options.roadTravelSteps });
  const routeWarning = routeTimingWarning(expanded.routeTiming, run.problem);
  if (routeWarning) run.warnings.push(routeWarning);
  run.lap('expand');
  run.progress('expand', 1);
  return expanded;
}

/**
 * The curve's outcome: `residual` holds the final horizon's maximum flow in the implicit layout;
 * `takeCut()` the cut horizon's (after which `residual` may hold that one instead).
 */
type CurvePhase = { curve: CurveComputation; residual: Int32Array; takeCut: () => Int32Array; algorithm: MaxFlowAlgorithm };

/**
 * The evacuation curve: the maximum flow at every horizon. Incremental BFS (the default) runs on
 * the implicit network itself; the other algorithms run on the explicit layout (time-expanded.ts),
 * whose residual is then carried over into the implicit layout for the read-outs.
 */
function curvePhase(run: SolveRun, expanded: TimeExpandedNetwork): CurvePhase {
  const { options, choice } = run;
  const T = run.problem.horizonSteps;
  const algorithm: MaxFlowAlgorithm = choice === 'auto' ? 'incremental-bfs' : choice;
  run.progress('curve', 0);
  const cutHorizon = options.bottleneckStep === undefined ? undefined : Math.max(0, Math.min(T, options.bottleneckStep));
  const onHorizon = (t: number): void => run.progress('curve', T === 0 ? 1 : t / T);
  let phase: CurvePhase;
  if (algorithm === 'incremental-bfs') {
    const residual = expanded.createResidual();
    const curve = computeImplicitCurve(expanded, run.demand, residual, { cutHorizon, onHorizon, shouldAbort: options.shouldAbort });
    phase = { curve, residual, takeCut: curve.takeCutResidual, algorithm };
  } else {
    const explicit = expandOverTime(run.problem, { roadTravelSteps: options.roadTravelSteps });
    const state = createFlowState(explicit.network);
    const curve = computeEvacuationCurve(explicit, run.demand, state, { algorithm, cutHorizon, onHorizon, shouldAbort: options.shouldAbort });
    const residual = expanded.residualFromExplicit(explicit, state.residual);
    phase = { curve, residual, takeCut: () => expanded.residualFromExplicit(explicit, curve.takeCutResidual()), algorithm };
  }
  run.lap('curve');
  run.progress('curve', 1);
  return phase;
}

type PlanReadOut = { usage: RoadUsage; trips: TripSummary; byStep: number[]; delivered: number };

/** Road use, trips and arrivals of the final plan, checked by verify() on request. */
function planReadOut(run: SolveRun, expanded: TimeExpandedNetwork, { curve, residual }: CurvePhase): PlanReadOut {
  const { problem } = run;
  run.progress('bottlenecks', 0);
  const usage = implicitRoadUsage(expanded, residual, problem.roads.length);
  const trips = implicitDecomposeTrips(expanded, residual, problem.zones.length, problem.shelters.length, {
    from: problem.roads.map((road) => road.from),
    to: problem.roads.map((road) => road.to),
    travelTimeSeconds: problem.roads.map((road) => road.travelTimeSeconds),
  });
  const byStep = implicitArrivalsByStep(expanded, residual);
  const delivered = curve.deliveredByStep[curve.finalHorizon]!;
  run.lap('bottlenecks');
  if (run.options.verify) {
    verifyExpandedFlow(run, expanded, residual, curve.finalHorizon, delivered, 'time-expanded flow');
    if (trips.zoneDelivered.reduce((a, b) => a + b, 0) !== delivered) run.problems.push('trips do not add up to the delivered total');
    run.lap('verify');
  }
  return { usage, trips, byStep, delivered };
}

/** The minimum cut at the cut horizon: what holds the arrivals down. */
function cutPhase(run: SolveRun, expanded: TimeExpandedNetwork, { curve, takeCut }: CurvePhase): TimeExpandedBottlenecks {
  const cutResidual = takeCut();
  const bottlenecks = implicitBottlenecks(expanded, cutResidual, curve.cutHorizon);
  run.lap('bottlenecks');
  if (run.options.verify) {
    const value = curve.deliveredByStep[curve.cutHorizon]!;
    verifyExpandedFlow(run, expanded, cutResidual, curve.cutHorizon, value, `time-expanded flow at step ${curve.cutHorizon}`);
    run.lap('verify');
  }
  run.progress('bottlenecks', 1);
  return bottlenecks;
}

/** verify() on the flow held in `residual` at a horizon, its value and its cut. */
function verifyExpandedFlow(run: SolveRun, expanded: TimeExpandedNetwork, residual: Int32Array, horizon: number, value: number, what: string): void {
  collect(run.problems, what, verifyImplicit(expanded, residual, horizon, value).problems);
}

type FixesPhase = { fixes: RoadFix[]; truncated: boolean };

/** Road what-ifs ranked by the steady-state gain (none when the steady state is unbounded). */
function fixesPhase(run: SolveRun, { steady, summary, result }: SteadyPhase): FixesPhase {
  const { problem, options, choice } = run;
  run.progress('fixes', 0);
  const algorithm: MaxFlowAlgorithm = choice === 'auto' ? 'incremental-bfs' : choice;
  const ranked = summary.unbounded
    ? { fixes: [], truncated: false }
    : rankFixes(problem, steady, result, {
        algorithm,
        maxEvaluations: options.maxFixEvaluations ?? DEFAULT_MAX_FIX_EVALUATIONS,
        onEvaluated: (done, total) => run.progress('fixes', done / total),
        shouldAbort: options.shouldAbort,
      });
  run.lap('fixes');
  run.progress('fixes', 1);
  if (options.verify) {
    // The checks ran beside the read-out (timed as 'verify'); the phase is still announced.
    run.progress('verify', 0);
    run.progress('verify', 1);
  }
  return ranked;
}

type Phases = {
  steady: SteadyPhase;
  expanded: TimeExpandedNetwork;
  curve: CurvePhase;
  plan: PlanReadOut;
  bottlenecks: TimeExpandedBottlenecks;
  fixes: FixesPhase;
};

/** The plain-JSON result from what the phases found. */
function assembleResult(run: SolveRun, { steady, expanded, curve: { curve, algorithm }, plan, bottlenecks, fixes }: Phases): EvacuationResult {
  const { problem, options } = run;
  const { summary } = steady;
  return {
    timeStepSeconds: problem.timeStepSeconds,
    horizonSteps: problem.horizonSteps,
    demandVehicles: run.demand,
    steadyState: summary,
    curve: { deliveredVehiclesByStep: curve.deliveredByStep, clearanceStep: curve.clearanceStep, marks: curve.marks },
    plan: planOf(problem, expanded, curve, plan, summary),
    bottlenecks,
    routeTiming: expanded.routeTiming,
    plannedRoutes: plan.trips.plannedRoutes!,
    fixes: fixes.fixes,
    fixesTruncated: fixes.truncated,
    warnings: run.warnings,
    stats: {
      algorithm: { steadyState: steady.result.algorithm, curve: algorithm },
      steadyStateNetwork: { nodes: steady.steady.network.nodeCount, arcs: steady.steady.network.arcCount },
      timeExpandedNetwork: { nodes: expanded.nodeCount, arcs: expanded.arcCount },
      augmentations: steady.result.stats.augmentations + curve.stats.augmentations,
      ...(options.now ? { timingsMs: run.timings } : {}),
    },
  };
}

/** The plan part of the result: per zone, shelter and road. */
function planOf(
  problem: EvacuationProblem,
  expanded: TimeExpandedNetwork,
  curve: CurveComputation,
  { usage, trips, byStep, delivered }: PlanReadOut,
  summary: SteadyStateSummary,
): EvacuationResult['plan'] {
  const released = expanded.releases.map((counts) => counts.reduce((a, b) => a + b, 0));
  const orNull = (step: number): number | null => (step < 0 ? null : step);
  return {
    horizonStep: curve.finalHorizon,
    deliveredVehicles: delivered,
    deliveredVehiclesByStep: byStep,
    earliestArrival: byStep.every((d, t) => d === curve.deliveredByStep[t]),
    zones: problem.zones.map((zone, z) => ({
      id: zone.id,
      vehicles: zone.vehicles,
      releasedVehicles: released[z]!,
      deliveredVehicles: trips.zoneDelivered[z]!,
      lastArrivalStep: orNull(trips.zoneLastArrivalStep[z]!),
      steadyStateVehPerHour: summary.zones[z]!.vehPerHour,
    })),
    shelters: problem.shelters.map((shelter, s) => ({
      id: shelter.id,
      capacityVehicles: shelter.capacityVehicles,
      arrivedVehicles: trips.shelterArrived[s]!,
      lastArrivalStep: orNull(trips.shelterLastArrivalStep[s]!),
      steadyStateVehPerHour: summary.shelters[s]!.vehPerHour,
    })),
    assignments: trips.assignments,
    roads: {
      ...usage,
      stepCapacity: Array.from(expanded.roadStepCapacity),
      travelSteps: Array.from(expanded.roadTravelSteps),
    },
  };
}

function collect(into: string[], what: string, problems: readonly string[]): void {
  for (const p of problems) into.push(`${what}: ${p}`);
}

function collectWarnings(problem: EvacuationProblem): EvacuationWarning[] {
  const warnings: EvacuationWarning[] = [];
  const dt = problem.timeStepSeconds;
  problem.roads.forEach((road, e) => {
    if (road.capacityVehPerHour > 0 && perStepCapacity(road.capacityVehPerHour, dt) === 0) {
      warnings.push({
        code: 'capacity-rounds-to-zero',
        road: e,
        message: `road ${e}: ${road.capacityVehPerHour} veh/h is less than one vehicle per ${dt} s step; it carries nothing over time`,
      });
    }
    if (road.travelTimeSeconds > problem.horizonSteps * dt) {
      warnings.push({ code: 'road-longer-than-horizon', road: e, message: `road ${e}: its travel time exceeds the horizon` });
    }
  });
  problem.zones.forEach((zone) => {
    const schedule = zone.releaseVehiclesByStep;
    const shares = zone.releaseFractionByStep;
    const released = schedule
      ? schedule.slice(0, problem.horizonSteps + 1).reduce((a, b) => a + b, 0)
      : shares && shares.length > 0
        ? Math.round(zone.vehicles * Math.min(1, shares[Math.min(problem.horizonSteps, shares.length - 1)]!))
        : zone.vehicles;
    if (released < zone.vehicles) {
      warnings.push({
        code: 'release-incomplete',
        zone: zone.id,
        message: `zone ${zone.id}: only ${released} of ${zone.vehicles} vehicles depart within the horizon`,
      });
    }
    if (zone.releaseVehPerHour !== undefined && zone.vehicles > 0 && perStepCapacity(zone.releaseVehPerHour, dt) === 0) {
      warnings.push({
        code: 'release-rate-rounds-to-zero',
        zone: zone.id,
        message: `zone ${zone.id}: a release rate of ${zone.releaseVehPerHour} veh/h is less than one vehicle per step`,
      });
    }
  });
  return warnings;
}

/**
 * A warning when most of the plan's vehicles (the vehicle-weighted median of its routes) drive a
 * route modelled more than one step off its own free-flow time, while every fastest trip is within
 * one step (else routeTimingWarning has warned already). No route is modelled more than a step
 * faster than at free flow (docs/model.md §1), so such routes come out late.
 */
function plannedRoutesWarning(planned: PlannedRouteTiming, timing: RouteTimingError, problem: EvacuationProblem): EvacuationWarning | null {
  const dt = problem.timeStepSeconds;
  if (planned.vehicles === 0 || planned.typicalSeconds <= dt + 1e-9) return null;
  if (timing.worst !== null && timing.largestSeconds > dt + 1e-9) return null;
  const minutes = (seconds: number): string => `${(seconds / 60).toFixed(1)} min`;
  const step = suggestedTimeStepSeconds({ largestSeconds: planned.typicalSeconds }, dt);
  const advice = step !== null
    ? `a time step of ${step} s should bring the typical route within ${dt} s`
    : 'a shorter time step brings it down about in proportion';
  return {
    code: 'route-time-error',
    message:
      `the routes the plan's ${planned.vehicles} vehicles drive are modelled typically ${minutes(planned.typicalSeconds)} and up to ${minutes(planned.largestSeconds)} ` +
      `slower than at free flow (${Math.round(100 * planned.withinOneStepShare)} % within one step), because their roads run against the direction the steps were rounded for ` +
      `and each is rounded up to a whole ${dt} s step; ${advice}`,
  };
}

/**
 * A warning when some zone's fastest modelled trip to a shelter differs from free flow by more
 * than one step, with the step that should bring it within one present step
 * (`suggestedTimeStepSeconds`).
 */
function routeTimingWarning(timing: RouteTimingError, problem: EvacuationProblem): EvacuationWarning | null {
  const dt = problem.timeStepSeconds;
  if (timing.worst === null || timing.largestSeconds <= dt + 1e-9) return null;
  const minutes = (seconds: number): string => `${(seconds / 60).toFixed(1)} min`;
  const { zone, shelter, freeFlowSeconds, modelledSeconds } = timing.worst;
  const step = suggestedTimeStepSeconds(timing, dt);
  const advice = step !== null
    ? `a time step of ${step} s should bring it within ${dt} s`
    : 'a shorter time step brings it down about in proportion';
  return {
    code: 'route-time-error',
    zone: problem.zones[zone]!.id,
    message:
      `modelled trip times differ from free flow by up to ${minutes(timing.largestSeconds)} (typically ${minutes(timing.typicalSeconds)}): ` +
      `the fastest trip from zone ${problem.zones[zone]!.id} to shelter ${problem.shelters[shelter]!.id} takes ${minutes(freeFlowSeconds)} at free flow ` +
      `and ${minutes(modelledSeconds)} in the model, because roads off the fastest trips to the nearest shelter or out of the nearest zone are rounded up to whole ${dt} s steps; ${advice}`,
  };
}

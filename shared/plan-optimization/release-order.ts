// The best release order: with everyone free to leave at the order, the earliest time by which
// all can have arrived (the quickest transshipment in the discrete model: the smallest horizon
// whose maximum flow reaches the demand; the evacuation curve finds it exactly, horizon by
// horizon) and a departure schedule per zone that achieves it, read off that optimal flow's
// departures from each zone.
//
// Waiting at home rather than on the road: where a path of the optimal flow enters the roads and
// then waits at its entry node before moving, that wait is moved back into the zone (the vehicles
// leave later). This removes queueing at the entry node and changes nothing else; it is applied
// to zones without a release-rate gate and kept only when the schedule, evaluated exactly on its
// own, still clears by the same step.

import type { EvacuationProblem } from '../flow';
import { cloneProblem, deliveredByHorizon, planOverTime, type OptimisationHooks } from './problem-tools';

export interface ZoneSchedule {
  id: string;
  vehicles: number;
  /** Vehicles leaving in each step θ = 0..(the last step with a departure). */
  departuresByStep: number[];
  firstDepartureStep: number | null;
  lastDepartureStep: number | null;
}

export interface ReleaseOrder {
  timeStepSeconds: number;
  horizonSteps: number;
  /** Everyone free to leave at the order: the quickest clearance (null = not within the horizon). */
  quickestClearanceStep: number | null;
  quickestDeliveredAtHorizon: number;
  /** With the plan's expected departure curves. */
  expectedClearanceStep: number | null;
  expectedDeliveredAtHorizon: number;
  expectedDeliveredByStep: number[];
  quickestDeliveredByStep: number[];
  zones: ZoneSchedule[];
  /**
   * The schedule itself, evaluated exactly as the zones' departures (one maximum flow at the
   * quickest clearance step): it clears by this step; null when the quickest does not clear
   * within the horizon, or (never expected) when the schedule falls short.
   */
  scheduleClearanceStep: number | null;
  /** True when waits at the entry node were moved back into the zones. */
  waitsMovedHome: boolean;
}

/** The problem with every zone's vehicles free to leave at step 0 (release rates kept). */
export function everyoneFreeAtOrder(problem: EvacuationProblem): EvacuationProblem {
  const free = cloneProblem(problem);
  for (const zone of free.zones) {
    delete zone.releaseFractionByStep;
    zone.releaseVehiclesByStep = [zone.vehicles];
  }
  return free;
}

function withSchedule(problem: EvacuationProblem, schedules: number[][]): EvacuationProblem {
  const copy = cloneProblem(problem);
  copy.zones.forEach((zone, z) => {
    delete zone.releaseFractionByStep;
    zone.releaseVehiclesByStep = schedules[z]!;
  });
  return copy;
}

export function bestReleaseOrder(problem: EvacuationProblem, hooks: OptimisationHooks = {}): ReleaseOrder {
  const layout = hooks.layout ?? 'explicit';
  // Only the figures of the expected curve are kept, so its network is released before the next.
  const { clearanceStep: expectedClearanceStep, deliveredAtHorizon: expectedDeliveredAtHorizon, deliveredByStep: expectedDeliveredByStep } = planOverTime(
    problem,
    layout,
    hooks.shouldAbort,
  );
  hooks.onProgress?.(0.3);
  const free = everyoneFreeAtOrder(problem);
  // The quickest horizon is the smallest whose maximum reaches the demand: the curve's clearance.
  let quickest: ReturnType<typeof planOverTime> | null = planOverTime(free, layout, hooks.shouldAbort);
  hooks.onProgress?.(0.6);

  const Z = problem.zones.length;
  const asFound: number[][] = Array.from({ length: Z }, () => []);
  const movedHome: number[][] = Array.from({ length: Z }, () => []);
  const add = (list: number[], step: number, n: number): void => {
    while (list.length <= step) list.push(0);
    list[step]! += n;
  };
  quickest.forEachPath((path) => {
    add(asFound[path.zone]!, path.entryStep, path.vehicles);
    const gated = problem.zones[path.zone]!.releaseVehPerHour !== undefined;
    add(movedHome[path.zone]!, path.entryStep + (gated ? 0 : path.waitsAtEntry), path.vehicles);
  });

  // A schedule is as good as the quickest when its own maximum flow at the quickest horizon (the
  // clearance step, or T when everyone cannot arrive) delivers as many: no schedule clears
  // earlier than everyone free at the order, so that one maximum flow settles it instead of a
  // curve over every horizon.
  const target = quickest.clearanceStep;
  const horizon = target ?? problem.horizonSteps;
  const { deliveredAtHorizon: quickestDeliveredAtHorizon, deliveredByStep: quickestDeliveredByStep } = quickest;
  quickest = null; // its network is not needed for the checks below
  const asGood = (schedules: number[][]) =>
    deliveredByHorizon(withSchedule(problem, schedules), horizon, hooks.shouldAbort, layout) >= quickestDeliveredAtHorizon;
  let chosen = movedHome;
  let waitsMovedHome = true;
  let achieved = asGood(movedHome);
  hooks.onProgress?.(0.8);
  if (!achieved) {
    chosen = asFound;
    waitsMovedHome = false;
    // The optimal flow's own departures: it is a feasible flow under them, so this holds by
    // construction; evaluated all the same.
    achieved = asGood(asFound);
  }
  hooks.onProgress?.(1);
  return {
    timeStepSeconds: problem.timeStepSeconds,
    horizonSteps: problem.horizonSteps,
    quickestClearanceStep: target,
    quickestDeliveredAtHorizon,
    expectedClearanceStep,
    expectedDeliveredAtHorizon,
    expectedDeliveredByStep,
    quickestDeliveredByStep,
    zones: problem.zones.map((zone, z) => {
      const list = chosen[z]!;
      const first = list.findIndex((n) => n > 0);
      let last = -1;
      list.forEach((n, i) => {
        if (n > 0) last = i;
      });
      return {
        id: zone.id,
        vehicles: zone.vehicles,
        departuresByStep: list,
        firstDepartureStep: first < 0 ? null : first,
        lastDepartureStep: last < 0 ? null : last,
      };
    }),
    scheduleClearanceStep: achieved ? target : null,
    waitsMovedHome,
  };
}

// The engine's answer → the stored RunResult: engine road indices become segment ids and
// directions, steps become minutes, vehicles become persons with each zone's own persons per
// vehicle (a shelter's persons follow the zones its vehicles came from).
import type { ChokePoint, Fix, RoadRef, RunResult } from '../../shared/api/runs';
import { suggestedTimeStepSeconds, type EvacuationResult } from '../../shared/flow';
import { ENGINE_VERSION } from './engine-version';
import type { RunInput } from '../../shared/model/run-input';

export type SolvedRun = { result: EvacuationResult; solveMs: number; peakMemoryBytes: number };

/** Each engine road's capacity in the steady state: the roads as they are at the start, so a
 *  road closed then carries nothing. */
export function steadyCapacities(input: RunInput): number[] {
  const closedAtStart = (road: RunInput['problem']['roads'][number]) =>
    (road.closures ?? []).some((c) => c.fromSeconds <= 0 && (c.untilSeconds === null || c.untilSeconds > 0));
  return input.problem.roads.map((road) => (closedAtStart(road) ? 0 : road.capacityVehPerHour));
}

type Solved = EvacuationResult;
type Units = { minutesPerStep: number; minutes: (step: number | null) => number | null };

function unitsOf(r: Solved): Units {
  const minutesPerStep = r.timeStepSeconds / 60;
  return { minutesPerStep, minutes: (step) => (step === null ? null : step * minutesPerStep) };
}

/** An engine road as the screens name it: its segment, direction, name and class. */
function roadRefOf(input: RunInput) {
  return (road: number): RoadRef => {
    const origin = input.roadOrigins[road]!;
    const segment = input.segments[origin.segment]!;
    return { segmentId: segment.id, direction: origin.direction, name: segment.name, roadClass: segment.roadClass };
  };
}

/** Each zone's persons per vehicle (0 for a zone that sends none). */
const personsPerVehicleOf = (input: RunInput) => input.zones.map((z) => (z.vehicles > 0 ? z.persons / z.vehicles : 0));

/** The choke points: the time-expanded cut first (largest share first, as the engine ranks them),
 *  then the static-cut roads the time-expanded cut does not hold (a road closed at the start is
 *  none: it carries nothing). */
function chokePointsOf(input: RunInput, r: Solved, { minutesPerStep }: Units): ChokePoint[] {
  const roads = input.problem.roads;
  const roadRef = roadRefOf(input);
  const steadyCapacity = steadyCapacities(input);
  const staticCut = new Set(r.steadyState.cutRoads);
  const laneGain = new Map<number, number>();
  for (const f of r.fixes) if (f.kind === 'add-lane') laneGain.set(f.road, f.gainVehPerHour);

  const listed = new Set<number>();
  const chokePoints: ChokePoint[] = r.bottlenecks.roads.map((b) => {
    listed.add(b.road);
    return {
      ...roadRef(b.road),
      capacityVehiclesPerHour: roads[b.road]!.capacityVehPerHour,
      shareOfCut: b.share,
      cutWindows: b.stepRanges.map(([first, last]) => [first * minutesPerStep, (last + 1) * minutesPerStep] as [number, number]),
      inStaticCut: staticCut.has(b.road) && steadyCapacity[b.road]! > 0,
      gainPerExtraLaneVehiclesPerHour: laneGain.get(b.road) ?? 0,
    };
  });
  for (const road of r.steadyState.cutRoads) {
    if (listed.has(road) || steadyCapacity[road] === 0) continue;
    chokePoints.push({
      ...roadRef(road),
      capacityVehiclesPerHour: roads[road]!.capacityVehPerHour,
      shareOfCut: 0,
      cutWindows: [],
      inStaticCut: true,
      gainPerExtraLaneVehiclesPerHour: laneGain.get(road) ?? 0,
    });
  }
  return chokePoints;
}

/** The fixes that gain anything, named by road. */
function fixesOf(input: RunInput, r: Solved): Fix[] {
  const roadRef = roadRefOf(input);
  return r.fixes.filter((f) => f.gainVehPerHour > 0).map((f) => ({ ...roadRef(f.road), kind: f.kind, gainVehiclesPerHour: f.gainVehPerHour }));
}

/** Each zone: demand, what arrived, its steady-state rate and its clearance time (null: not cleared). */
function zoneResultsOf(input: RunInput, r: Solved, { minutes }: Units): RunResult['zones'] {
  return input.zones.map((z, i) => {
    const outcome = r.plan.zones[i]!;
    const cleared = outcome.deliveredVehicles >= z.vehicles;
    return {
      zoneId: z.id,
      name: z.name,
      demandVehicles: z.vehicles,
      demandPersons: z.persons,
      deliveredVehicles: outcome.deliveredVehicles,
      steadyStateVehiclesPerHour: r.steadyState.zones[i]?.vehPerHour ?? 0,
      clearanceMinutes: cleared ? minutes(outcome.lastArrivalStep ?? 0) : null,
    };
  });
}

/** Each shelter: what arrived, in vehicles and in persons of the zones those vehicles came from. */
function shelterResultsOf(input: RunInput, r: Solved): RunResult['shelters'] {
  const personsPerVehicle = personsPerVehicleOf(input);
  const shelterPersons = input.shelters.map(() => 0);
  for (const a of r.plan.assignments) shelterPersons[a.shelter] = (shelterPersons[a.shelter] ?? 0) + a.vehicles * (personsPerVehicle[a.zone] ?? 0);
  return input.shelters.map((s, i) => ({
    shelterId: s.id,
    name: s.name,
    capacityPersons: s.capacityPersons,
    arrivedVehicles: r.plan.shelters[i]!.arrivedVehicles,
    arrivedPersons: Math.round(shelterPersons[i]!),
    steadyStateVehiclesPerHour: r.steadyState.shelters[i]?.vehPerHour ?? 0,
  }));
}

/** The time-expanded cut split by what it is made of, with zones and shelters by id. */
function arrivalLimitsOf(input: RunInput, r: Solved, { minutesPerStep }: Units): NonNullable<RunResult['arrivalLimits']> {
  const cut = r.bottlenecks;
  return {
    byMinutes: cut.horizonStep * minutesPerStep,
    vehicles: cut.cutCapacityVehicles,
    parts: cut.composition,
    zoneIds: cut.zones.map((z) => input.zones[z]!.id),
    shelterIds: cut.shelters.map((s) => input.shelters[s]!.id),
  };
}

/** How far the model's trip times lie from free flow, with the worst pair named. */
function routeTimingOf(input: RunInput, r: Solved): NonNullable<RunResult['routeTiming']> {
  const timing = r.routeTiming;
  const worst = timing.worst;
  return {
    timeStepSeconds: r.timeStepSeconds,
    pairs: timing.pairs,
    largestSeconds: timing.largestSeconds,
    typicalSeconds: timing.typicalSeconds,
    worst:
      worst === null
        ? null
        : {
            zoneId: input.zones[worst.zone]!.id,
            zoneName: input.zones[worst.zone]!.name,
            shelterId: input.shelters[worst.shelter]!.id,
            shelterName: input.shelters[worst.shelter]!.name,
            freeFlowSeconds: worst.freeFlowSeconds,
            modelledSeconds: worst.modelledSeconds,
          },
    // Past one step on the fastest trips or on most of the plan's routes (shared/format/trip-times.ts).
    suggestedStepSeconds: suggestedTimeStepSeconds({ largestSeconds: Math.max(timing.largestSeconds, r.plannedRoutes.typicalSeconds) }, r.timeStepSeconds),
    plannedRoutes: r.plannedRoutes,
  };
}

/** The headline figures: steady-state rates, demand, what arrived by the horizon, the curve's marks. */
function headlineOf(input: RunInput, r: Solved, { minutesPerStep, minutes }: Units): RunResult['headline'] {
  const personsPerVehicle = personsPerVehicleOf(input);
  const T = r.horizonSteps;
  return {
    steadyStateVehiclesPerHour: r.steadyState.throughputVehPerHour,
    steadyStatePersonsPerHour: Math.round(r.steadyState.zones.reduce((sum, z, i) => sum + z.vehPerHour * (personsPerVehicle[i] ?? 0), 0)),
    demandVehicles: r.demandVehicles,
    demandPersons: input.zones.reduce((sum, z) => sum + z.persons, 0),
    deliveredVehicles: r.curve.deliveredVehiclesByStep[T] ?? 0,
    deliveredPersons: Math.round(r.plan.zones.reduce((sum, z, i) => sum + z.deliveredVehicles * (personsPerVehicle[i] ?? 0), 0)),
    horizonMinutes: T * minutesPerStep,
    clearanceMinutes: minutes(r.curve.clearanceStep),
    p50Minutes: minutes(r.curve.marks.p50),
    p90Minutes: minutes(r.curve.marks.p90),
    p95Minutes: minutes(r.curve.marks.p95),
  };
}

/** How the run was solved: engine version, algorithms, network sizes, time and memory. */
function statsOf(done: SolvedRun): RunResult['stats'] {
  const r = done.result;
  return {
    engineVersion: ENGINE_VERSION,
    algorithm: r.stats.algorithm.steadyState === r.stats.algorithm.curve ? r.stats.algorithm.curve : `${r.stats.algorithm.steadyState} (steady state), ${r.stats.algorithm.curve} (curve)`,
    nodes: r.stats.steadyStateNetwork.nodes,
    arcs: r.stats.steadyStateNetwork.arcs,
    expandedNodes: r.stats.timeExpandedNetwork.nodes,
    expandedArcs: r.stats.timeExpandedNetwork.arcs,
    augmentations: r.stats.augmentations,
    solveMs: done.solveMs,
    peakMemoryBytes: done.peakMemoryBytes,
    verified: r.verification?.ok ?? false,
  };
}

/** The stored result without per-road figures (those are toRoadResults', in their own table). */
export function toRunResult(input: RunInput, done: SolvedRun): RunResult {
  const r = done.result;
  const units = unitsOf(r);
  return {
    headline: headlineOf(input, r, units),
    curve: { stepMinutes: units.minutesPerStep, deliveredVehicles: r.curve.deliveredVehiclesByStep },
    zones: zoneResultsOf(input, r, units),
    shelters: shelterResultsOf(input, r),
    bottlenecks: chokePointsOf(input, r, units),
    arrivalLimits: arrivalLimitsOf(input, r, units),
    routeTiming: routeTimingOf(input, r),
    fixes: fixesOf(input, r),
    stats: statsOf(done),
  };
}

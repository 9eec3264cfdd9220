// The engine's answer → the stored RunResult: engine road indices become segment ids and
// directions, steps become minutes, vehicles become persons with each zone's own persons per
// vehicle (a shelter's persons follow the zones its vehicles came from).
import type { Bottleneck, Fix, RoadRef, RunResult } from '../../shared/api/runs';
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

/** The stored result without per-road figures (those are toRoadResults', in their own table). */
export function toRunResult(input: RunInput, done: SolvedRun): RunResult {
  const r = done.result;
  const minutesPerStep = r.timeStepSeconds / 60;
  const minutes = (step: number | null) => (step === null ? null : step * minutesPerStep);
  const roads = input.problem.roads;

  const roadRef = (road: number): RoadRef => {
    const origin = input.roadOrigins[road]!;
    const segment = input.segments[origin.segment]!;
    return { segmentId: segment.id, direction: origin.direction, name: segment.name, roadClass: segment.roadClass };
  };

  const steadyCapacity = steadyCapacities(input);

  const personsPerVehicle = input.zones.map((z) => (z.vehicles > 0 ? z.persons / z.vehicles : 0));
  const staticCut = new Set(r.steadyState.cutRoads);
  const laneGain = new Map<number, number>();
  for (const f of r.fixes) if (f.kind === 'add-lane') laneGain.set(f.road, f.gainVehPerHour);

  // Time-expanded cut first (largest share first, as the engine ranks them), then static-cut
  // roads the time-expanded cut does not hold.
  const listed = new Set<number>();
  const bottlenecks: Bottleneck[] = r.bottlenecks.roads.map((b) => {
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
    bottlenecks.push({
      ...roadRef(road),
      capacityVehiclesPerHour: roads[road]!.capacityVehPerHour,
      shareOfCut: 0,
      cutWindows: [],
      inStaticCut: true,
      gainPerExtraLaneVehiclesPerHour: laneGain.get(road) ?? 0,
    });
  }

  const fixes: Fix[] = r.fixes.filter((f) => f.gainVehPerHour > 0).map((f) => ({ ...roadRef(f.road), kind: f.kind, gainVehiclesPerHour: f.gainVehPerHour }));

  const shelterPersons = input.shelters.map(() => 0);
  for (const a of r.plan.assignments) shelterPersons[a.shelter] = (shelterPersons[a.shelter] ?? 0) + a.vehicles * (personsPerVehicle[a.zone] ?? 0);

  const zones = input.zones.map((z, i) => {
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
  const shelters = input.shelters.map((s, i) => ({
    shelterId: s.id,
    name: s.name,
    capacityPersons: s.capacityPersons,
    arrivedVehicles: r.plan.shelters[i]!.arrivedVehicles,
    arrivedPersons: Math.round(shelterPersons[i]!),
    steadyStateVehiclesPerHour: r.steadyState.shelters[i]?.vehPerHour ?? 0,
  }));

  const cut = r.bottlenecks;
  const arrivalLimits = {
    byMinutes: cut.horizonStep * minutesPerStep,
    vehicles: cut.cutCapacityVehicles,
    parts: cut.composition,
    zoneIds: cut.zones.map((z) => input.zones[z]!.id),
    shelterIds: cut.shelters.map((s) => input.shelters[s]!.id),
  };

  const timing = r.routeTiming;
  const worst = timing.worst;
  const routeTiming = {
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
    suggestedStepSeconds: suggestedTimeStepSeconds(timing, r.timeStepSeconds),
  };

  const T = r.horizonSteps;
  const delivered = r.curve.deliveredVehiclesByStep;
  return {
    headline: {
      steadyStateVehiclesPerHour: r.steadyState.throughputVehPerHour,
      steadyStatePersonsPerHour: Math.round(r.steadyState.zones.reduce((sum, z, i) => sum + z.vehPerHour * (personsPerVehicle[i] ?? 0), 0)),
      demandVehicles: r.demandVehicles,
      demandPersons: input.zones.reduce((sum, z) => sum + z.persons, 0),
      deliveredVehicles: delivered[T] ?? 0,
      deliveredPersons: Math.round(r.plan.zones.reduce((sum, z, i) => sum + z.deliveredVehicles * (personsPerVehicle[i] ?? 0), 0)),
      horizonMinutes: T * minutesPerStep,
      clearanceMinutes: minutes(r.curve.clearanceStep),
      p50Minutes: minutes(r.curve.marks.p50),
      p90Minutes: minutes(r.curve.marks.p90),
      p95Minutes: minutes(r.curve.marks.p95),
    },
    curve: { stepMinutes: minutesPerStep, deliveredVehicles: delivered },
    zones,
    shelters,
    bottlenecks,
    arrivalLimits,
    routeTiming,
    fixes,
    stats: {
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
    },
  };
}

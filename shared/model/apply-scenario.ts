// A scenario's overlay applied to a plan's data, without touching the base data:
// closures and lane changes become segment overrides (before the problem is built); contraflow,
// capacity factors by class and staggered departures change the built engine problem (after),
// keeping road indices stable so runs under different scenarios map back the same way.
import type { RoadClass, SegmentOverride } from '../api/road-attributes';
import type { ScenarioOverlay } from '../api/scenarios';
import { ModelInputError, type BuiltEvacuationProblem } from './build-evacuation-problem';

export type SegmentLookup = {
  /** Segment id (database) → index in the model's segments. */
  indexOf: ReadonlyMap<number, number>;
  roadClassOf: (segmentIndex: number) => RoadClass;
};

function indexFor(lookup: SegmentLookup, segmentId: number, what: string): number {
  const index = lookup.indexOf.get(segmentId);
  if (index === undefined) throw new ModelInputError(`${what} names segment ${segmentId}, which is not on the plan's road layer`);
  return index;
}

/** Closures (from/until a time) and lane changes as the model's segment overrides. */
export function scenarioSegmentOverrides(overlay: ScenarioOverlay, lookup: SegmentLookup): SegmentOverride[] {
  const overrides: SegmentOverride[] = [];
  for (const c of overlay.closures) {
    overrides.push({
      segment: indexFor(lookup, c.segmentId, 'A closure'),
      closures: [{ fromSeconds: c.fromMinutes * 60, untilSeconds: c.untilMinutes === null ? null : c.untilMinutes * 60 }],
    });
  }
  for (const l of overlay.laneChanges) overrides.push({ segment: indexFor(lookup, l.segmentId, 'A lane change'), ...l.patch });
  return overrides;
}

/**
 * Contraflow: along each corridor segment the inbound road's lanes serve the outbound
 * direction — the outbound road gains the inbound capacity and lanes, the inbound road is
 * closed for the whole horizon. Then capacity factors by class, then departure delays.
 * Mutates `built.problem` (a fresh object from buildEvacuationProblem).
 */
export function applyScenarioToProblem(built: BuiltEvacuationProblem, overlay: ScenarioOverlay, lookup: SegmentLookup): void {
  const { problem, segmentRoads, roadOrigins } = built;
  for (const corridor of overlay.contraflow) {
    for (const segmentId of corridor.segmentIds) {
      const roads = segmentRoads[indexFor(lookup, segmentId, `Contraflow corridor "${corridor.name}"`)]!;
      const outbound = corridor.direction === 'forward' ? roads.forward : roads.backward;
      const inbound = corridor.direction === 'forward' ? roads.backward : roads.forward;
      if (outbound === null) throw new ModelInputError(`contraflow corridor "${corridor.name}": segment ${segmentId} is one-way against the chosen direction`);
      if (inbound === null) continue;
      const out = problem.roads[outbound]!;
      const inn = problem.roads[inbound]!;
      out.capacityVehPerHour += inn.capacityVehPerHour;
      out.lanes = (out.lanes ?? 1) + (inn.lanes ?? 1);
      if (out.storageVehicles !== undefined && inn.storageVehicles !== undefined) out.storageVehicles += inn.storageVehicles;
      inn.closures = [{ fromSeconds: 0, untilSeconds: null }];
    }
  }
  if (overlay.classFactors.length > 0) {
    const factor = new Map(overlay.classFactors.map((f) => [f.roadClass, f.factor]));
    problem.roads.forEach((road, i) => {
      const f = factor.get(lookup.roadClassOf(roadOrigins[i]!.segment));
      if (f === undefined) return;
      road.capacityVehPerHour *= f;
      if (road.capacityVehPerHourPerLane !== undefined) road.capacityVehPerHourPerLane *= f;
    });
  }
  for (const d of overlay.departureDelays) {
    const zone = problem.zones.find((z) => z.id === String(d.zoneId));
    if (!zone) throw new ModelInputError(`a departure delay names zone ${d.zoneId}, which is not in the plan`);
    const steps = Math.round((d.delayMinutes * 60) / problem.timeStepSeconds);
    const shares = zone.releaseFractionByStep ?? [1];
    zone.releaseFractionByStep = [...new Array<number>(steps).fill(0), ...shares].slice(0, problem.horizonSteps + 1);
  }
  for (const schedule of overlay.departureSchedules ?? []) {
    const zone = problem.zones.find((z) => z.id === String(schedule.zoneId));
    if (!zone) throw new ModelInputError(`a departure schedule names zone ${schedule.zoneId}, which is not in the plan`);
    delete zone.releaseVehiclesByStep;
    zone.releaseFractionByStep = scheduleShares(schedule.departuresByStep, schedule.stepMinutes * 60, problem.timeStepSeconds, problem.horizonSteps);
  }
}

/**
 * Cumulative share departed by the end of each step θ = 0..horizon of a schedule given per
 * interval of `scheduleStepSeconds`: a departure counted in interval i leaves in the run's step
 * that contains the start of that interval, so equal steps reproduce the schedule exactly.
 */
export function scheduleShares(departuresByStep: readonly number[], scheduleStepSeconds: number, timeStepSeconds: number, horizon: number): number[] {
  const total = departuresByStep.reduce((sum, n) => sum + n, 0);
  const byStep = new Array<number>(horizon + 1).fill(0);
  departuresByStep.forEach((n, i) => {
    const step = Math.min(horizon, Math.floor((i * scheduleStepSeconds) / timeStepSeconds + 1e-9));
    byStep[step]! += n;
  });
  const shares: number[] = [];
  let cumulative = 0;
  for (const n of byStep) {
    cumulative += n;
    shares.push(total > 0 ? cumulative / total : 1);
  }
  return shares;
}

// TEST DATA — a finished run of the demo plan (Veltmoor) inserted straight into `runs`, for the
// briefing workflow tests while the analysis engine is finished elsewhere. Not engine output:
// the figures are built here so that they are consistent with each other and with the plan's
// own data (zone names and sizes, shelter names, the four bridge segments):
// - steady state: the four bridges 2,000 + 2,000 + 850 + 750 = 5,600 veh/h, the demo town's
//   static maximum flow and minimum cut (server/seed/demo-town/README.md);
// - demand: ⌈population × participation / persons per vehicle⌉ per zone (shared/model/vehicles);
// - curve: the smaller of the zones' departures (their own departure curves, 6 minutes' drive
//   behind) and 5,600 veh/h since minute 6 — a plausible shape, not a computed one. The slow
//   logistic zones make departures, not the bridges, the limit late on: clearance takes about
//   8 h, hence the 12-hour horizon.
import { and, asc, eq, inArray } from 'drizzle-orm';
import type { Database } from '../../../server/db/client';
import { plans, roadLayers, roadSegments, runs, shelters, zones } from '../../../server/db/schema';
import { demoPlanName } from '../../../server/seed/seed-demo';
import type { RunParameters, RunResult } from '../../../shared/api/runs';
import { saveRoadResults } from '../../../server/run-execution/road-results';
import { cumulativeShareDeparted } from '../../../shared/model/departure-curves';
import { evacuatingPersons, meanPersonsPerVehicle, zoneVehicles } from '../../../shared/model/vehicles';

export const BRIDGES = [
  { name: 'Quay Bridge', capacity: 2000, gain: 1000 },
  { name: 'Market Bridge', capacity: 2000, gain: 1000 },
  { name: 'Heron Bridge', capacity: 850, gain: 850 },
  { name: 'Mill Bridge', capacity: 750, gain: 750 },
] as const;
export const STEADY_VEHICLES_PER_HOUR = 5600;
const LAG_MINUTES = 6;

export async function demoPlanId(db: Database, organizationId: string): Promise<string> {
  const [plan] = await db.select({ id: plans.id }).from(plans).where(and(eq(plans.organizationId, organizationId), eq(plans.name, demoPlanName)));
  if (!plan) throw new Error('the demo plan is not seeded');
  return plan.id;
}

function firstAt(curve: number[], stepMinutes: number, target: number): number | null {
  const i = curve.findIndex((v) => v >= target - 1e-9);
  return i < 0 ? null : i * stepMinutes;
}

export async function insertDemoRun(
  db: Database,
  planId: string,
  createdBy: string | null,
  parameters: Partial<RunParameters> = {},
  scenarioId: string | null = null,
): Promise<{ runId: string; result: RunResult }> {
  const p: RunParameters = { horizonMinutes: 720, timeStepSeconds: 300, capacityFactor: 1, algorithm: 'auto', ...parameters };
  const [plan] = await db.select({ dataVersion: plans.dataVersion }).from(plans).where(eq(plans.id, planId));
  const [layer] = await db.select({ id: roadLayers.id }).from(roadLayers).where(and(eq(roadLayers.planId, planId), eq(roadLayers.active, true)));
  const zoneRows = await db.select().from(zones).where(eq(zones.planId, planId)).orderBy(asc(zones.id));
  const shelterRows = await db.select().from(shelters).where(eq(shelters.planId, planId)).orderBy(asc(shelters.id));
  const bridgeRows = await db
    .select({ id: roadSegments.id, name: roadSegments.name, roadClass: roadSegments.roadClass })
    .from(roadSegments)
    .where(and(eq(roadSegments.layerId, layer!.id), inArray(roadSegments.name, BRIDGES.map((b) => b.name))))
    .orderBy(asc(roadSegments.id));
  const bridges = BRIDGES.map((b) => ({ ...b, segment: bridgeRows.find((r) => r.name === b.name)! }));

  const ppv = meanPersonsPerVehicle(zoneRows);
  const zoneDemand = zoneRows.map((z) => ({ z, vehicles: zoneVehicles(z), persons: evacuatingPersons(z) }));
  const demandVehicles = zoneDemand.reduce((s, d) => s + d.vehicles, 0);
  const demandPersons = zoneDemand.reduce((s, d) => s + d.persons, 0);
  const stepMinutes = p.timeStepSeconds / 60;
  const steps = Math.round(p.horizonMinutes / stepMinutes);
  const curve: number[] = [];
  for (let i = 0; i <= steps; i++) {
    const t = i * stepMinutes - LAG_MINUTES;
    const departed = zoneDemand.reduce((s, d) => s + d.vehicles * cumulativeShareDeparted(d.z.departureCurve, t / 60), 0);
    const carried = (STEADY_VEHICLES_PER_HOUR * p.capacityFactor * Math.max(0, t)) / 60;
    curve.push(Math.round(Math.min(demandVehicles, departed, carried)));
  }
  const delivered = curve[curve.length - 1]!;
  const clearance = firstAt(curve, stepMinutes, demandVehicles);
  const steady = STEADY_VEHICLES_PER_HOUR * p.capacityFactor;
  const bounded = shelterRows.filter((s) => s.capacityPersons !== null);
  const boundedVehicles = bounded.map((s) => Math.min(Math.floor(s.capacityPersons! / ppv), Math.floor(delivered / shelterRows.length)));
  const rest = delivered - boundedVehicles.reduce((a, b) => a + b, 0);
  const exits = shelterRows.length - bounded.length;

  const result: RunResult = {
    headline: {
      steadyStateVehiclesPerHour: steady,
      steadyStatePersonsPerHour: steady * ppv,
      demandVehicles,
      demandPersons,
      deliveredVehicles: delivered,
      deliveredPersons: Math.min(demandPersons, delivered * ppv),
      horizonMinutes: p.horizonMinutes,
      clearanceMinutes: clearance,
      p50Minutes: firstAt(curve, stepMinutes, demandVehicles * 0.5),
      p90Minutes: firstAt(curve, stepMinutes, demandVehicles * 0.9),
      p95Minutes: firstAt(curve, stepMinutes, demandVehicles * 0.95),
    },
    curve: { stepMinutes, deliveredVehicles: curve },
    zones: zoneDemand.map((d) => ({
      zoneId: d.z.id,
      name: d.z.name,
      demandVehicles: d.vehicles,
      demandPersons: d.persons,
      deliveredVehicles: Math.round((d.vehicles * delivered) / demandVehicles),
      steadyStateVehiclesPerHour: Math.round((steady * d.vehicles) / demandVehicles),
      clearanceMinutes: clearance,
    })),
    shelters: shelterRows.map((s) => {
      const i = bounded.indexOf(s);
      const vehicles = i >= 0 ? boundedVehicles[i]! : Math.round(rest / Math.max(1, exits));
      return { shelterId: s.id, name: s.name, capacityPersons: s.capacityPersons, arrivedVehicles: vehicles, arrivedPersons: vehicles * ppv, steadyStateVehiclesPerHour: Math.round((steady * vehicles) / Math.max(1, delivered)) };
    }),
    bottlenecks: bridges.map((b) => ({
      segmentId: b.segment.id,
      direction: 'forward' as const,
      name: b.name,
      roadClass: b.segment.roadClass,
      capacityVehiclesPerHour: b.capacity,
      shareOfCut: b.capacity / STEADY_VEHICLES_PER_HOUR,
      cutWindows: [[LAG_MINUTES + 10, clearance ?? p.horizonMinutes]] as [number, number][],
      inStaticCut: true,
      gainPerExtraLaneVehiclesPerHour: b.gain,
    })),
    fixes: bridges.map((b) => ({ segmentId: b.segment.id, direction: 'forward' as const, name: b.name, roadClass: b.segment.roadClass, kind: 'add-lane' as const, gainVehiclesPerHour: b.gain })),
    stats: {
      engineVersion: 'test data, not computed by the engine',
      algorithm: 'dinic',
      nodes: 0,
      arcs: 0,
      expandedNodes: 0,
      expandedArcs: 0,
      augmentations: 0,
      solveMs: 0,
      peakMemoryBytes: 0,
      verified: false,
    },
  };
  const now = new Date();
  const [row] = await db
    .insert(runs)
    .values({
      planId,
      scenarioId,
      status: 'succeeded',
      phase: 'done',
      progress: 1,
      parameters: p,
      dataVersion: plan!.dataVersion,
      roadLayerId: layer!.id,
      inputHash: `test-data-${now.getTime()}-${Math.random().toString(36).slice(2)}`,
      result,
      createdBy,
      createdAt: now,
      startedAt: now,
      finishedAt: now,
    })
    .returning({ id: runs.id });
  // The bridges' figures, as a worker stores them beside the result.
  await saveRoadResults(db, row!.id, {
    segmentId: bridges.map((b) => b.segment.id),
    flowForward: bridges.map((b) => b.capacity),
    flowBackward: bridges.map(() => 0),
    capacityForward: bridges.map((b) => b.capacity),
    capacityBackward: bridges.map(() => null),
    utilisation: bridges.map(() => 1),
    cutForward: bridges.map(() => true),
    cutBackward: bridges.map(() => false),
    shareOfCut: bridges.map((b) => b.capacity / STEADY_VEHICLES_PER_HOUR),
    limitingMinutes: bridges.map(() => (clearance ?? p.horizonMinutes) - LAG_MINUTES - 10),
  });
  return { runId: row!.id, result };
}

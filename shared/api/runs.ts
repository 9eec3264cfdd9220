// Runs: one analysis of a plan's data (optionally under a scenario) and its stored result.
// The result is what the workspace shows, comparisons diff and briefings print; engine output
// is mapped into this shape by the server, so the engine can change without breaking stored runs.
import { z } from 'zod';

export const runStatusSchema = z.enum(['queued', 'running', 'succeeded', 'failed', 'cancelled']);
export type RunStatus = z.infer<typeof runStatusSchema>;

export const algorithmSchema = z.enum(['auto', 'edmonds-karp', 'dinic']);
export type AlgorithmChoice = z.infer<typeof algorithmSchema>;

export const runParametersSchema = z.object({
  horizonMinutes: z.number().int().min(10, 'At least 10 minutes.').max(72 * 60, 'At most 72 hours.'),
  timeStepSeconds: z.number().int().min(10, 'At least 10 seconds.').max(3600, 'At most one hour.'),
  // A factor on every lane capacity, e.g. 0.86 for heavy rain (HCM 7th ed. Exhibit 11-20).
  capacityFactor: z.number().min(0.05).max(1.5),
  algorithm: algorithmSchema.default('auto'),
});
export type RunParameters = z.infer<typeof runParametersSchema>;

export const defaultRunParameters: RunParameters = {
  horizonMinutes: 360,
  timeStepSeconds: 60,
  capacityFactor: 1,
  algorithm: 'auto',
};

const minutes = z.number().nullable();

export const runHeadlineSchema = z.object({
  steadyStateVehiclesPerHour: z.number(),
  steadyStatePersonsPerHour: z.number(),
  demandVehicles: z.number(),
  demandPersons: z.number(),
  deliveredVehicles: z.number(),
  deliveredPersons: z.number(),
  horizonMinutes: z.number(),
  // null: not within the horizon.
  clearanceMinutes: minutes,
  p50Minutes: minutes,
  p90Minutes: minutes,
  p95Minutes: minutes,
});
export type RunHeadline = z.infer<typeof runHeadlineSchema>;

export const roadRefSchema = z.object({
  segmentId: z.number().int(),
  // 'forward' runs from the segment's first vertex to its last.
  direction: z.enum(['forward', 'backward']),
  name: z.string(),
  roadClass: z.string(),
});
export type RoadRef = z.infer<typeof roadRefSchema>;

export const arcFlowSchema = roadRefSchema.extend({
  capacityVehiclesPerHour: z.number(),
  flowVehiclesPerHour: z.number(),
  utilisation: z.number(),
  inStaticCut: z.boolean(),
});
export type ArcFlow = z.infer<typeof arcFlowSchema>;

// One road's share of a result, both directions together: what the map colours it by and what
// its popup says. Kept per run in its own table (run_road_results) and served by road, by map
// tile and by export, never with the result: a county has hundreds of thousands of them.
const directionLoadSchema = z.object({
  capacityVehiclesPerHour: z.number(),
  flowVehiclesPerHour: z.number(),
  utilisation: z.number(),
  inStaticCut: z.boolean(),
});
export type DirectionLoad = z.infer<typeof directionLoadSchema>;
export const roadResultSchema = z.object({
  segmentId: z.number().int(),
  // null: the road has no lane that way (one-way) in this run.
  forward: directionLoadSchema.nullable(),
  backward: directionLoadSchema.nullable(),
  // The busier direction's.
  utilisation: z.number(),
  // Its share of the time-expanded cut (both directions) and for how long it is part of it.
  shareOfCut: z.number(),
  limitingMinutes: z.number(),
});
export type RoadResult = z.infer<typeof roadResultSchema>;
export const roadResultAnswerSchema = z.object({ road: roadResultSchema.nullable() });

// Geometry of a few roads (a run's choke points and fixes, or roads asked by id), [lon, lat] in
// the segment's stored direction.
export const segmentGeometrySchema = z.object({
  segments: z.array(z.object({ id: z.number().int(), coordinates: z.array(z.tuple([z.number(), z.number()])) })),
});
export type SegmentGeometry = z.infer<typeof segmentGeometrySchema>;

export const chokePointSchema = roadRefSchema.extend({
  capacityVehiclesPerHour: z.number(),
  shareOfCut: z.number(),
  // Time windows (minutes from the start) during which this road is in the time-expanded cut.
  cutWindows: z.array(z.tuple([z.number(), z.number()])),
  inStaticCut: z.boolean(),
  gainPerExtraLaneVehiclesPerHour: z.number(),
});
export type ChokePoint = z.infer<typeof chokePointSchema>;

export const fixSchema = roadRefSchema.extend({
  kind: z.enum(['add-lane', 'reopen']),
  gainVehiclesPerHour: z.number(),
});
export type Fix = z.infer<typeof fixSchema>;

export const zoneResultSchema = z.object({
  zoneId: z.number().int(),
  name: z.string(),
  demandVehicles: z.number(),
  demandPersons: z.number(),
  deliveredVehicles: z.number(),
  steadyStateVehiclesPerHour: z.number(),
  clearanceMinutes: minutes,
});
export const shelterResultSchema = z.object({
  shelterId: z.number().int(),
  name: z.string(),
  capacityPersons: z.number().nullable(),
  arrivedVehicles: z.number(),
  arrivedPersons: z.number(),
  steadyStateVehiclesPerHour: z.number(),
});

export const runStatsSchema = z.object({
  engineVersion: z.string(),
  algorithm: z.string(),
  nodes: z.number(),
  arcs: z.number(),
  expandedNodes: z.number(),
  expandedArcs: z.number(),
  augmentations: z.number(),
  solveMs: z.number(),
  peakMemoryBytes: z.number(),
  verified: z.boolean(),
});

// The minimum cut of the time-expanded network at one moment (by max-flow/min-cut, the most
// vehicles that can have arrived by then), split by what its arcs stand for: so a planner sees
// whether the roads or something else (departures, shelters) holds the number down.
export const arrivalLimitsSchema = z.object({
  byMinutes: z.number(),
  vehicles: z.number(),
  parts: z.object({
    roads: z.number(),
    // Vehicles whose departure time (the zone's departure curve) has not come yet.
    departures: z.number(),
    zoneRelease: z.number(),
    // Room to queue on a road (waiting at a junction is bounded by it).
    storage: z.number(),
    shelterIntake: z.number(),
    shelterCapacity: z.number(),
  }),
  // Zones whose release rate, shelters whose intake or space, are part of it.
  zoneIds: z.array(z.number().int()),
  shelterIds: z.array(z.number().int()),
});
export type ArrivalLimits = z.infer<typeof arrivalLimitsSchema>;

// How far the model's trip times lie from free flow (shared/flow/route-timing.ts): for every
// zone and shelter, the fastest trip in whole time steps against the fastest at free flow.
// Trips made of fastest roads stay within one step; roads off them round up to whole steps.
export const routeTimingSchema = z.object({
  timeStepSeconds: z.number(),
  // Zone–shelter pairs compared (the shelter reachable from the zone).
  pairs: z.number().int(),
  // Largest and median |modelled − free-flow| over those pairs.
  largestSeconds: z.number(),
  typicalSeconds: z.number(),
  worst: z
    .object({
      zoneId: z.number().int(),
      zoneName: z.string(),
      shelterId: z.number().int(),
      shelterName: z.string(),
      freeFlowSeconds: z.number(),
      modelledSeconds: z.number(),
    })
    .nullable(),
  // Past one step (on the fastest trips, or for the plan's typical route): the longest step that
  // should bring the difference within one present step (null when none of the offered steps
  // does, or none is needed).
  suggestedStepSeconds: z.number().nullable(),
  // The routes the plan's vehicles drive (its flow decomposed into trips), each route's modelled
  // driving time against its own free-flow time: largest, vehicle-weighted median, and the share
  // of vehicles within one step. Absent from results stored before engine version cutline-flow 1.4.
  plannedRoutes: z
    .object({ vehicles: z.number().int(), largestSeconds: z.number(), typicalSeconds: z.number(), withinOneStepShare: z.number() })
    .optional(),
});
export type RouteTiming = z.infer<typeof routeTimingSchema>;

export const runResultSchema = z.object({
  headline: runHeadlineSchema,
  curve: z.object({ stepMinutes: z.number(), deliveredVehicles: z.array(z.number()) }),
  zones: z.array(zoneResultSchema),
  shelters: z.array(shelterResultSchema),
  // Per-road figures are not part of it (see roadResultSchema); results stored before they
  // moved out had an `arcs` list, which the migration moved into run_road_results.
  // The choke points. The field keeps its first name: stored results and the frozen content of
  // briefings carry it, and a signed briefing's printed SHA-256 is computed over that content,
  // so renaming the field would change what every earlier briefing hashes to. Everywhere else
  // (types, functions, screens) they are choke points.
  bottlenecks: z.array(chokePointSchema),
  // Absent from results stored by engine versions before it was reported.
  arrivalLimits: arrivalLimitsSchema.optional(),
  // Absent from results stored before engine version cutline-flow 1.3.
  routeTiming: routeTimingSchema.optional(),
  fixes: z.array(fixSchema),
  stats: runStatsSchema,
});
export type RunResult = z.infer<typeof runResultSchema>;

export const runSchema = z.object({
  id: z.string().uuid(),
  planId: z.string().uuid(),
  scenarioId: z.string().uuid().nullable(),
  status: runStatusSchema,
  phase: z.string(),
  progress: z.number().min(0).max(1),
  parameters: runParametersSchema,
  dataVersion: z.number().int(),
  failureReason: z.string().nullable(),
  createdBy: z.string().nullable(),
  createdAt: z.string(),
  startedAt: z.string().nullable(),
  finishedAt: z.string().nullable(),
});
export type Run = z.infer<typeof runSchema>;

export const runWithResultSchema = runSchema.extend({ result: runResultSchema.nullable() });
export type RunWithResult = z.infer<typeof runWithResultSchema>;

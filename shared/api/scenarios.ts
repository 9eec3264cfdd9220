// Scenarios: named overlays on a plan's base data. A run under a scenario reads the base data
// with the overlay applied; the base data itself never changes.
import { z } from 'zod';
import { roadClassSchema, segmentAttributesObjectSchema } from './road-attributes';
import { shelterCreateSchema } from './zones-shelters';

const minutes = z.number().min(0).max(72 * 60);

export const scenarioClosureSchema = z
  .object({
    segmentId: z.number().int().positive(),
    // A low road that floods at hour 3: fromMinutes 180, untilMinutes null. A bridge closed
    // until hour 1: fromMinutes 0, untilMinutes 60.
    fromMinutes: minutes,
    untilMinutes: minutes.nullable(),
  })
  .refine((c) => c.untilMinutes === null || c.untilMinutes > c.fromMinutes, { message: 'A closure must end after it starts.', path: ['untilMinutes'] });

export const scenarioLaneChangeSchema = z.object({
  segmentId: z.number().int().positive(),
  patch: segmentAttributesObjectSchema.pick({ lanesForward: true, lanesBackward: true, speedKmh: true, capacityOverrideVehPerHourPerLane: true }).partial(),
});

/** Both directions' lanes serve one direction along the chosen segments (outbound). */
export const scenarioContraflowSchema = z.object({
  name: z.string().trim().min(1).max(120),
  segmentIds: z.array(z.number().int().positive()).min(1).max(5000),
  // 'forward' = the direction of each segment's stored coordinates.
  direction: z.enum(['forward', 'backward']),
});

export const scenarioCapacityFactorSchema = z.object({
  roadClass: roadClassSchema,
  factor: z.number().min(0).max(2),
});

export const scenarioDepartureDelaySchema = z.object({
  zoneId: z.number().int().positive(),
  // The zone starts leaving this long after the order (staggered departures).
  delayMinutes: minutes,
});

// A departure schedule per zone (e.g. the quickest order a proposal found): vehicles leaving in
// each interval of stepMinutes from the order. Applied as the zone's cumulative share, so it
// still fits when the zone's size or the run's time step differs.
export const scenarioDepartureScheduleSchema = z.object({
  zoneId: z.number().int().positive(),
  stepMinutes: z.number().min(1 / 6).max(60),
  departuresByStep: z.array(z.number().int().min(0)).min(1).max(5000),
});

export const scenarioOverlaySchema = z.object({
  closures: z.array(scenarioClosureSchema).max(5000).default([]),
  laneChanges: z.array(scenarioLaneChangeSchema).max(5000).default([]),
  contraflow: z.array(scenarioContraflowSchema).max(50).default([]),
  classFactors: z.array(scenarioCapacityFactorSchema).max(20).default([]),
  removedShelterIds: z.array(z.number().int().positive()).max(1000).default([]),
  addedShelters: z.array(shelterCreateSchema).max(200).default([]),
  departureDelays: z.array(scenarioDepartureDelaySchema).max(1000).default([]),
  departureSchedules: z.array(scenarioDepartureScheduleSchema).max(1000).default([]),
});
export type ScenarioOverlay = z.infer<typeof scenarioOverlaySchema>;
/** An overlay as stored: rows written before a kind of change existed lack its list, so read them through the schema's defaults. */
export const storedOverlay = (value: unknown): ScenarioOverlay => scenarioOverlaySchema.parse(value ?? {});

export const scenarioCreateSchema = z.object({
  name: z.string().trim().min(1, 'Give the scenario a name.').max(120),
  description: z.string().trim().max(2000).default(''),
  overlay: scenarioOverlaySchema.default(scenarioOverlaySchema.parse({})),
});
export type ScenarioCreate = z.input<typeof scenarioCreateSchema>;

export const scenarioUpdateSchema = z
  .object({ name: z.string().trim().min(1).max(120).optional(), description: z.string().trim().max(2000).optional(), overlay: scenarioOverlaySchema.optional() })
  .refine((v) => Object.keys(v).length > 0, 'Nothing to change.');

export const scenarioSchema = z.object({
  id: z.string().uuid(),
  planId: z.string().uuid(),
  name: z.string(),
  description: z.string(),
  overlay: scenarioOverlaySchema,
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type Scenario = z.infer<typeof scenarioSchema>;
export const scenarioListSchema = z.object({ scenarios: z.array(scenarioSchema) });
export const scenarioParamsSchema = z.object({ planId: z.string().uuid(), scenarioId: z.string().uuid('Not a valid identifier.') });

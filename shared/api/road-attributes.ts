// Road segments and their attributes, and the scenario edits of them: the contract between
// upload, storage, edit forms and the model (zones and shelters: zone-shelter-attributes.ts;
// capacity tables: capacity-table.ts; import options and reports: road-import.ts). The server validates uploads and edits with these schemas; the client forms use the
// same ones. Units are in every field name (veh/h/lane, km/h, veh/km/lane, metres, hours).
import { z } from 'zod';

// ---------------------------------------------------------------------------------------------
// Road classes

/**
 * The drivable road classes, named after OpenStreetMap `highway=*` values (an open standard).
 * Anything else in a `highway` tag (footway, cycleway, path, steps, construction…) is dropped
 * on import and counted in the report.
 */
export const drivableRoadClasses = [
  'motorway',
  'motorway_link',
  'trunk',
  'trunk_link',
  'primary',
  'primary_link',
  'secondary',
  'secondary_link',
  'tertiary',
  'tertiary_link',
  'unclassified',
  'residential',
  'living_street',
  'service',
] as const;
export const roadClassSchema = z.enum(drivableRoadClasses);
export type RoadClass = z.infer<typeof roadClassSchema>;

// ---------------------------------------------------------------------------------------------
// Segment attributes

const laneCount = z.int().min(0).max(16);

/**
 * Attributes of one road segment, stored per segment. `null` means "use the plan's default
 * for this road class" (the capacity table); the data did not say. Lanes are counted in the
 * direction the coordinates are stored (`lanesForward`) and against it (`lanesBackward`);
 * ways tagged `oneway=-1` are stored reversed so that forward is always the travel direction.
 */
export const segmentAttributesObjectSchema = z.object({
  roadClass: roadClassSchema,
  /** Lanes along the stored direction; null = class default. */
  lanesForward: laneCount.nullable(),
  /** Lanes against the stored direction; 0 on one-way roads; null = class default. */
  lanesBackward: laneCount.nullable(),
  oneway: z.boolean(),
  /** Free-flow speed in km/h; null = class default. */
  speedKmh: z.number().positive().max(200).nullable(),
  name: z.string().max(300).nullable(),
  bridge: z.boolean(),
  tunnel: z.boolean(),
  /** Vertical layer (OSM `layer`, or 1 for an untagged bridge, −1 for an untagged tunnel). */
  layer: z.int().min(-10).max(10),
  /** Closed to traffic in every scenario of the plan (a planner's edit). */
  closed: z.boolean(),
  /** Replaces the class's per-lane capacity for this segment, veh/h/lane. */
  capacityOverrideVehPerHourPerLane: z.number().positive().max(5000).nullable(),
});

function lanesAgreeWithOneway(a: { oneway: boolean; lanesForward: number | null; lanesBackward: number | null }): boolean {
  if (a.oneway) return a.lanesBackward === 0 && a.lanesForward !== 0;
  return a.lanesForward !== 0 && a.lanesBackward !== 0;
}

export const segmentAttributesSchema = segmentAttributesObjectSchema.refine(lanesAgreeWithOneway, {
  message: 'a one-way road has 0 lanes backward and at least one forward; a two-way road has lanes both ways',
  path: ['lanesBackward'],
});
export type SegmentAttributes = z.infer<typeof segmentAttributesSchema>;

/** A planner's edit of one segment: any subset of the attributes (merged, then re-validated). */
export const segmentAttributesPatchSchema = segmentAttributesObjectSchema.partial();
export type SegmentAttributesPatch = z.infer<typeof segmentAttributesPatchSchema>;

// ---------------------------------------------------------------------------------------------
// The built network (plain, serialisable; index = id)

export const lonLatSchema = z.tuple([z.number().min(-180).max(180), z.number().min(-90).max(90)]);
export type LonLat = z.infer<typeof lonLatSchema>;

export const networkNodeSchema = z.object({ lon: z.number(), lat: z.number() });
export type NetworkNode = z.infer<typeof networkNodeSchema>;

export const networkSegmentSchema = z.object({
  fromNode: z.int().min(0),
  toNode: z.int().min(0),
  /** Geometry from fromNode to toNode, WGS84 [lon, lat]. */
  coordinates: z.array(lonLatSchema).min(2),
  /** Geodesic length (haversine along the vertices), metres. */
  lengthMeters: z.number().min(0),
  attributes: segmentAttributesSchema,
  /** Index of the feature in the uploaded collection (after OSM conversion for OSM files). */
  sourceFeatureIndex: z.int().min(0),
  /** The feature's id (`way/123` for OSM), if it had one. */
  sourceId: z.string().nullable(),
  /** Connected component (undirected); 0 is the largest by length. */
  component: z.int().min(0),
});
export type NetworkSegment = z.infer<typeof networkSegmentSchema>;

// ---------------------------------------------------------------------------------------------
// Scenario edits of segments (applied when the engine problem is built; the layer is untouched)

export const roadClosureSchema = z
  .object({ fromSeconds: z.number().min(0), untilSeconds: z.number().min(0).nullable() })
  .refine((c) => c.untilSeconds === null || c.untilSeconds >= c.fromSeconds, {
    message: 'a closure ends after it starts',
    path: ['untilSeconds'],
  });
export type RoadClosure = z.infer<typeof roadClosureSchema>;

/**
 * One scenario's change to one segment: attribute changes (lanes for contraflow, a closure
 * for the whole run, a capacity override) and time-windowed closures, in seconds after the
 * evacuation order. `segment` is the segment's index in the network passed to the model.
 */
export const segmentOverrideSchema = segmentAttributesObjectSchema.partial().extend({
  segment: z.int().min(0),
  closures: z.array(roadClosureSchema).optional(),
});
export type SegmentOverride = z.infer<typeof segmentOverrideSchema>;

// Road layers, zones and shelters: the contract between upload, storage, edit forms and the
// model. The server validates uploads and edits with these schemas; the client forms use the
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
// Capacity table (per plan)

const source = z.string().min(1).max(500);

/** Defaults for one road class. Each value carries where it comes from. */
export const capacityTableRowSchema = z.object({
  roadClass: roadClassSchema,
  lanesPerDirection: z.int().min(1).max(8),
  lanesSource: source,
  speedKmh: z.number().positive().max(200),
  speedSource: source,
  capacityVehPerHourPerLane: z.number().positive().max(5000),
  capacitySource: source,
  jamDensityVehPerKmPerLane: z.number().positive().max(300),
  jamDensitySource: source,
});
export type CapacityTableRow = z.infer<typeof capacityTableRowSchema>;

/** Multiplies every arc capacity (weather, incidents, evacuation conditions). */
export const capacityFactorSchema = z.number().gt(0).max(2);

export const capacityTableSchema = z
  .object({
    rows: z.array(capacityTableRowSchema),
    capacityFactor: capacityFactorSchema,
    /** Why this factor (e.g. "heavy rain, HCM 7th ed. Exhibit 11-20"). */
    capacityFactorNote: z.string().max(500),
  })
  .refine((t) => drivableRoadClasses.every((c) => t.rows.filter((r) => r.roadClass === c).length === 1), {
    message: 'the table needs exactly one row per drivable road class',
    path: ['rows'],
  });
export type CapacityTable = z.infer<typeof capacityTableSchema>;

// ---------------------------------------------------------------------------------------------
// Zones (sources) and shelters (sinks)

/**
 * When residents leave, as the cumulative share departed by time t (hours after the order):
 * - `allAtOnce`: F(t) = 1 for t ≥ 0.
 * - `uniform`: F(t) = min(1, t / durationHours).
 * - `logistic` (S-curve): P(t) = 1 / (1 + e^(−α(t − H))), α = responseRatePerHour,
 *   H = halfLoadingHours; shifted so that nobody has left at t = 0:
 *   F(t) = (P(t) − P(0)) / (1 − P(0)).
 * - `rayleigh`: F(t) = 1 − exp(−t² / (2σ²)), σ = sigmaHours.
 * The two S-shaped forms fit observed evacuations (Li, Ozbay, Bartin et al. 2013, TRR 2376).
 */
export const departureCurveSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('allAtOnce') }),
  z.object({ kind: z.literal('uniform'), durationHours: z.number().positive().max(72) }),
  z.object({
    kind: z.literal('logistic'),
    responseRatePerHour: z.number().positive().max(100),
    halfLoadingHours: z.number().min(0).max(72),
  }),
  z.object({ kind: z.literal('rayleigh'), sigmaHours: z.number().positive().max(72) }),
]);
export type DepartureCurve = z.infer<typeof departureCurveSchema>;

export const zoneAttributesSchema = z.object({
  name: z.string().min(1).max(200),
  /** Resident population, persons. */
  population: z.int().min(0).max(50_000_000),
  /** Share of residents who leave, 0–1. */
  participationRate: z.number().min(0).max(1),
  /** Persons per evacuating vehicle. */
  personsPerVehicle: z.number().min(1).max(10),
  departureCurve: departureCurveSchema,
});
export type ZoneAttributes = z.infer<typeof zoneAttributesSchema>;

export const shelterAttributesSchema = z.object({
  name: z.string().min(1).max(200),
  /** Persons the shelter can take; null = an unbounded exit (e.g. at the study-area edge). */
  capacityPersons: z.int().min(0).max(50_000_000).nullable(),
});
export type ShelterAttributes = z.infer<typeof shelterAttributesSchema>;

/** Which network nodes a zone feeds; `inside` = nodes in its polygon, else the nearest one. */
export const zoneAttachmentSchema = z.object({
  zoneIndex: z.int().min(0),
  entryNodes: z.array(z.int().min(0)).min(1),
  attachedBy: z.enum(['inside', 'nearest']),
  /** Distance from the polygon to the node when attached by `nearest`, metres; 0 when inside. */
  distanceMeters: z.number().min(0),
});
export type ZoneAttachment = z.infer<typeof zoneAttachmentSchema>;

export const shelterAttachmentSchema = z.object({
  shelterIndex: z.int().min(0),
  node: z.int().min(0),
  distanceMeters: z.number().min(0),
});
export type ShelterAttachment = z.infer<typeof shelterAttachmentSchema>;

// ---------------------------------------------------------------------------------------------
// Import options

/**
 * Which GeoJSON properties hold what, for GIS data that does not use OpenStreetMap tags.
 * Without a mapping, properties are read as OSM tags (`highway`, `lanes`, `oneway`…, also
 * nested under `tags` as osmtogeojson writes them).
 */
export const propertyMappingSchema = z.object({
  roadClass: z.string().min(1),
  /** Planner's class values → road class, or 'drop' to leave them out. Unlisted values are
   *  read as OSM class names when they are one, else dropped as unknown. */
  classValues: z.record(z.string(), z.union([roadClassSchema, z.literal('drop')])).default({}),
  lanes: z.string().min(1).optional(),
  lanesForward: z.string().min(1).optional(),
  lanesBackward: z.string().min(1).optional(),
  /** Values yes/true/1/FT = along the digitised direction, -1/TF/reverse = against it. */
  oneway: z.string().min(1).optional(),
  speed: z.string().min(1).optional(),
  /** Unit of bare numbers in the speed property (a value like "30 mph" says its own unit). */
  speedUnit: z.enum(['kmh', 'mph']).default('kmh'),
  name: z.string().min(1).optional(),
  bridge: z.string().min(1).optional(),
  tunnel: z.string().min(1).optional(),
  /** Layer or level: roads that cross on different layers are not joined. */
  layer: z.string().min(1).optional(),
  id: z.string().min(1).optional(),
});
export type PropertyMapping = z.infer<typeof propertyMappingSchema>;

export const importOptionsSchema = z.object({
  propertyMapping: propertyMappingSchema.nullable().default(null),
  /** Dangling ends this close to another road are joined to it, metres. */
  snapToleranceMeters: z.number().min(0).max(50).default(3),
  /** Split roads where they cross on the same layer. Default: yes for GeoJSON (GIS data often
   *  has no shared vertices), no for OpenStreetMap (whose ways share nodes at junctions). */
  splitAtCrossings: z.boolean().optional(),
  /** Segments shorter than this are listed in the report, metres. */
  tinySegmentMeters: z.number().min(0).max(100).default(1),
});
export type ImportOptions = z.infer<typeof importOptionsSchema>;
export type ImportOptionsInput = z.input<typeof importOptionsSchema>;

// ---------------------------------------------------------------------------------------------
// Import report and failures

export const dropReasonSchema = z.enum([
  /** `highway` value that cars do not use (footway, cycleway, steps, construction…). */
  'notDrivableClass',
  /** No road class at all (buildings, rivers… in an OSM file; empty class property). */
  'noRoadClass',
  /** A class value the property mapping does not know, or mapped to 'drop'. */
  'unknownClass',
  /** access/vehicle/motor_vehicle/motorcar = no. */
  'noMotorVehicles',
  /** area=yes (a square or a parking lot drawn as an area). */
  'area',
  /** Points and polygons in a road layer. */
  'notALine',
  /** Feature without geometry. */
  'noGeometry',
  /** oneway=reversible/alternating: direction changes with time. */
  'reversibleOneway',
  /** All vertices at one spot. */
  'zeroLength',
]);
export type DropReason = z.infer<typeof dropReasonSchema>;

export const badFeatureSchema = z.object({
  index: z.int().min(0),
  id: z.string().nullable(),
  problem: z.string(),
});
export type BadFeature = z.infer<typeof badFeatureSchema>;

export const importReportSchema = z.object({
  sourceFormat: z.enum(['geojson', 'osmXml', 'osmJson']),
  featureCount: z.int().min(0),
  nodeCount: z.int().min(0),
  segmentCount: z.int().min(0),
  /** Directed arcs: two per two-way segment, one per one-way segment. */
  arcCount: z.int().min(0),
  totalLengthMeters: z.number().min(0),
  kept: z.array(
    z.object({ roadClass: roadClassSchema, features: z.int(), segments: z.int(), lengthMeters: z.number() }),
  ),
  dropped: z.array(z.object({ roadClass: z.string(), reason: dropReasonSchema, features: z.int() })),
  /** Segments whose lanes or speed the data did not give: the class default applies. */
  defaultsApplied: z.array(
    z.object({ roadClass: roadClassSchema, segments: z.int(), lanes: z.int(), speed: z.int() }),
  ),
  /** Attribute values that could not be read and were replaced by the class default. */
  unreadValues: z.array(z.object({ key: z.string(), value: z.string(), features: z.int() })),
  /** OSM ways that referenced nodes missing from the file: cut there, pieces kept. */
  waysCutAtMissingNodes: z.array(z.object({ sourceId: z.string(), missingNodeIds: z.array(z.string()) })),
  splitAtCrossings: z.boolean(),
  /** Crossings where roads were split and joined (same layer). */
  crossingsJoined: z.int().min(0),
  /** Crossings left apart because the roads are on different layers (bridge, tunnel, layer). */
  crossingsOnDifferentLayers: z.int().min(0),
  snapToleranceMeters: z.number(),
  /** Nodes where ends were moved to join: how many ends, and the largest move, metres. */
  snappedEnds: z.array(z.object({ node: z.int(), lon: z.number(), lat: z.number(), ends: z.int().min(1), movedMeters: z.number() })),
  danglingEnds: z.array(z.object({ node: z.int(), lon: z.number(), lat: z.number() })),
  tinySegmentMeters: z.number(),
  tinySegments: z.array(z.object({ segment: z.int(), lengthMeters: z.number() })),
  /** Undirected connected components, largest (by length) first; id = segment.component. */
  components: z.array(
    z.object({
      id: z.int(),
      nodes: z.int(),
      segments: z.int(),
      lengthMeters: z.number(),
      shareOfLength: z.number(),
      /** [minLon, minLat, maxLon, maxLat] */
      bbox: z.tuple([z.number(), z.number(), z.number(), z.number()]),
    }),
  ),
});
export type ImportReport = z.infer<typeof importReportSchema>;

export const importFailureCodeSchema = z.enum([
  /** Not JSON / XML / bzip2 we can read, or not a FeatureCollection / OSM document. */
  'unreadableFile',
  /** Declares a coordinate reference system other than WGS84 longitude/latitude. */
  'wrongCrs',
  /** One or more features are malformed: see badFeatures. */
  'badFeatures',
  /** Nothing drivable left after filtering. */
  'noDrivableRoads',
  /** A shelter, exit or zone cannot be attached to the network. */
  'attachmentFailed',
]);
export type ImportFailureCode = z.infer<typeof importFailureCodeSchema>;

/** Why an import failed; nothing of it is saved. */
export const importFailureSchema = z.object({
  code: importFailureCodeSchema,
  message: z.string(),
  badFeatures: z.array(badFeatureSchema),
});
export type ImportFailure = z.infer<typeof importFailureSchema>;

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

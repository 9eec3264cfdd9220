// Reading a road file: which properties hold what, the import options, and the report of what
// was kept, dropped and why (or why the whole file was refused).
import { z } from 'zod';
import { roadClassSchema } from './road-attributes';

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

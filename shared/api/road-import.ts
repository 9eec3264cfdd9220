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
  /** The file's own one-way convention where it differs (e.g. a county's F/T/B codes): value →
   *  along the drawing direction, against it, or both ways. Unlisted values are read as above. */
  onewayValues: z.record(z.string().max(200), z.enum(['forward', 'backward', 'both'])).default({}),
  speed: z.string().min(1).optional(),
  /** Unit of bare numbers in the speed property (a value like "30 mph" says its own unit). */
  speedUnit: z.enum(['kmh', 'mph']).default('kmh'),
  name: z.string().min(1).optional(),
  bridge: z.string().min(1).optional(),
  tunnel: z.string().min(1).optional(),
  /** Layer or level: roads that cross on different layers are not joined. */
  layer: z.string().min(1).optional(),
  id: z.string().min(1).optional(),
  /** Closed to traffic (a planner's closure, e.g. in a file Cutline wrote): flag values as for bridge. */
  closed: z.string().min(1).optional(),
  /** Capacity per lane that replaces the class value, veh/h per lane (empty: the class value). */
  capacityPerLane: z.string().min(1).optional(),
});
export type PropertyMapping = z.infer<typeof propertyMappingSchema>;

/**
 * How to read a GIS file beyond its contents: which GeoPackage layer, which coordinate system
 * when the file names none (the planner's answer), which CSV columns hold the position.
 */
export const sourceReadOptionsSchema = z.object({
  /** GeoPackage table (layer) name; required when the file has several. */
  layer: z.string().min(1).max(200).optional(),
  /** The file's coordinate system when it does not say: `EPSG:NNNN` or an OGC URN. */
  crs: z.string().min(1).max(200).optional(),
  /** CSV columns holding the position: longitude/latitude, or x/y in `crs`. */
  xColumn: z.string().min(1).max(200).optional(),
  yColumn: z.string().min(1).max(200).optional(),
  /** Text encoding of a Shapefile's .dbf when it has no .cpg (e.g. `windows-1252`). */
  encoding: z.string().min(1).max(40).optional(),
});
export type SourceReadOptions = z.infer<typeof sourceReadOptionsSchema>;

/** The coordinate system a file was in before it was reprojected to WGS84. */
export const sourceCrsSchema = z.object({
  /** EPSG code when known (declared, or named by the definition). */
  epsg: z.int().nullable(),
  name: z.string(),
  /** proj4 string or WKT, as used. */
  definition: z.string(),
});
export type SourceCrs = z.infer<typeof sourceCrsSchema>;

export const sourceFormatSchema = z.enum(['geojson', 'osmXml', 'osmJson', 'osmPbf', 'shapefile', 'geopackage', 'kml', 'csv']);
export type SourceFormat = z.infer<typeof sourceFormatSchema>;

/** Which columns hold a zone's attributes, for files that do not use Cutline's property names. */
export const zoneFieldMappingSchema = z.object({
  name: z.string().min(1).max(200).optional(),
  /** Resident population, persons. */
  population: z.string().min(1).max(200).optional(),
  /** Share who leave, 0–1 (a value above 1 is read as a percentage). */
  participationRate: z.string().min(1).max(200).optional(),
  personsPerVehicle: z.string().min(1).max(200).optional(),
});
export type ZoneFieldMapping = z.infer<typeof zoneFieldMappingSchema>;

/** Which columns hold a shelter's attributes. */
export const shelterFieldMappingSchema = z.object({
  name: z.string().min(1).max(200).optional(),
  /** Persons the shelter takes. */
  capacityPersons: z.string().min(1).max(200).optional(),
});
export type ShelterFieldMapping = z.infer<typeof shelterFieldMappingSchema>;

/** A zone or shelter upload: how to read the file and which columns mean what. */
export const zoneUploadOptionsSchema = z.object({ source: sourceReadOptionsSchema.optional(), fields: zoneFieldMappingSchema.optional() });
export type ZoneUploadOptions = z.infer<typeof zoneUploadOptionsSchema>;
export const shelterUploadOptionsSchema = z.object({ source: sourceReadOptionsSchema.optional(), fields: shelterFieldMappingSchema.optional() });
export type ShelterUploadOptions = z.infer<typeof shelterUploadOptionsSchema>;

/**
 * Everything a planner chose to read a county's files: the road columns, how to read the files
 * (layer, CRS, CSV columns), the zone and shelter columns. Saved per organisation as a named
 * preset, and the `network` command's --mapping file (a bare road mapping is read as `roads`).
 */
export const fieldMappingSchema = z.object({
  roads: propertyMappingSchema.nullable().optional(),
  source: sourceReadOptionsSchema.optional(),
  zones: zoneFieldMappingSchema.optional(),
  shelters: shelterFieldMappingSchema.optional(),
});
export type FieldMapping = z.infer<typeof fieldMappingSchema>;

/** A mapping file: the full form, or only the road mapping as older files have it. */
export function parseFieldMappingFile(json: unknown): FieldMapping {
  if (json !== null && typeof json === 'object' && 'roadClass' in json) return { roads: propertyMappingSchema.parse(json) };
  return fieldMappingSchema.parse(json);
}

/** One column of an uploaded file, as the field-mapping step shows it. */
export const fileFieldSchema = z.object({
  name: z.string(),
  type: z.enum(['number', 'text', 'boolean', 'mixed', 'empty']),
  /** Up to 8 distinct values, as text. */
  samples: z.array(z.string()),
  /** Distinct values seen (counted up to 1,000; `distinctCapped` when there were more). */
  distinct: z.int().min(0),
  distinctCapped: z.boolean(),
  /** Features with no value in this column. */
  empty: z.int().min(0),
});
export type FileField = z.infer<typeof fileFieldSchema>;

/** The first features of a file (WGS84) with their properties, for the preview map. */
export const previewFeatureSchema = z.object({
  index: z.int().min(0),
  geometry: z.object({ type: z.string(), coordinates: z.unknown() }).nullable(),
  properties: z.record(z.string(), z.unknown()),
});
export type PreviewFeature = z.infer<typeof previewFeatureSchema>;

/** What a file holds, read before it is imported (the field-mapping step). */
export const fileSchemaSchema = z.object({
  fileName: z.string(),
  format: sourceFormatSchema,
  layers: z.array(z.string()),
  layer: z.string().nullable(),
  featureCount: z.int().min(0),
  /** Features per geometry type ("none" for features without geometry). */
  geometryTypes: z.record(z.string(), z.int()),
  fields: z.array(fileFieldSchema),
  sourceCrs: sourceCrsSchema.nullable(),
  /** [minLon, minLat, maxLon, maxLat] after reprojection; null when nothing has a position. */
  extent: z.tuple([z.number(), z.number(), z.number(), z.number()]).nullable(),
  preview: z.array(previewFeatureSchema),
});
export type FileSchema = z.infer<typeof fileSchemaSchema>;

export const importOptionsSchema = z.object({
  propertyMapping: propertyMappingSchema.nullable().default(null),
  source: sourceReadOptionsSchema.optional(),
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

/** The `options` field of an import job, per kind: a road layer's import options, or how to read a
 *  zone or shelter file and which of its columns mean what (the field-mapping step's answer). */
export type ImportJobOptions = ImportOptions | ZoneUploadOptions | ShelterUploadOptions;

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
  sourceFormat: sourceFormatSchema,
  /** The file's coordinate system when it was not WGS84 longitude/latitude (reports stored
   *  before other formats were read have none). */
  sourceCrs: sourceCrsSchema.nullable().optional(),
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

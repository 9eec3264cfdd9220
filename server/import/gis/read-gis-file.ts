// The front door of every uploaded GIS file, for roads, zones and shelters alike: bytes +
// read options → a GeoJSON FeatureCollection in WGS84 longitude/latitude with the source CRS,
// or OpenStreetMap elements for the OSM formats. Pure apart from CPU and memory (no database,
// no file system), with bounded work: compressed and zipped input expands to at most
// `maxExpandedBytes`, and at most `maxFeatures` features are read. The format is told by the
// bytes (magic numbers, the first element), never by the file name alone.
import type { FeatureCollection } from 'geojson';
import type { BadFeature, SourceCrs, SourceFormat, SourceReadOptions } from '../../../shared/api/road-import';
import { RoadImportError } from '../../../shared/geo/road-import-error';
import { expandUpload, MAX_EXPANDED_BYTES, parseJsonBytes, textStart } from '../decode-upload';
import type { OsmJson } from '../osm-json';
import { readOsmXml } from '../read-osm-xml';
import { crsFromName, epsgCodeOfName, looksProjected, suggestEpsgCodes, undeclaredProjectedError, type CrsTransform, type Extent } from './crs';
import { readCsvPoints } from './read-csv-points';
import { readGeoPackage, SQLITE_MAGIC } from './read-geopackage';
import { readKmlText, readKmz } from './read-kml';
import { PBF_FIRST_BLOCK, readOsmPbf } from './read-osm-pbf';
import { readShapefileZip, type RawGisLayer } from './read-shapefile-zip';
import { extentOf, outOfRangeShare, reprojectCollection } from './reproject';
import { unzipBounded, ZIP_MAGIC } from './unzip-bounded';

export const MAX_FEATURES = 2_000_000;

export interface GisReadOptions extends SourceReadOptions {
  fileName?: string;
  maxExpandedBytes?: number;
  maxFeatures?: number;
}

export interface GisFeatures {
  kind: 'features';
  format: Exclude<SourceFormat, 'osmXml' | 'osmJson' | 'osmPbf'>;
  /** WGS84 longitude/latitude. */
  collection: FeatureCollection;
  /** Null when the file was WGS84 longitude/latitude already. */
  sourceCrs: SourceCrs | null;
  /** Layers the file holds (GeoPackage tables, Shapefiles in one zip); empty for single-layer formats. */
  layers: string[];
  layer: string | null;
  /** Set when most positions are not longitude/latitude and the file names no CRS: the
   *  features are left as read, for `withCrsQuestion` to refuse with their problems listed. */
  undeclaredProjected: Extent | null;
}

export interface GisOsm {
  kind: 'osm';
  format: 'osmXml' | 'osmJson' | 'osmPbf';
  osm: OsmJson;
}

export type GisReading = GisFeatures | GisOsm;

function startsWith(bytes: Uint8Array, prefix: number[]): boolean {
  return prefix.every((b, i) => bytes[i] === b);
}

/** An OSM PBF file begins with a 4-byte length, then a BlobHeader whose type is "OSMHeader". */
function isOsmPbf(bytes: Uint8Array): boolean {
  if (bytes.length < 16) return false;
  const marker = new TextEncoder().encode(PBF_FIRST_BLOCK);
  return bytes[4] === 0x0a && bytes[5] === marker.length && marker.every((b, i) => bytes[6 + i] === b);
}

/** The WGS84 names GeoJSON files use (RFC 7946 §4 and the 2008 `crs` member). */
function isWgs84Name(name: string): boolean {
  return epsgCodeOfName(name) === 4326;
}

function geojsonCrs(json: Record<string, unknown>, label: string): CrsTransform | null {
  const crs = json['crs'];
  if (crs === undefined || crs === null) return null;
  const props = (crs as { properties?: { name?: unknown } }).properties;
  const name = typeof props?.name === 'string' ? props.name : undefined;
  if (name === undefined) {
    throw new RoadImportError('wrongCrs', `${label}: the "crs" member does not name a coordinate system (expected {"type": "name", "properties": {"name": "EPSG:NNNN"}})`);
  }
  if (isWgs84Name(name)) return null;
  return crsFromName(name, label);
}

/**
 * Checks the CRS against the coordinates, reprojects to WGS84, and refuses with the features'
 * problems listed when any position does not transform.
 */
function finish(raw: RawGisLayer, format: GisFeatures['format'], label: string, options: GisReadOptions, extraProblems: BadFeature[] = []): GisFeatures {
  const extent = extentOf(raw.collection);
  let transform = raw.transform;
  if (!transform && options.crs) transform = crsFromName(options.crs, label);
  // A few positions out of range are bad features (the readers list them); most of them, a projected file.
  if (extent && looksProjected(extent) && outOfRangeShare(raw.collection) >= 0.5) {
    if (!transform) return { kind: 'features', format, collection: raw.collection, sourceCrs: null, layers: raw.layers, layer: raw.layers.length > 0 ? raw.layer : null, undeclaredProjected: extent };
    if (!transform.toWgs84) {
      const s = suggestEpsgCodes(extent, 5);
      throw new RoadImportError(
        'wrongCrs',
        `${label}: the file says its coordinates are longitude/latitude (${transform.crs.name}), but they are not (x ${extent[0].toFixed(0)}…${extent[2].toFixed(0)}, y ${extent[1].toFixed(0)}…${extent[3].toFixed(0)}): its coordinate system is declared wrongly.` +
          (s.length > 0 ? ` Codes whose area of use fits: ${s.map((c) => `EPSG:${c.code} (${c.name})`).join('; ')}.` : '') +
          ' Choose the right one and upload it again.',
      );
    }
  }
  const { collection, problems } = transform ? reprojectCollection(raw.collection, transform) : { collection: raw.collection, problems: [] };
  const all = [...extraProblems, ...problems];
  if (all.length > 0) {
    throw new RoadImportError('badFeatures', `${label}: ${all.length} feature${all.length === 1 ? '' : 's'} cannot be read or reprojected; nothing was imported`, all.slice(0, 1000));
  }
  return {
    kind: 'features',
    format,
    collection,
    sourceCrs: transform?.toWgs84 ? transform.crs : null,
    layers: raw.layers,
    layer: raw.layers.length > 0 ? raw.layer : null,
    undeclaredProjected: null,
  };
}

/**
 * Runs a feature reader on a reading; when the file looked projected without naming its CRS,
 * refuses it as `wrongCrs` with the EPSG codes its extent suggests and the reader's list of
 * bad features (every position out of longitude/latitude range, and anything else wrong).
 */
export function withCrsQuestion<T>(reading: GisFeatures, label: string, read: () => T): T {
  if (!reading.undeclaredProjected) return read();
  let bad: BadFeature[] = [];
  try {
    read();
  } catch (error) {
    if (!(error instanceof RoadImportError)) throw error;
    bad = error.failure.badFeatures;
  }
  throw new RoadImportError('wrongCrs', undeclaredProjectedError(label, reading.undeclaredProjected).failure.message, bad);
}

/** @throws RoadImportError `unreadableFile` | `wrongCrs` | `badFeatures` */
export async function readGisFile(input: Uint8Array, options: GisReadOptions = {}): Promise<GisReading> {
  const label = options.fileName ?? 'upload';
  const maxExpandedBytes = options.maxExpandedBytes ?? MAX_EXPANDED_BYTES;
  const maxFeatures = options.maxFeatures ?? MAX_FEATURES;
  const limits = { label, maxExpandedBytes, maxFeatures };

  if (startsWith(input, ZIP_MAGIC)) {
    // A zip is a Shapefile set or a KMZ: look at the names inside without inflating anything else.
    const listing = listZip(input, label);
    if (listing.some((n) => n.endsWith('.shp'))) return finish(await readShapefileZip(input, { ...limits, layer: options.layer, crs: options.crs, encoding: options.encoding }), 'shapefile', label, options);
    if (listing.some((n) => n.endsWith('.kml'))) return finish(readKmz(input, limits), 'kml', label, options);
    if (listing.some((n) => n.endsWith('.dbf'))) {
      throw new RoadImportError('unreadableFile', `${label}: the zip archive holds a .dbf table but no .shp; a Shapefile needs its .shp, .dbf and .prj together in one zip`);
    }
    throw new RoadImportError('unreadableFile', `${label}: the zip archive holds neither a Shapefile (.shp, .dbf, .prj) nor a KML document`);
  }
  if (startsWith(input, SQLITE_MAGIC)) return finish(await readGeoPackage(input, { ...limits, layer: options.layer, crs: options.crs }), 'geopackage', label, options);
  if (isOsmPbf(input)) return { kind: 'osm', format: 'osmPbf', osm: readOsmPbf(input, label, maxExpandedBytes, maxFeatures * 10) };

  const { bytes } = expandUpload(input, label, maxExpandedBytes);
  const start = textStart(bytes);
  if (start < 0) throw new RoadImportError('unreadableFile', `${label}: the file is empty`);
  const text = bytes.subarray(start);
  if (text[0] === 0x3c) {
    const head = new TextDecoder().decode(text.subarray(0, 4096));
    if (/<kml[\s>]/.test(head)) return finish(readKmlText(text, limits), 'kml', label, options);
    return { kind: 'osm', format: 'osmXml', osm: readOsmXml(text) };
  }
  if (text[0] === 0x7b) {
    const json = parseJsonBytes(text, label);
    if (json !== null && typeof json === 'object' && Array.isArray((json as { elements?: unknown }).elements)) return { kind: 'osm', format: 'osmJson', osm: json as OsmJson };
    if (json === null || typeof json !== 'object' || (json as { type?: unknown }).type !== 'FeatureCollection' || !Array.isArray((json as { features?: unknown }).features)) {
      throw new RoadImportError('unreadableFile', `${label}: expected a GeoJSON FeatureCollection`);
    }
    const fc = json as FeatureCollection & { crs?: unknown };
    if (fc.features.length > maxFeatures) throw new RoadImportError('unreadableFile', `${label}: more than ${maxFeatures} features, more than an import can read`);
    const transform = options.crs ? crsFromName(options.crs, label) : geojsonCrs(fc as unknown as Record<string, unknown>, label);
    // The crs member has been read; what leaves here is RFC 7946 GeoJSON.
    const { crs: _crs, ...rest } = fc;
    void _crs;
    return finish({ collection: rest as FeatureCollection, transform, layers: [], layer: 'geojson' }, 'geojson', label, options);
  }
  if (/\.(csv|txt|tsv)$/i.test(label) || looksLikeCsv(text)) {
    const csv = readCsvPoints(text, { ...limits, xColumn: options.xColumn, yColumn: options.yColumn, crs: options.crs });
    return finish(csv, 'csv', label, options, csv.rowProblems);
  }
  throw new RoadImportError(
    'unreadableFile',
    `${label}: not a format Cutline reads (GeoJSON, zipped Shapefile, GeoPackage, KML/KMZ, OpenStreetMap XML/JSON/PBF, CSV; optionally .gz or .bz2 compressed)`,
  );
}

/** A header line with a delimiter and no control characters: a CSV table. */
function looksLikeCsv(text: Uint8Array): boolean {
  const head = new TextDecoder().decode(text.subarray(0, 2048));
  const firstLine = head.split(/\r?\n/)[0] ?? '';
  // eslint-disable-next-line no-control-regex
  return /[,;\t]/.test(firstLine) && !/[\u0000-\u0008\u000e-\u001f]/.test(head);
}

/** Lower-cased entry names of a zip archive, without inflating any. */
function listZip(bytes: Uint8Array, label: string): string[] {
  const names: string[] = [];
  unzipBounded(bytes, label, Number.MAX_SAFE_INTEGER, (base) => {
    names.push(base);
    return false;
  });
  return names;
}

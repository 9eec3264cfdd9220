// Structural checks shared by road, zone and shelter uploads: a FeatureCollection in WGS84
// longitude/latitude, positions that are numbers in range.
import type { BadFeature } from '../api/road-import';
import type { LonLat } from '../api/road-attributes';
import { RoadImportError } from './road-import-error';

/** CRS names that mean WGS84 longitude/latitude (RFC 7946 §4; the 2008 GeoJSON `crs` member). */
const WGS84_NAMES = new Set([
  'urn:ogc:def:crs:ogc:1.3:crs84',
  'urn:ogc:def:crs:ogc::crs84',
  'crs84',
  'epsg:4326',
  'urn:ogc:def:crs:epsg::4326',
  'urn:ogc:def:crs:epsg:6.6:4326',
  'http://www.opengis.net/def/crs/ogc/1.3/crs84',
  'http://www.opengis.net/def/crs/epsg/0/4326',
]);

export interface RawFeature {
  index: number;
  id: string | null;
  geometry: unknown;
  properties: Record<string, unknown>;
}

const PREVIEW_CHARS = 80;

/**
 * A value as the file has it, for a message: JSON, cut to one line. A feature may hold anything
 * (a million positions, nesting too deep to write out), and the message must stay readable.
 */
export function preview(value: unknown): string {
  let text: string;
  try {
    text = JSON.stringify(value) ?? String(value);
  } catch {
    return Array.isArray(value) ? '[…nested too deep to show…]' : '{…nested too deep to show…}';
  }
  return text.length > PREVIEW_CHARS ? `${text.slice(0, PREVIEW_CHARS - 1)}…` : text;
}

/** What a message calls a geometry's type: the type as written, or that there is none. */
export function geometryTypeName(geometry: unknown): string {
  if (geometry === null || geometry === undefined) return 'empty';
  const type = typeof geometry === 'object' ? (geometry as { type?: unknown }).type : undefined;
  return type === undefined ? 'a geometry without a "type"' : preview(type);
}

function crsName(crs: unknown): string | undefined {
  if (crs === null || typeof crs !== 'object') return undefined;
  const props = (crs as { properties?: unknown }).properties;
  if (props === null || typeof props !== 'object') return undefined;
  const name = (props as { name?: unknown }).name;
  return typeof name === 'string' ? name : undefined;
}

function idOf(feature: Record<string, unknown>, idProperty: string | undefined): string | null {
  const props = feature['properties'] as Record<string, unknown> | null | undefined;
  const candidates = [idProperty ? props?.[idProperty] : undefined, feature['id'], props?.['id'], props?.['@id']];
  for (const c of candidates) if (typeof c === 'string' || typeof c === 'number') return String(c);
  return null;
}

/**
 * Checks the envelope and returns the features; throws `unreadableFile` for anything that is
 * not a FeatureCollection and `wrongCrs` for a declared non-WGS84 CRS.
 */
export function readFeatureCollection(input: unknown, what: string, idProperty?: string): RawFeature[] {
  if (input === null || typeof input !== 'object' || (input as { type?: unknown }).type !== 'FeatureCollection') {
    throw new RoadImportError('unreadableFile', `${what}: expected a GeoJSON FeatureCollection`);
  }
  const fc = input as { crs?: unknown; features?: unknown };
  if (fc.crs !== undefined && fc.crs !== null) {
    const name = crsName(fc.crs);
    if (name === undefined || !WGS84_NAMES.has(name.toLowerCase())) {
      throw new RoadImportError(
        'wrongCrs',
        `${what}: the file declares the coordinate reference system ${name === undefined ? preview(fc.crs) : preview(name)}; ` +
          'coordinates must be WGS84 longitude/latitude (EPSG:4326, as RFC 7946 requires). Reproject the file and upload it again.',
      );
    }
  }
  if (!Array.isArray(fc.features)) throw new RoadImportError('unreadableFile', `${what}: "features" must be an array`);
  return fc.features.map((f: unknown, index) => {
    const feature = (f !== null && typeof f === 'object' ? f : {}) as Record<string, unknown>;
    const props = feature['properties'];
    return {
      index,
      id: idOf(feature, idProperty),
      geometry: feature['type'] === 'Feature' ? feature['geometry'] : { notAFeature: true },
      properties: props !== null && typeof props === 'object' && !Array.isArray(props) ? (props as Record<string, unknown>) : {},
    };
  });
}

export type PositionProblem = 'notAPosition' | 'outOfRange';

/** One [lon, lat(, elevation)] position, or what is wrong with it. */
export function readPosition(p: unknown): LonLat | PositionProblem {
  if (!Array.isArray(p) || p.length < 2 || p.length > 4) return 'notAPosition';
  const lon = p[0];
  const lat = p[1];
  if (typeof lon !== 'number' || typeof lat !== 'number' || !Number.isFinite(lon) || !Number.isFinite(lat)) return 'notAPosition';
  if (lon < -180 || lon > 180 || lat < -90 || lat > 90) return 'outOfRange';
  return [lon, lat];
}

/**
 * Fails the import when features are bad. If most of them are bad only because positions
 * are out of longitude/latitude range, the file is almost surely in a projected CRS without
 * saying so: tell the planner that rather than listing every feature.
 */
export function failOnBadFeatures(what: string, bad: BadFeature[], outOfRange: number, total: number): void {
  if (bad.length === 0) return;
  if (outOfRange > 0 && outOfRange >= total / 2) {
    throw new RoadImportError(
      'wrongCrs',
      `${what}: ${outOfRange} of ${total} features have coordinates outside longitude −180…180 / latitude −90…90; ` +
        'the file looks like it is in a projected coordinate system (metres or feet). Reproject it to WGS84 (EPSG:4326).',
      bad,
    );
  }
  throw new RoadImportError('badFeatures', `${what}: ${bad.length} feature${bad.length === 1 ? ' is' : 's are'} malformed; nothing was imported`, bad);
}

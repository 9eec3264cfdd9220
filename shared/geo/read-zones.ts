// Zone uploads: GeoJSON polygons with their attributes in properties. Every bad feature is
// listed; one bad feature fails the upload.
import type { MultiPolygon, Polygon } from 'geojson';
import { zoneAttributesSchema, type DepartureCurve, type ZoneAttributes } from '../api/zone-shelter-attributes';
import { type BadFeature } from '../api/road-import';
import { ZONE_DEFAULTS } from '../model/zone-defaults';
import { issueMessage } from '../api/issue-message';
import { failOnBadFeatures, geometryTypeName, preview, readFeatureCollection, readPosition, type RawFeature } from './check-feature-collection';
import { RoadImportError } from './road-import-error';

export interface ZoneFeature {
  index: number;
  id: string | null;
  attributes: ZoneAttributes;
  geometry: Polygon | MultiPolygon;
  /** Attributes that were missing and took ZONE_DEFAULTS. */
  defaulted: ('participationRate' | 'personsPerVehicle' | 'departureCurve')[];
}

export function numeric(v: unknown): unknown {
  if (typeof v === 'string' && /^\s*-?\d+(\.\d+)?\s*$/.test(v)) return Number(v);
  return v;
}

export function present(v: unknown): boolean {
  return v !== undefined && v !== null && v !== '';
}

/** A name as given (GIS tables often hold numbers there); anything else is left for the schema to refuse. */
export function nameOf(v: unknown, fallback: string): unknown {
  if (!present(v)) return fallback;
  return typeof v === 'number' ? String(v) : v;
}

function curveFrom(p: Record<string, unknown>): unknown {
  let curve = p['departureCurve'];
  if (typeof curve === 'string') {
    try {
      curve = JSON.parse(curve);
    } catch {
      return curve;
    }
  }
  if (present(curve)) return curve;
  const kind = p['departure'];
  // A file Cutline wrote holds the whole curve as JSON text in `departure` (a Shapefile's .dbf
  // allows no longer column name).
  if (typeof kind === 'string' && kind.trimStart().startsWith('{')) {
    try {
      return JSON.parse(kind);
    } catch {
      return kind;
    }
  }
  if (!present(kind)) return undefined;
  return {
    kind,
    ...(present(p['durationHours']) ? { durationHours: numeric(p['durationHours']) } : {}),
    ...(present(p['responseRatePerHour']) ? { responseRatePerHour: numeric(p['responseRatePerHour']) } : {}),
    ...(present(p['halfLoadingHours']) ? { halfLoadingHours: numeric(p['halfLoadingHours']) } : {}),
    ...(present(p['sigmaHours']) ? { sigmaHours: numeric(p['sigmaHours']) } : {}),
  };
}

export function issues(error: { issues: { path: PropertyKey[]; code?: string; message: string }[] }): string {
  return error.issues.map((i) => `${i.path.map(String).join('.') || 'value'}: ${issueMessage(i)}`).join('; ');
}

function checkRings(rings: unknown, where: string): string | null {
  if (!Array.isArray(rings) || rings.length === 0) return `${where}has no rings`;
  for (const [ri, ring] of rings.entries()) {
    if (!Array.isArray(ring) || ring.length < 4) return `${where}ring ${ri} needs at least four positions`;
    for (const p of ring) {
      const pos = readPosition(p);
      if (typeof pos === 'string') return `${where}ring ${ri} has a bad position ${preview(p)}`;
    }
    const a = ring[0] as number[];
    const b = ring[ring.length - 1] as number[];
    if (a[0] !== b[0] || a[1] !== b[1]) return `${where}ring ${ri} is not closed`;
  }
  return null;
}

/** The geometry with [longitude, latitude] positions: elevations, which zones do not use, dropped. */
function flat(g: Polygon | MultiPolygon): Polygon | MultiPolygon {
  const ring = (r: number[][]) => r.map((p) => [p[0]!, p[1]!]);
  return g.type === 'Polygon' ? { type: 'Polygon', coordinates: g.coordinates.map(ring) } : { type: 'MultiPolygon', coordinates: g.coordinates.map((poly) => poly.map(ring)) };
}

function readZone(f: RawFeature): ZoneFeature | string {
  const g = f.geometry as { type?: unknown; coordinates?: unknown } | null;
  if (!g || (g.type !== 'Polygon' && g.type !== 'MultiPolygon')) return `a zone must be a Polygon or MultiPolygon, not ${geometryTypeName(g)}`;
  const problem =
    g.type === 'Polygon'
      ? checkRings(g.coordinates, '')
      : !Array.isArray(g.coordinates) || g.coordinates.length === 0
        ? 'MultiPolygon has no polygons'
        : (g.coordinates as unknown[]).map((poly, i) => checkRings(poly, `polygon ${i}, `)).find((x) => x !== null) ?? null;
  if (problem) return problem;
  const p = f.properties;
  const defaulted: ZoneFeature['defaulted'] = [];
  const pick = <K extends ZoneFeature['defaulted'][number]>(key: K, value: unknown, fallback: unknown) => {
    if (present(value)) return value;
    defaulted.push(key);
    return fallback;
  };
  const curve = curveFrom(p);
  const parsed = zoneAttributesSchema.safeParse({
    name: nameOf(p['name'], f.id ?? `Zone ${f.index + 1}`),
    population: numeric(p['population']),
    participationRate: numeric(pick('participationRate', p['participationRate'], ZONE_DEFAULTS.participationRate)),
    personsPerVehicle: numeric(pick('personsPerVehicle', p['personsPerVehicle'], ZONE_DEFAULTS.personsPerVehicle)),
    departureCurve: pick('departureCurve', curve, ZONE_DEFAULTS.departureCurve) as DepartureCurve,
  });
  if (!parsed.success) return issues(parsed.error);
  return { index: f.index, id: f.id, attributes: parsed.data, geometry: flat(g as Polygon | MultiPolygon), defaulted };
}

/**
 * Zones from GeoJSON. Properties: name, population (required), participationRate (0–1),
 * personsPerVehicle, and the departure curve either as `departureCurve` (an object or its
 * JSON text, see departureCurveSchema; or as that JSON text in `departure`) or flat: `departure` = allAtOnce | uniform | logistic
 * | rayleigh with durationHours / responseRatePerHour + halfLoadingHours / sigmaHours.
 * @throws RoadImportError `unreadableFile` | `wrongCrs` | `badFeatures`
 */
export function readZones(input: unknown): ZoneFeature[] {
  const features = readFeatureCollection(input, 'Zones');
  if (features.length === 0) throw new RoadImportError('unreadableFile', 'Zones: the file has no features; nothing was imported');
  const bad: BadFeature[] = [];
  const zones: ZoneFeature[] = [];
  for (const f of features) {
    const z = readZone(f);
    if (typeof z === 'string') bad.push({ index: f.index, id: f.id, problem: z });
    else zones.push(z);
  }
  failOnBadFeatures('Zones', bad, 0, features.length);
  return zones;
}

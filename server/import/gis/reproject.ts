// Features in a source CRS → WGS84 longitude/latitude, and the extent of what a file holds
// (to tell a projected file from a geographic one). Positions that do not transform to a
// finite longitude/latitude are the feature's problem, listed, never silently kept.
import type { Feature, FeatureCollection, Geometry, Position } from 'geojson';
import type { BadFeature } from '../../../shared/api/road-import';
import type { CrsTransform, Extent } from './crs';

type Walk = (p: Position) => Position;

function mapGeometry(g: Geometry, f: Walk): Geometry {
  switch (g.type) {
    case 'Point':
      return { type: 'Point', coordinates: f(g.coordinates) };
    case 'MultiPoint':
      return { type: 'MultiPoint', coordinates: g.coordinates.map(f) };
    case 'LineString':
      return { type: 'LineString', coordinates: g.coordinates.map(f) };
    case 'MultiLineString':
      return { type: 'MultiLineString', coordinates: g.coordinates.map((l) => l.map(f)) };
    case 'Polygon':
      return { type: 'Polygon', coordinates: g.coordinates.map((r) => r.map(f)) };
    case 'MultiPolygon':
      return { type: 'MultiPolygon', coordinates: g.coordinates.map((p) => p.map((r) => r.map(f))) };
    case 'GeometryCollection':
      return { type: 'GeometryCollection', geometries: g.geometries.map((x) => mapGeometry(x, f)) };
    default:
      // Not a GeoJSON geometry: left as it is for the feature readers to name.
      return g;
  }
}

/** The extent of every numeric position in the collection, or null when there is none. */
export function extentOf(collection: FeatureCollection): Extent | null {
  const e: Extent = [Infinity, Infinity, -Infinity, -Infinity];
  const visit = (p: Position) => {
    const [x, y] = p;
    if (typeof x === 'number' && typeof y === 'number' && Number.isFinite(x) && Number.isFinite(y)) {
      if (x < e[0]) e[0] = x;
      if (y < e[1]) e[1] = y;
      if (x > e[2]) e[2] = x;
      if (y > e[3]) e[3] = y;
    }
    return p;
  };
  for (const feature of collection.features) {
    if (feature?.geometry && typeof feature.geometry === 'object') {
      try {
        mapGeometry(feature.geometry, visit);
      } catch {
        // Malformed geometry: the feature readers list it with its problem.
      }
    }
  }
  return e[0] === Infinity ? null : e;
}

/**
 * Far enough outside longitude/latitude to be a projected coordinate (metres or feet), not a
 * longitude a rounding error past 180° (which is a bad feature to name, not a CRS question).
 */
export function farOutsideLonLat(x: number, y: number): boolean {
  return Math.abs(x) > 360 || Math.abs(y) > 180;
}

/**
 * Of the features with positions, how many have one far outside longitude/latitude range. A
 * file where most do is in a projected CRS; one where a few do has bad features to list.
 */
export function outOfRangeShare(collection: FeatureCollection): number {
  let withPositions = 0;
  let outside = 0;
  for (const feature of collection.features) {
    if (!feature?.geometry || typeof feature.geometry !== 'object') continue;
    let any = false;
    let out = false;
    try {
      mapGeometry(feature.geometry, (p) => {
        const [x, y] = p;
        if (typeof x === 'number' && typeof y === 'number') {
          any = true;
          if (farOutsideLonLat(x, y)) out = true;
        }
        return p;
      });
    } catch {
      continue;
    }
    if (any) withPositions += 1;
    if (out) outside += 1;
  }
  return withPositions === 0 ? 0 : outside / withPositions;
}

class Unprojectable extends Error {}

/**
 * Reprojects every feature. Features whose positions do not transform are left out and listed.
 * Elevations are dropped: the network is two-dimensional and layers come from attributes.
 */
export function reprojectCollection(collection: FeatureCollection, transform: CrsTransform): { collection: FeatureCollection; problems: BadFeature[] } {
  const toWgs84 = transform.toWgs84;
  if (!toWgs84) return { collection, problems: [] };
  const problems: BadFeature[] = [];
  const features: Feature[] = [];
  const f: Walk = (p) => {
    const [x, y] = p;
    if (typeof x !== 'number' || typeof y !== 'number') throw new Unprojectable(`position ${JSON.stringify(p).slice(0, 60)} is not two numbers`);
    const [lon, lat] = toWgs84(x, y);
    if (!Number.isFinite(lon) || !Number.isFinite(lat) || Math.abs(lon) > 180 || Math.abs(lat) > 90) {
      throw new Unprojectable(`position [${x}, ${y}] does not fall on the earth in ${transform.crs.name}`);
    }
    return [lon, lat];
  };
  for (const [index, feature] of collection.features.entries()) {
    if (!feature?.geometry) {
      features.push(feature);
      continue;
    }
    try {
      features.push({ ...feature, geometry: mapGeometry(feature.geometry, f) });
    } catch (error) {
      const id = feature.id ?? null;
      problems.push({ index, id: id === null ? null : String(id), problem: error instanceof Unprojectable ? error.message : 'the geometry cannot be reprojected' });
      features.push({ ...feature, geometry: null as unknown as Geometry });
    }
  }
  return { collection: { type: 'FeatureCollection', features }, problems };
}

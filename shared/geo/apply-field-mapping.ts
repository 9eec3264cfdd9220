// A planner's column choices → the property names the zone and shelter readers read, and
// zones given as points in a CSV table (neighbourhood centres with a population) → small squares,
// so that one zone reader serves both. Pure.
import type { Feature, FeatureCollection } from 'geojson';
import type { ShelterFieldMapping, ZoneFieldMapping } from '../api/road-import';

/** Half the side of the square a point zone becomes, degrees of latitude (about 11 m): small
 *  enough to hold no road node, so the zone attaches to the nearest one. */
export const POINT_ZONE_HALF_SIDE_DEGREES = 0.0001;

function renamed(collection: FeatureCollection, mapping: Record<string, string | undefined>, convert: (key: string, value: unknown) => unknown = (_k, v) => v): FeatureCollection {
  const entries = Object.entries(mapping).filter((e): e is [string, string] => typeof e[1] === 'string');
  if (entries.length === 0) return collection;
  return {
    type: 'FeatureCollection',
    features: collection.features.map((f) => {
      // Not a feature at all: left for the reader to name.
      if (f === null || typeof f !== 'object') return f;
      const p: Record<string, unknown> = { ...(f.properties ?? {}) };
      for (const [key, column] of entries) p[key] = convert(key, (f.properties ?? {})[column]);
      return { ...f, properties: p };
    }),
  };
}

/** A participation above 1 was written as a percentage (county tables often do). */
function participation(key: string, value: unknown): unknown {
  if (key !== 'participationRate') return value;
  const n = typeof value === 'number' ? value : typeof value === 'string' && value.trim() !== '' ? Number(value.replace('%', '')) : NaN;
  return Number.isFinite(n) && n > 1 && n <= 100 ? n / 100 : value;
}

/** @param pointsAreZones a table of points (CSV) gives zones as points; elsewhere a point is no zone. */
export function applyZoneFields(collection: FeatureCollection, mapping: ZoneFieldMapping = {}, pointsAreZones = false): FeatureCollection {
  const mapped = renamed(collection, mapping, participation);
  if (!pointsAreZones) return mapped;
  return {
    type: 'FeatureCollection',
    features: mapped.features.map((f): Feature => {
      if (f?.geometry?.type !== 'Point') return f;
      const [lon, lat] = f.geometry.coordinates as [number, number];
      const dy = POINT_ZONE_HALF_SIDE_DEGREES;
      const dx = dy / Math.max(0.01, Math.cos((lat * Math.PI) / 180));
      const ring = [
        [lon - dx, lat - dy],
        [lon + dx, lat - dy],
        [lon + dx, lat + dy],
        [lon - dx, lat + dy],
        [lon - dx, lat - dy],
      ];
      return { ...f, geometry: { type: 'Polygon', coordinates: [ring] } };
    }),
  };
}

export function applyShelterFields(collection: FeatureCollection, mapping: ShelterFieldMapping = {}): FeatureCollection {
  return renamed(collection, mapping);
}

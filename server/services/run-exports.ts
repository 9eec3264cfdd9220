// A run's arcs as GeoJSON: each directed road with its flow, utilisation and cut flag, on the
// geometry of the layer the run read (kept even after a newer layer replaced it).
import { sql } from 'drizzle-orm';
import type { Database } from '../db/client';
import type { RunResult } from '../../shared/api/runs';

export async function arcsGeoJson(db: Database, layerId: number | null, result: RunResult) {
  const geometry = new Map<number, [number, number][]>();
  if (layerId !== null) {
    const rows = await db.execute<{ id: number; g: string }>(sql`SELECT id, ST_AsGeoJSON(geom, 7) AS g FROM road_segments WHERE layer_id = ${layerId}`);
    for (const r of rows.rows) geometry.set(Number(r.id), JSON.parse(r.g).coordinates);
  }
  return {
    type: 'FeatureCollection' as const,
    features: result.arcs.map((a) => {
      const coordinates = geometry.get(a.segmentId) ?? [];
      return {
        type: 'Feature' as const,
        geometry: { type: 'LineString' as const, coordinates: a.direction === 'forward' ? coordinates : [...coordinates].reverse() },
        properties: { ...a },
      };
    }),
  };
}

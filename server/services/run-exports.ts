// A run's arcs as GeoJSON: each directed road with its flow, utilisation and cut flag (and the
// road's share of the time-expanded cut and minutes in it), on the
// geometry of the layer the run read (kept even after a newer layer replaced it). The figures
// come from the run's per-road rows (run_road_results), name and class from the layer.
import { sql } from 'drizzle-orm';
import type { Database } from '../db/client';
import { roadResultsOf } from './road-results';

export async function arcsGeoJson(db: Database, layerId: number | null, runId: string) {
  const segments = new Map<number, { coordinates: [number, number][]; name: string; roadClass: string }>();
  if (layerId !== null) {
    const rows = await db.execute<{ id: number; g: string; name: string | null; road_class: string }>(
      sql`SELECT id, ST_AsGeoJSON(geom, 7) AS g, name, road_class FROM road_segments WHERE layer_id = ${layerId}`,
    );
    for (const r of rows.rows) segments.set(Number(r.id), { coordinates: JSON.parse(r.g).coordinates, name: r.name ?? '', roadClass: r.road_class });
  }
  const features = [];
  for (const road of await roadResultsOf(db, runId)) {
    const segment = segments.get(road.segmentId);
    const coordinates = segment?.coordinates ?? [];
    for (const direction of ['forward', 'backward'] as const) {
      const load = road[direction];
      if (!load) continue;
      features.push({
        type: 'Feature' as const,
        geometry: { type: 'LineString' as const, coordinates: direction === 'forward' ? coordinates : [...coordinates].reverse() },
        // The road's share of the time-expanded cut and its minutes in it cover both directions, as on the map.
        properties: { segmentId: road.segmentId, direction, name: segment?.name ?? '', roadClass: segment?.roadClass ?? '', ...load, roadShareOfCut: road.shareOfCut, roadLimitingMinutes: road.limitingMinutes },
      });
    }
  }
  return { type: 'FeatureCollection' as const, features };
}

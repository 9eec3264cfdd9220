// Vector tiles of a road layer, and of a run's figures on its layer, written by PostGIS
// (ST_AsMVTGeom clips and quantises to the tile grid, ST_AsMVT encodes): the map asks for what
// is on screen, a tile at a time, and never holds a list of every road. Below the zoom at which
// a road class shows, that class is left out (shared/api/map-tiles.ts).
import { and, eq, sql } from 'drizzle-orm';
import type { Database } from '../db/client';
import { plans, runs } from '../db/schema';
import { NotFoundError } from '../errors';
import { assertPlanInOrganization } from './plan-access';
import { loadedRoadsMinZoom, roadClassMinZoom, roadTileLayer, tileExtent, type TileAddress } from '../../shared/api/map-tiles';

/** Web-Mercator metres per tile unit at zoom z: the world is 2·π·6378137 m wide. */
const unitMeters = (z: number) => (2 * Math.PI * 6378137) / 2 ** z / tileExtent;
// Room around each tile so that lines crossing its edge join without a seam.
const bufferUnits = 64;

const classMinZoom = sql.raw(
  `CASE s.road_class ${Object.entries(roadClassMinZoom)
    .map(([c, z]) => `WHEN '${c}' THEN ${z}`)
    .join(' ')} ELSE 0 END`,
);

/** The tile's bytes (possibly empty): the layer's roads, with the run's figures when `runId` is given. */
export async function roadTile(db: Database, layerId: number, tile: Pick<TileAddress, 'z' | 'x' | 'y'>, runId: string | null = null): Promise<Buffer> {
  const { z, x, y } = tile;
  // Half a tile unit: what simplification removes cannot be seen at this zoom.
  const tolerance = unitMeters(z) / 2;
  const margin = bufferUnits / tileExtent;
  const figures =
    runId === null
      ? sql``
      : sql`, coalesce(r.utilisation, 0) AS utilisation, coalesce(r.cut_forward OR r.cut_backward, false) AS "inCut", coalesce(r.share_of_cut, 0) AS "shareOfCut"`;
  const join = runId === null ? sql`` : sql`LEFT JOIN run_road_results r ON r.run_id = ${runId}::uuid AND r.segment_id = s.id`;
  const shown =
    runId === null
      ? sql`${classMinZoom} <= ${z}::int`
      : sql`(${classMinZoom} <= ${z} OR (${z}::int >= ${loadedRoadsMinZoom}::int AND r.utilisation > 0) OR r.cut_forward OR r.cut_backward OR r.share_of_cut > 0)`;
  const { rows } = await db.execute<{ tile: Buffer | null }>(sql`
    WITH bounds AS (
      SELECT ST_TileEnvelope(${z}, ${x}, ${y}) AS env, ST_Transform(ST_TileEnvelope(${z}, ${x}, ${y}, margin => ${margin}), 4326) AS lonlat
    )
    SELECT ST_AsMVT(t, ${roadTileLayer}, ${tileExtent}, 'geom') AS tile FROM (
      SELECT s.id::integer AS id, s.road_class AS "roadClass", s.lanes_forward AS "lanesForward", s.lanes_backward AS "lanesBackward",
             s.oneway, s.closed, s.name ${figures},
             ST_AsMVTGeom(ST_Simplify(ST_Transform(s.geom, 3857), ${tolerance}), b.env, ${tileExtent}, ${bufferUnits}, true) AS geom
      FROM road_segments s CROSS JOIN bounds b ${join}
      WHERE s.layer_id = ${layerId} AND s.geom && b.lonlat AND ${shown}
    ) t WHERE t.geom IS NOT NULL`);
  return rows[0]?.tile ?? Buffer.alloc(0);
}

/** What names a run's tiles: its layer, and the plan's data version (closures edited since show). */
export async function runMapVersion(db: Database, organizationId: string, planId: string, runId: string): Promise<{ layerId: number | null; dataVersion: number; status: string }> {
  const [row] = await db
    .select({ layerId: runs.roadLayerId, dataVersion: plans.dataVersion, status: runs.status })
    .from(runs)
    .innerJoin(plans, eq(plans.id, runs.planId))
    .where(and(eq(runs.id, runId), eq(runs.planId, planId), eq(plans.organizationId, organizationId)));
  if (!row) {
    await assertPlanInOrganization(db, organizationId, planId);
    throw new NotFoundError('run');
  }
  return row;
}

/** Geometry of a few segments of one layer, [lon, lat] in stored direction. */
export async function segmentGeometry(db: Database, layerId: number, ids: readonly number[]): Promise<{ id: number; coordinates: [number, number][] }[]> {
  if (ids.length === 0) return [];
  const { rows } = await db.execute<{ id: string | number; g: string }>(
    sql`SELECT id, ST_AsGeoJSON(geom, 6) AS g FROM road_segments WHERE layer_id = ${layerId} AND id = ANY(${`{${ids.join(',')}}`}::bigint[])`,
  );
  return rows.map((r) => ({ id: Number(r.id), coordinates: JSON.parse(r.g).coordinates }));
}

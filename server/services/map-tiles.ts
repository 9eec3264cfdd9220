// Vector tiles of a road layer, and of a run's figures on its layer, written by PostGIS
// (ST_AsMVTGeom clips and quantises to the tile grid, ST_AsMVT encodes): the map asks for what
// is on screen, a tile at a time, and never holds a list of every road. Below the zoom at which
// a road class shows, that class is left out (shared/api/map-tiles.ts).
import { and, eq, sql } from 'drizzle-orm';
import type { Database, Tx } from '../db/client';
import { plans, roadSegments, runs, runTiles } from '../db/schema';
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
export async function roadTile(db: Database | Tx, layerId: number, tile: Pick<TileAddress, 'z' | 'x' | 'y'>, runId: string | null = null): Promise<Buffer> {
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

/**
 * The zooms whose run tiles are kept in PostgreSQL (run_tiles): those at which a map shows a whole
 * plan. Such a tile holds every road of the shown classes over kilometres and takes seconds to
 * build; there are few of them (about 20 for a 30 km county at zooms 0–11). Deeper tiles are
 * small and quick, and kept only in each process's answer cache.
 */
export const storedRunTileMaxZoom = 12;

/**
 * A run's tile: read from run_tiles when kept there, else built. A finished run's tile at the
 * stored zooms is kept once built (the worker draws them before it marks the run finished, so
 * this is only for one it left out); an unfinished run's tile has no figures yet and is never kept.
 */
export async function runTile(db: Database, runId: string, layerId: number, dataVersion: number, tile: Pick<TileAddress, 'z' | 'x' | 'y'>, finished = true): Promise<Buffer> {
  if (tile.z > storedRunTileMaxZoom || !finished) return roadTile(db, layerId, tile, runId);
  const key = and(
    eq(runTiles.runId, runId),
    eq(runTiles.dataVersion, dataVersion),
    eq(runTiles.layerId, layerId),
    eq(runTiles.z, tile.z),
    eq(runTiles.x, tile.x),
    eq(runTiles.y, tile.y),
  );
  const [kept] = await db.select({ tile: runTiles.tile }).from(runTiles).where(key);
  if (kept) return kept.tile;
  const built = await roadTile(db, layerId, tile, runId);
  await db.insert(runTiles).values({ runId, dataVersion, layerId, z: tile.z, x: tile.x, y: tile.y, tile: built }).onConflictDoNothing();
  return built;
}

// Web-map tile of a point (the XYZ scheme of web maps on spherical Mercator; common practice).
function tileOf(lon: number, lat: number, z: number): [number, number] {
  const n = 2 ** z;
  const clampedLat = Math.max(-85.0511, Math.min(85.0511, lat));
  const r = (clampedLat * Math.PI) / 180;
  const x = Math.floor(((lon + 180) / 360) * n);
  const y = Math.floor(((1 - Math.log(Math.tan(r) + 1 / Math.cos(r)) / Math.PI) / 2) * n);
  return [Math.min(n - 1, Math.max(0, x)), Math.min(n - 1, Math.max(0, y))];
}

/** The tiles at zoom z that cover a lon/lat box. */
export function tilesCovering(box: { west: number; south: number; east: number; north: number }, z: number): { z: number; x: number; y: number }[] {
  const [x0, y0] = tileOf(box.west, box.north, z);
  const [x1, y1] = tileOf(box.east, box.south, z);
  const tiles: { z: number; x: number; y: number }[] = [];
  for (let x = x0; x <= x1; x++) for (let y = y0; y <= y1; y++) tiles.push({ z, x, y });
  return tiles;
}

/**
 * The tiles that show a run's whole layer: from zoom 0 up to storedRunTileMaxZoom while the layer
 * spans at most `maxTilesPerZoom` tiles (about 20 for a 30 km county).
 */
export async function overviewTiles(db: Database | Tx, layerId: number, maxTilesPerZoom = 64): Promise<{ z: number; x: number; y: number }[]> {
  const { rows } = await db.execute<{ west: number | null; south: number | null; east: number | null; north: number | null }>(
    sql`SELECT ST_XMin(e) AS west, ST_YMin(e) AS south, ST_XMax(e) AS east, ST_YMax(e) AS north FROM (SELECT ST_Extent(${roadSegments.geom}) AS e FROM ${roadSegments} WHERE ${roadSegments.layerId} = ${layerId}) x`,
  );
  const box = rows[0];
  if (!box || box.west === null || box.south === null || box.east === null || box.north === null) return [];
  const extent = { west: Number(box.west), south: Number(box.south), east: Number(box.east), north: Number(box.north) };
  const all: { z: number; x: number; y: number }[] = [];
  for (let z = 0; z <= storedRunTileMaxZoom; z++) {
    const tiles = tilesCovering(extent, z);
    if (tiles.length > maxTilesPerZoom) break;
    all.push(...tiles);
  }
  return all;
}

/**
 * Draws a run's whole-layer tiles (overviewTiles) and keeps them in run_tiles, so the map's first
 * view of a county reads stored bytes. The worker calls it as the run's last phase, inside the
 * transaction that stores the run's road figures and then marks it finished: no one sees the run
 * finished before its tiles are kept, and a cancel or a crash meanwhile leaves none behind.
 * `progress` hears each tile drawn (done, total) and may throw to stop. Returns the number drawn
 * (copied ones not counted).
 */
export async function drawRunOverviewTiles(
  tx: Database | Tx,
  runId: string,
  where: { layerId: number; dataVersion: number },
  progress: (done: number, total: number) => void | Promise<void> = () => undefined,
  // A run that reuses another's result takes that run's tiles of the same layer and data version
  // (the same figures on the same roads) and draws only what they lack.
  copyFrom: string | null = null,
): Promise<number> {
  const tiles = await overviewTiles(tx, where.layerId);
  const kept = new Set<string>();
  if (copyFrom !== null) {
    const { rows } = await tx.execute<{ z: number; x: number; y: number }>(sql`
      INSERT INTO run_tiles (run_id, data_version, layer_id, z, x, y, tile)
      SELECT ${runId}::uuid, data_version, layer_id, z, x, y, tile FROM run_tiles
      WHERE run_id = ${copyFrom}::uuid AND layer_id = ${where.layerId} AND data_version = ${where.dataVersion}
      ON CONFLICT DO NOTHING RETURNING z, x, y`);
    for (const t of rows) kept.add(`${t.z}/${t.x}/${t.y}`);
  }
  let drawn = 0;
  for (const tile of tiles) {
    if (kept.has(`${tile.z}/${tile.x}/${tile.y}`)) continue;
    const built = await roadTile(tx, where.layerId, tile, runId);
    await tx
      .insert(runTiles)
      .values({ runId, dataVersion: where.dataVersion, layerId: where.layerId, ...tile, tile: built })
      .onConflictDoUpdate({ target: [runTiles.runId, runTiles.dataVersion, runTiles.layerId, runTiles.z, runTiles.x, runTiles.y], set: { tile: built } });
    drawn += 1;
    await progress(drawn, tiles.length);
  }
  return drawn;
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

// The map's data by tile and by road, so that no screen asks for a whole layer or a whole
// result: vector tiles of the road layer (kept ready per data version) and of a run's figures
// (per run and data version), one road's figures in a run, and the geometry of a few roads.
import { Router } from 'express';
import { z } from 'zod';
import { runTileParamsSchema, segmentGeometryQuerySchema, tileParamsSchema } from '../../shared/api/map-tiles';
import { planParamsSchema } from '../../shared/api/plans';
import type { Database } from '../db/client';
import { actorOf, requireMember } from '../middleware/require-member';
import { roadTile, runMapVersion, runTile, segmentGeometry } from '../services/map-tiles';
import { activeLayerVersion } from '../services/road-layers';
import { getRunRow } from '../services/runs';
import { roadResultOf } from '../services/road-results';
import type { AnswerCache } from '../http/answer-cache';

const mvt = 'application/vnd.mapbox-vector-tile';
const runParamsSchema = z.object({ planId: z.string().uuid('Not a valid identifier.'), runId: z.string().uuid('Not a valid identifier.') });
const runRoadParamsSchema = runParamsSchema.extend({ segmentId: z.coerce.number().int().positive() });

export function mapTilesRouter(db: Database, answers: AnswerCache): Router {
  const router = Router({ mergeParams: true });

  router.get('/tiles/roads/:z/:x/:y', requireMember('plans:read'), async (req, res) => {
    const tile = tileParamsSchema.parse(req.params);
    const { layerId, dataVersion } = await activeLayerVersion(db, actorOf(req).organizationId, tile.planId);
    const key = `tile roads ${tile.planId} ${layerId} ${dataVersion} ${tile.z}/${tile.x}/${tile.y}`;
    await answers.sendBytes(req, res, key, mvt, () => roadTile(db, layerId, tile));
  });

  router.get('/runs/:runId/tiles/:z/:x/:y', requireMember('plans:read'), async (req, res) => {
    const tile = runTileParamsSchema.parse(req.params);
    const { layerId, dataVersion, status } = await runMapVersion(db, actorOf(req).organizationId, tile.planId, tile.runId);
    // A run with no layer left (deleted) has an empty tile.
    if (layerId === null) {
      res.type(mvt).send(Buffer.alloc(0));
      return;
    }
    // The status is in the key: a tile asked for before the run finished has no figures.
    const finished = status === 'succeeded';
    const key = `tile run ${tile.runId} ${status} ${layerId} ${dataVersion} ${tile.z}/${tile.x}/${tile.y}`;
    await answers.sendBytes(req, res, key, mvt, () => runTile(db, tile.runId, layerId, dataVersion, tile, finished));
  });

  router.get('/runs/:runId/roads/:segmentId', requireMember('plans:read'), async (req, res) => {
    const { planId, runId, segmentId } = runRoadParamsSchema.parse(req.params);
    await runMapVersion(db, actorOf(req).organizationId, planId, runId);
    res.json({ road: await roadResultOf(db, runId, segmentId) });
  });

  // Choke points and fixes are few; their geometry comes in one small answer so the map can draw
  // and zoom to them wherever they are, without loading the roads around them.
  router.get('/runs/:runId/choke-point-geometry', requireMember('plans:read'), async (req, res) => {
    const { planId, runId } = runParamsSchema.parse(req.params);
    const row = await getRunRow(db, actorOf(req).organizationId, planId, runId);
    const ids = new Set<number>();
    for (const b of row.result?.bottlenecks ?? []) ids.add(b.segmentId);
    for (const f of row.result?.fixes ?? []) ids.add(f.segmentId);
    res.json({ segments: row.roadLayerId === null ? [] : await segmentGeometry(db, row.roadLayerId, [...ids]) });
  });

  router.get('/segment-geometry', requireMember('plans:read'), async (req, res) => {
    const { planId } = planParamsSchema.parse(req.params);
    const { ids } = segmentGeometryQuerySchema.parse(req.query);
    const { layerId } = await activeLayerVersion(db, actorOf(req).organizationId, planId);
    res.json({ segments: await segmentGeometry(db, layerId, ids) });
  });

  return router;
}

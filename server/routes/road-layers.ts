// /api/plans/:planId/road-layer and /segments: read for the map and table, edit; a file's
// schema for the mapping step. (Road files are imported as jobs: routes/imports.ts.)
import { Router } from 'express';
import { sourceReadOptionsSchema } from '../../shared/api/road-import';
import {
  segmentBulkUpdateSchema,
  segmentPageQuerySchema,
  segmentParamsSchema,
} from '../../shared/api/road-layers';
import { segmentAttributesPatchSchema } from '../../shared/api/road-attributes';
import { planParamsSchema } from '../../shared/api/plans';
import { RoadImportError } from '../../shared/geo/road-import-error';
import type { Config } from '../config';
import type { Database } from '../db/client';
import { ImportRefusedError } from '../errors';
import { readSchemaInWorker } from '../import/gis/read-schema-in-worker';
import { actorOf, requireMember } from '../middleware/require-member';
import { jsonField, singleFileUpload } from '../middleware/upload';
import { assertPlanInOrganization, planDataVersion } from '../services/plan-access';
import { activeLayerVersion, getActiveRoadLayer, getSegment, segmentPageOfLayer, updateSegments } from '../services/road-layers';
import type { AnswerCache } from '../http/answer-cache';

export function roadLayersRouter(db: Database, config: Config, answers: AnswerCache): Router {
  const router = Router({ mergeParams: true });

  // The layer's summary and extent (a pass over every segment) change only with the plan's data version.
  router.get('/road-layer', requireMember('plans:read'), async (req, res) => {
    const { planId } = planParamsSchema.parse(req.params);
    const { organizationId } = actorOf(req);
    const dataVersion = await planDataVersion(db, organizationId, planId);
    await answers.sendJson(req, res, `road-layer ${planId} ${dataVersion}`, async () => JSON.stringify({ layer: await getActiveRoadLayer(db, organizationId, planId) }));
  });

  // The field-mapping step: what a file holds (fields, samples, CRS, extent, first features), read
  // in a worker thread like the import itself. Nothing is saved.
  router.post('/file-schema', requireMember('plans:write'), singleFileUpload(config.UPLOAD_MAX_MEGABYTES), async (req, res) => {
    const { planId } = planParamsSchema.parse(req.params);
    await assertPlanInOrganization(db, actorOf(req).organizationId, planId);
    const source = sourceReadOptionsSchema.parse(jsonField(req.body?.source, 'source') ?? {});
    try {
      res.json(await readSchemaInWorker(req.file!.buffer, source, req.file!.originalname));
    } catch (e) {
      if (e instanceof RoadImportError) throw new ImportRefusedError(e.failure);
      throw e;
    }
  });

  // Everyone opening the road table first asks for the same page: keep each page ready per data version.
  router.get('/segments', requireMember('plans:read'), async (req, res) => {
    const { planId } = planParamsSchema.parse(req.params);
    const query = segmentPageQuerySchema.parse(req.query);
    const { layerId, dataVersion } = await activeLayerVersion(db, actorOf(req).organizationId, planId);
    const key = `segments ${planId} ${layerId} ${dataVersion} ${JSON.stringify(query)}`;
    await answers.sendJson(req, res, key, async () => JSON.stringify(await segmentPageOfLayer(db, layerId, query)));
  });

  router.get('/segments/:segmentId', requireMember('plans:read'), async (req, res) => {
    const { planId, segmentId } = segmentParamsSchema.parse(req.params);
    res.json(await getSegment(db, actorOf(req).organizationId, planId, segmentId));
  });

  router.patch('/segments/:segmentId', requireMember('plans:write'), async (req, res) => {
    const { planId, segmentId } = segmentParamsSchema.parse(req.params);
    const patch = segmentAttributesPatchSchema.parse(req.body);
    const [segment] = await updateSegments(db, actorOf(req), planId, segmentBulkUpdateSchema.parse({ ids: [segmentId], patch }));
    res.json(segment);
  });

  router.patch('/segments', requireMember('plans:write'), async (req, res) => {
    const { planId } = planParamsSchema.parse(req.params);
    const update = segmentBulkUpdateSchema.parse(req.body);
    const segments = await updateSegments(db, actorOf(req), planId, update);
    res.json({ updated: segments.length });
  });

  return router;
}

// /api/plans/:planId/imports/:kind (road-layer, zones, shelters): upload a file (202: stored and queued; a
// worker reads and saves it), read its progress, cancel it.
import { Router } from 'express';
import { importKindSchema, importParamsSchema } from '../../shared/api/imports';
import { importOptionsSchema, shelterUploadOptionsSchema, zoneUploadOptionsSchema } from '../../shared/api/road-import';
import { planParamsSchema } from '../../shared/api/plans';
import type { Config } from '../config';
import type { Database } from '../db/client';
import { actorOf, requireMember } from '../middleware/require-member';
import { jsonField, singleFileUpload } from '../middleware/upload';
import type { ImportEnqueuer } from '../queue/run-queue';
import { cancelImport, getImport, queueImport } from '../services/imports';

const kindParamsSchema = planParamsSchema.extend({ kind: importKindSchema });

export function importsRouter(db: Database, config: Config, queue: ImportEnqueuer): Router {
  const router = Router({ mergeParams: true });

  router.post('/imports/:kind', requireMember('plans:write'), singleFileUpload(config.UPLOAD_MAX_MEGABYTES), async (req, res) => {
    const { planId, kind } = kindParamsSchema.parse(req.params);
    // Each kind's options: a road layer's import options; for zones and shelters, how to read the
    // file and which columns mean what (the field-mapping step).
    const raw = jsonField(req.body?.options, 'options') ?? {};
    const options = kind === 'road-layer' ? importOptionsSchema.parse(raw) : kind === 'zones' ? zoneUploadOptionsSchema.parse(raw) : shelterUploadOptionsSchema.parse(raw);
    const name = typeof req.body?.name === 'string' && req.body.name.trim() ? req.body.name.trim().slice(0, 200) : undefined;
    const file = req.file!;
    res.status(202).json(await queueImport(db, queue, actorOf(req), planId, { kind, bytes: file.buffer, fileName: file.originalname, layerName: name, options }));
  });

  router.get('/imports/:importId', requireMember('plans:read'), async (req, res) => {
    const { planId, importId } = importParamsSchema.parse(req.params);
    res.json(await getImport(db, actorOf(req).organizationId, planId, importId));
  });

  router.post('/imports/:importId/cancel', requireMember('plans:write'), async (req, res) => {
    const { planId, importId } = importParamsSchema.parse(req.params);
    res.json(await cancelImport(db, actorOf(req), planId, importId));
  });

  return router;
}

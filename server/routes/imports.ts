// /api/plans/:planId/imports/:kind (road-layer, zones, shelters): upload a file (202 once it has
// arrived: stored as it arrives, then queued; a worker reads and saves it), read its progress, cancel it.
import { Router, type RequestHandler } from 'express';
import { importKindSchema, importParamsSchema } from '../../shared/api/imports';
import { importOptionsSchema, shelterUploadOptionsSchema, zoneUploadOptionsSchema } from '../../shared/api/road-import';
import { planParamsSchema } from '../../shared/api/plans';
import type { Config } from '../config';
import type { Database } from '../db/client';
import { actorOf, requireMember } from '../middleware/require-member';
import { jsonField } from '../middleware/upload';
import { streamedFileUpload, streamedUploadOf } from '../middleware/streamed-upload';
import type { ImportEnqueuer } from '../queue/run-queue';
import { cancelImport, getImport, queueImport } from '../services/imports';

const kindParamsSchema = planParamsSchema.extend({ kind: importKindSchema });

export function importsRouter(db: Database, config: Config, queue: ImportEnqueuer, log: (err: unknown) => void): Router {
  const router = Router({ mergeParams: true });

  // Beside the file: a road layer's name, and each kind's options.
  const knownKind: RequestHandler = (req, _res, next) => {
    kindParamsSchema.parse(req.params);
    next();
  };
  router.post('/imports/:kind', requireMember('plans:write'), knownKind, streamedFileUpload(config.UPLOAD_MAX_MEGABYTES, ['name', 'options']), async (req, res) => {
    const { planId, kind } = kindParamsSchema.parse(req.params);
    const upload = streamedUploadOf(res);
    // Fields sent before the file are checked before a byte is stored; later ones once it has arrived.
    // Each kind's options: a road layer's import options; for zones and shelters, how to read the
    // file and which columns mean what (the field-mapping step).
    const detailsOf = (fields: Record<string, string>) => {
      const raw = jsonField(fields.options, 'options') ?? {};
      const options = kind === 'road-layer' ? importOptionsSchema.parse(raw) : kind === 'zones' ? zoneUploadOptionsSchema.parse(raw) : shelterUploadOptionsSchema.parse(raw);
      return { options, layerName: fields.name?.trim() ? fields.name.trim().slice(0, 200) : undefined };
    };
    detailsOf(upload.fieldsBefore);
    const queued = await queueImport(db, queue, actorOf(req), planId, {
      kind,
      fileName: upload.fileName,
      pieces: upload.pieces,
      details: async () => detailsOf(await upload.fields()),
    }, log);
    res.status(202).json(queued);
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

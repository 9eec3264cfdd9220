// /api/mapping-presets: the organisation's saved field mappings. Everyone reads them (the upload
// dialog offers them); planners and administrators save and delete.
import { Router } from 'express';
import { mappingPresetCreateSchema, mappingPresetParamsSchema } from '../../shared/api/mapping-presets';
import { listCaps } from '../../shared/api/pagination';
import type { Database } from '../db/client';
import { pageOf, sendPage } from '../http/list-page';
import { actorOf, requireMember } from '../middleware/require-member';
import { deleteMappingPreset, listMappingPresets, saveMappingPreset } from '../services/mapping-presets';

export function mappingPresetsRouter(db: Database): Router {
  const router = Router();
  router.get('/', requireMember('plans:read'), async (req, res) => {
    const page = pageOf(req, listCaps.mappingPresets);
    sendPage(res, 'presets', await listMappingPresets(db, actorOf(req).organizationId, page), page);
  });
  router.post('/', requireMember('plans:write'), async (req, res) => {
    res.status(201).json(await saveMappingPreset(db, actorOf(req), mappingPresetCreateSchema.parse(req.body)));
  });
  router.delete('/:presetId', requireMember('plans:write'), async (req, res) => {
    const { presetId } = mappingPresetParamsSchema.parse(req.params);
    await deleteMappingPreset(db, actorOf(req), presetId);
    res.status(204).end();
  });
  return router;
}

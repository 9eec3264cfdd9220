// /api/settings/map: everyone signed in reads it (the map needs it); administrators change it.
import { Router } from 'express';
import { mapSettingsSchema } from '../../shared/api/settings';
import { actorOf, requireMember } from '../middleware/require-member';
import type { Settings } from '../services/settings';

export function settingsRouter(settings: Settings): Router {
  const router = Router();
  router.get('/map', requireMember(), async (_req, res) => {
    res.json(await settings.getMapSettings());
  });
  router.put('/map', requireMember('users:manage'), async (req, res) => {
    res.json(await settings.putMapSettings(actorOf(req), mapSettingsSchema.parse(req.body)));
  });
  return router;
}

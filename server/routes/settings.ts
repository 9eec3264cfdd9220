// /api/settings/map: everyone signed in reads their organization's (the map needs it);
// its administrators change it.
import { Router } from 'express';
import { mapSettingsSchema } from '../../shared/api/settings';
import { actorOf, requireMember } from '../middleware/require-member';
import type { Settings } from '../services/settings';

export function settingsRouter(settings: Settings): Router {
  const router = Router();
  router.get('/map', requireMember(), async (req, res) => {
    res.json(await settings.getMapSettings(actorOf(req).organizationId));
  });
  router.put('/map', requireMember('users:manage'), async (req, res) => {
    res.json(await settings.putMapSettings(actorOf(req), mapSettingsSchema.parse(req.body)));
  });
  return router;
}

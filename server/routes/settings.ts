// /api/settings/map and /api/settings/organization: everyone signed in reads their organization's
// (every screen needs them); its administrators change them.
import { Router } from 'express';
import { mapSettingsSchema, organizationSettingsInputSchema } from '../../shared/api/settings';
import type { Database } from '../db/client';
import { actorOf, requireMember } from '../middleware/require-member';
import { getOrganizationSettings, putOrganizationSettings } from '../services/organization-settings';
import type { Settings } from '../services/settings';

export function settingsRouter(settings: Settings, db: Database, defaultTimeZone: string): Router {
  const router = Router();
  // /api/settings/organization: the unit system and time zone every screen of it formats with.
  router.get('/organization', requireMember(), async (req, res) => {
    res.json(await getOrganizationSettings(db, actorOf(req).organizationId, defaultTimeZone));
  });
  router.put('/organization', requireMember('users:manage'), async (req, res) => {
    res.json(await putOrganizationSettings(db, actorOf(req), organizationSettingsInputSchema.parse(req.body), defaultTimeZone));
  });
  router.get('/map', requireMember(), async (req, res) => {
    res.json(await settings.getMapSettings(actorOf(req).organizationId));
  });
  router.put('/map', requireMember('users:manage'), async (req, res) => {
    res.json(await settings.putMapSettings(actorOf(req), mapSettingsSchema.parse(req.body)));
  });
  return router;
}

// /api/plans/:planId/zones, /shelters and /capacity-table (with its change history).
import { Router } from 'express';
import { capacityTableSchema } from '../../shared/api/capacity-table';
import { planParamsSchema } from '../../shared/api/plans';
import {
  shelterCreateSchema,
  shelterParamsSchema,
  shelterUpdateSchema,
  zoneCreateSchema,
  zoneParamsSchema,
  zoneUpdateSchema,
} from '../../shared/api/zones-shelters';
import type { Database } from '../db/client';
import { actorOf, requireMember } from '../middleware/require-member';
import { capacityTableHistory, getCapacityTable, putCapacityTable } from '../services/capacity-table';
import { describeAttachments, loadPlanModel } from '../services/plan-model';
import { listCaps } from '../../shared/api/pagination';
import { pageOf, sendPage } from '../http/list-page';
import {
  createShelters,
  createZones,
  deleteShelter,
  deleteZone,
  listShelters,
  listZones,
  updateShelter,
  updateZone,
} from '../services/zones-shelters';

export function zonesSheltersRouter(db: Database): Router {
  const router = Router({ mergeParams: true });

  router.get('/zones', requireMember('plans:read'), async (req, res) => {
    const { planId } = planParamsSchema.parse(req.params);
    const page = pageOf(req, listCaps.zones);
    sendPage(res, 'zones', await listZones(db, actorOf(req).organizationId, planId, page), page);
  });
  router.post('/zones', requireMember('plans:write'), async (req, res) => {
    const { planId } = planParamsSchema.parse(req.params);
    const input = zoneCreateSchema.parse(req.body);
    const [zone] = await createZones(db, actorOf(req), planId, [input], 'form');
    res.status(201).json(zone);
  });
  router.patch('/zones/:zoneId', requireMember('plans:write'), async (req, res) => {
    const { planId, zoneId } = zoneParamsSchema.parse(req.params);
    res.json(await updateZone(db, actorOf(req), planId, zoneId, zoneUpdateSchema.parse(req.body)));
  });
  router.delete('/zones/:zoneId', requireMember('plans:write'), async (req, res) => {
    const { planId, zoneId } = zoneParamsSchema.parse(req.params);
    await deleteZone(db, actorOf(req), planId, zoneId);
    res.status(204).end();
  });

  router.get('/shelters', requireMember('plans:read'), async (req, res) => {
    const { planId } = planParamsSchema.parse(req.params);
    const page = pageOf(req, listCaps.shelters);
    sendPage(res, 'shelters', await listShelters(db, actorOf(req).organizationId, planId, page), page);
  });
  router.post('/shelters', requireMember('plans:write'), async (req, res) => {
    const { planId } = planParamsSchema.parse(req.params);
    const [shelter] = await createShelters(db, actorOf(req), planId, [shelterCreateSchema.parse(req.body)], 'form');
    res.status(201).json(shelter);
  });
  router.patch('/shelters/:shelterId', requireMember('plans:write'), async (req, res) => {
    const { planId, shelterId } = shelterParamsSchema.parse(req.params);
    res.json(await updateShelter(db, actorOf(req), planId, shelterId, shelterUpdateSchema.parse(req.body)));
  });
  router.delete('/shelters/:shelterId', requireMember('plans:write'), async (req, res) => {
    const { planId, shelterId } = shelterParamsSchema.parse(req.params);
    await deleteShelter(db, actorOf(req), planId, shelterId);
    res.status(204).end();
  });

  router.get('/attachments', requireMember('plans:read'), async (req, res) => {
    const { planId } = planParamsSchema.parse(req.params);
    res.json(describeAttachments(await loadPlanModel(db, actorOf(req).organizationId, planId)));
  });

  router.get('/capacity-table', requireMember('plans:read'), async (req, res) => {
    const { planId } = planParamsSchema.parse(req.params);
    res.json(await getCapacityTable(db, actorOf(req).organizationId, planId));
  });
  router.put('/capacity-table', requireMember('plans:write'), async (req, res) => {
    const { planId } = planParamsSchema.parse(req.params);
    res.json(await putCapacityTable(db, actorOf(req), planId, capacityTableSchema.parse(req.body)));
  });
  // Who changed which value or source, when, from what to what: newest first.
  router.get('/capacity-table/history', requireMember('plans:read'), async (req, res) => {
    const { planId } = planParamsSchema.parse(req.params);
    const page = pageOf(req, listCaps.capacityTableHistory);
    sendPage(res, 'entries', await capacityTableHistory(db, actorOf(req).organizationId, planId, page), page);
  });

  return router;
}

// /api/plans
import { Router } from 'express';
import { idParamsSchema, planCreateSchema, planUpdateSchema } from '../../shared/api/plans';
import type { Database } from '../db/client';
import { actorOf, requireMember } from '../middleware/require-member';
import { createPlan, deletePlan, getPlan, listPlans, updatePlan } from '../services/plans';
import { listCaps } from '../../shared/api/pagination';
import { pageOf, sendPage } from '../http/list-page';

export function plansRouter(db: Database): Router {
  const router = Router();

  router.get('/', requireMember('plans:read'), async (req, res) => {
    const page = pageOf(req, listCaps.plans);
    sendPage(res, 'plans', await listPlans(db, actorOf(req).organizationId, page), page);
  });

  router.post('/', requireMember('plans:write'), async (req, res) => {
    const input = planCreateSchema.parse(req.body);
    res.status(201).json(await createPlan(db, actorOf(req), input));
  });

  router.get('/:id', requireMember('plans:read'), async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    res.json(await getPlan(db, actorOf(req).organizationId, id));
  });

  router.patch('/:id', requireMember('plans:write'), async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    const input = planUpdateSchema.parse(req.body);
    res.json(await updatePlan(db, actorOf(req), id, input));
  });

  router.delete('/:id', requireMember('plans:write'), async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    await deletePlan(db, actorOf(req), id);
    res.status(204).end();
  });

  return router;
}

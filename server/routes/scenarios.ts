// /api/plans/:planId/scenarios
import { Router } from 'express';
import { planParamsSchema } from '../../shared/api/plans';
import { scenarioCreateSchema, scenarioParamsSchema, scenarioUpdateSchema } from '../../shared/api/scenarios';
import type { Database } from '../db/client';
import { actorOf, requireMember } from '../middleware/require-member';
import { createScenario, deleteScenario, getScenario, listScenarios, updateScenario } from '../services/scenarios';
import { listCaps } from '../../shared/api/pagination';
import { pageOf, sendPage } from '../http/list-page';

export function scenariosRouter(db: Database): Router {
  const router = Router({ mergeParams: true });
  router.get('/scenarios', requireMember('plans:read'), async (req, res) => {
    const { planId } = planParamsSchema.parse(req.params);
    const page = pageOf(req, listCaps.scenarios);
    sendPage(res, 'scenarios', await listScenarios(db, actorOf(req).organizationId, planId, page), page);
  });
  router.post('/scenarios', requireMember('plans:write'), async (req, res) => {
    const { planId } = planParamsSchema.parse(req.params);
    res.status(201).json(await createScenario(db, actorOf(req), planId, scenarioCreateSchema.parse(req.body)));
  });
  router.get('/scenarios/:scenarioId', requireMember('plans:read'), async (req, res) => {
    const { planId, scenarioId } = scenarioParamsSchema.parse(req.params);
    res.json(await getScenario(db, actorOf(req).organizationId, planId, scenarioId));
  });
  router.patch('/scenarios/:scenarioId', requireMember('plans:write'), async (req, res) => {
    const { planId, scenarioId } = scenarioParamsSchema.parse(req.params);
    res.json(await updateScenario(db, actorOf(req), planId, scenarioId, scenarioUpdateSchema.parse(req.body)));
  });
  router.delete('/scenarios/:scenarioId', requireMember('plans:write'), async (req, res) => {
    const { planId, scenarioId } = scenarioParamsSchema.parse(req.params);
    await deleteScenario(db, actorOf(req), planId, scenarioId);
    res.status(204).end();
  });
  return router;
}

// /api/plans/:planId/sweeps: sweeps of one parameter, queued as many runs.
import { Router } from 'express';
import { z } from 'zod';
import { sweepCreateSchema } from '../../shared/api/sweeps';
import { planParamsSchema } from '../../shared/api/plans';
import type { Config } from '../config';
import type { Database } from '../db/client';
import { actorOf, requireMember } from '../middleware/require-member';
import { getSweep, listSweeps } from '../services/sweeps';
import { startRuns, sweepStart } from '../services/start-runs';
import type { RunEnqueuer } from '../queue/run-enqueuer';
import { listCaps } from '../../shared/api/pagination';
import { pageOf, sendPage } from '../http/list-page';

const sweepParamsSchema = z.object({ planId: z.string().uuid(), sweepId: z.string().uuid('Not a valid identifier.') });

export function sweepsRouter(db: Database, config: Config, queue: RunEnqueuer): Router {
  const router = Router({ mergeParams: true });
  router.post('/sweeps', requireMember('plans:write'), async (req, res) => {
    const { planId } = planParamsSchema.parse(req.params);
    const { sweepId } = await startRuns(db, queue, config, actorOf(req), planId, sweepStart(sweepCreateSchema.parse(req.body)));
    res.status(202).json(await getSweep(db, actorOf(req).organizationId, planId, sweepId!));
  });
  router.get('/sweeps', requireMember('plans:read'), async (req, res) => {
    const { planId } = planParamsSchema.parse(req.params);
    const page = pageOf(req, listCaps.sweeps);
    sendPage(res, 'sweeps', await listSweeps(db, actorOf(req).organizationId, planId, page), page);
  });
  router.get('/sweeps/:sweepId', requireMember('plans:read'), async (req, res) => {
    const { planId, sweepId } = sweepParamsSchema.parse(req.params);
    res.json(await getSweep(db, actorOf(req).organizationId, planId, sweepId));
  });
  return router;
}

// /api/plans/:planId/batches: sweeps of one parameter, queued as many runs.
import { Router } from 'express';
import { z } from 'zod';
import { batchCreateSchema } from '../../shared/api/sweeps';
import { planParamsSchema } from '../../shared/api/plans';
import type { Config } from '../config';
import type { Database } from '../db/client';
import { actorOf, requireMember } from '../middleware/require-member';
import { getBatch, listBatches } from '../services/sweeps';
import { startRuns, sweepStart } from '../services/start-runs';
import type { RunEnqueuer } from '../queue/run-enqueuer';
import { listCaps } from '../../shared/api/pagination';
import { pageOf, sendPage } from '../http/list-page';

const batchParamsSchema = z.object({ planId: z.string().uuid(), batchId: z.string().uuid('Not a valid identifier.') });

export function batchesRouter(db: Database, config: Config, queue: RunEnqueuer): Router {
  const router = Router({ mergeParams: true });
  router.post('/batches', requireMember('plans:write'), async (req, res) => {
    const { planId } = planParamsSchema.parse(req.params);
    const { batchId } = await startRuns(db, queue, config, actorOf(req), planId, sweepStart(batchCreateSchema.parse(req.body)));
    res.status(202).json(await getBatch(db, actorOf(req).organizationId, planId, batchId!));
  });
  router.get('/batches', requireMember('plans:read'), async (req, res) => {
    const { planId } = planParamsSchema.parse(req.params);
    const page = pageOf(req, listCaps.batches);
    sendPage(res, 'batches', await listBatches(db, actorOf(req).organizationId, planId, page), page);
  });
  router.get('/batches/:batchId', requireMember('plans:read'), async (req, res) => {
    const { planId, batchId } = batchParamsSchema.parse(req.params);
    res.json(await getBatch(db, actorOf(req).organizationId, planId, batchId));
  });
  return router;
}

// /api/plans/:planId/proposals: start a search for the best change (202, computed by a worker),
// list, poll, cancel, and save the answer as a scenario.
import { Router } from 'express';
import { runBudget } from '../run-execution/run-budget';
import { planParamsSchema } from '../../shared/api/plans';
import { proposalParamsSchema, proposalRequestSchema, saveProposalSchema } from '../../shared/api/proposals';
import { listCaps } from '../../shared/api/pagination';
import type { Config } from '../config';
import type { Database } from '../db/client';
import { actorOf, requireMember } from '../middleware/require-member';
import { assertRunQuota } from '../services/run-quota';
import { assertProposalQuota, cancelProposal, getProposalRow, listProposals, saveProposalAsScenario, startProposal, toProposal } from '../services/proposals';
import type { ProposalEnqueuer } from '../queue/proposal-queue';
import { pageOf, sendPage } from '../http/list-page';

export function proposalsRouter(db: Database, config: Config, queue: ProposalEnqueuer): Router {
  const router = Router({ mergeParams: true });

  router.post('/proposals', requireMember('plans:write'), async (req, res) => {
    const { planId } = planParamsSchema.parse(req.params);
    const request = proposalRequestSchema.parse(req.body);
    const actor = actorOf(req);
    // A search costs at least a run: the person's run limits apply, and searches have their own count.
    await assertRunQuota(db, actor, 1, config);
    await assertProposalQuota(db, actor, config.RUN_STARTS_PER_MINUTE);
    const row = await startProposal(db, actor, planId, request, runBudget(config));
    if (row.status === 'queued') await queue.enqueue(row.id);
    res.status(202).json(toProposal(row));
  });

  router.get('/proposals', requireMember('plans:read'), async (req, res) => {
    const { planId } = planParamsSchema.parse(req.params);
    const page = pageOf(req, listCaps.proposals);
    sendPage(res, 'proposals', await listProposals(db, actorOf(req).organizationId, planId, page), page);
  });

  router.get('/proposals/:proposalId', requireMember('plans:read'), async (req, res) => {
    const { planId, proposalId } = proposalParamsSchema.parse(req.params);
    res.json(toProposal(await getProposalRow(db, actorOf(req).organizationId, planId, proposalId)));
  });

  router.post('/proposals/:proposalId/cancel', requireMember('plans:write'), async (req, res) => {
    const { planId, proposalId } = proposalParamsSchema.parse(req.params);
    res.json(await cancelProposal(db, actorOf(req), planId, proposalId));
  });

  router.post('/proposals/:proposalId/scenario', requireMember('plans:write'), async (req, res) => {
    const { planId, proposalId } = proposalParamsSchema.parse(req.params);
    const body = saveProposalSchema.parse(req.body);
    res.status(201).json(await saveProposalAsScenario(db, actorOf(req), planId, proposalId, body));
  });

  return router;
}

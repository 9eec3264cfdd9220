// /api/plans/:planId/proposals: start a search for the best change (202, computed by a worker),
// list, poll, cancel, and save the answer as a scenario.
import { Router } from 'express';
import { runBudget } from '../run-execution/run-budget';
import { planParamsSchema } from '../../shared/api/plans';
import { proposalCaution, proposalParamsSchema, proposalRequestSchema, saveProposalSchema } from '../../shared/api/proposals';
import { planExportIdentity } from '../services/export-identity';
import { listCaps } from '../../shared/api/pagination';
import type { Config } from '../config';
import type { Database } from '../db/client';
import { actorOf, requireMember } from '../middleware/require-member';
import { assertRunQuota } from '../services/run-quota';
import { assertProposalQuota, cancelProposal, getProposalRow, listProposals, saveProposalAsScenario, startProposal, toProposal } from '../services/proposals';
import type { ProposalEnqueuer } from '../queue/proposal-queue';
import { pageOf, sendPage } from '../http/list-page';
import { ConflictError } from '../errors';
import { zoneRoutesCsv } from '../../shared/model/zone-routes-csv';

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

  router.get('/proposals/:proposalId/export/zone-routes.csv', requireMember('plans:read'), async (req, res) => {
    const { planId, proposalId } = proposalParamsSchema.parse(req.params);
    const row = await getProposalRow(db, actorOf(req).organizationId, planId, proposalId);
    const answer = row.result?.answer;
    if (row.kind !== 'zone-routes') throw new ConflictError('Only a “where each zone goes” search exports its routes.');
    if (!row.result || answer?.kind !== 'zone-routes') throw new ConflictError(`The search has no answer (it is ${row.status}).`);
    const request = row.input.request;
    const identity = await planExportIdentity(db, actorOf(req).organizationId, planId, null, 'Search: where each zone goes', [
      proposalCaution,
      'One optimal plan of possibly many; per zone at most 200 roads, most vehicles first.',
      `search ${row.id}, started ${row.createdAt.toISOString()}, finished ${row.finishedAt?.toISOString() ?? 'not finished'}${row.scenarioId ? `, under scenario ${row.scenarioId}` : ''}`,
      `horizon ${request.parameters.horizonMinutes} min, time step ${request.parameters.timeStepSeconds} s, capacity factor ${request.parameters.capacityFactor}; engine ${row.result.engineVersion}; run input ${row.input.runInputHash ?? 'unknown'}`,
      `clearance ${answer.clearanceMinutes === null ? 'not within the horizon' : `${answer.clearanceMinutes} min`}`,
    ]);
    const csv = zoneRoutesCsv(answer, identity);
    res.attachment(`search-${row.id.slice(0, 8)}-zone-routes.csv`).type('text/csv').send(csv);
  });

  return router;
}

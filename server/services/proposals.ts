// Proposals: start (the plan snapshot and engine problem as for a run, plus the candidate
// segments the request's limits select), list, read, cancel, and save the answer as a scenario.
import { createHash } from 'node:crypto';
import type { RunBudget } from '../../shared/model/run-budget';
import { chooseSearchLayout } from '../../shared/model/search-budget';
import { searchTooLargeReason } from '../../shared/format/search-limits';
import { and, count, desc, eq, getTableColumns, gt, inArray, sql } from 'drizzle-orm';
import type { Database } from '../db/client';
import { proposals, roadSegments } from '../db/schema';
import type { ParsedProposalRequest, Proposal, ProposalResult } from '../../shared/api/proposals';
import type { ScenarioOverlay } from '../../shared/api/scenarios';
import { limitPlusOne, type Page } from '../../shared/api/pagination';
import { BadRequestError, ConflictError, HttpError, NotFoundError } from '../errors';
import { ENGINE_VERSION } from '../run-execution/engine-version';
import type { ProposalInput } from '../optimization/proposal-input';
import { recordAudit, type Actor } from './audit';
import { assertPlanInOrganization } from './plan-access';
import { buildRunInput } from '../run-execution/build-run-input';
import { loadPlanModel } from './plan-model';
import { createScenario, getScenario } from './scenarios';

type ProposalRow = typeof proposals.$inferSelect;

export function toProposal(row: Omit<ProposalRow, 'input'> & { input?: ProposalInput }, withResult = true): Proposal {
  return {
    id: row.id,
    planId: row.planId,
    scenarioId: row.scenarioId,
    kind: row.kind,
    request: (row.input?.request ?? {}) as Record<string, unknown>,
    status: row.status,
    phase: row.phase,
    progress: row.progress,
    failureReason: row.failureReason,
    savedScenarioId: row.savedScenarioId,
    createdAt: row.createdAt.toISOString(),
    finishedAt: row.finishedAt?.toISOString() ?? null,
    result: withResult ? row.result : null,
  };
}

/** Segment ids on the layer that the request's limits select; null = no limit. */
async function candidateSegments(db: Database, layerId: number, request: ParsedProposalRequest): Promise<number[] | null> {
  const classes = 'roadClasses' in request ? request.roadClasses : [];
  const area = request.kind === 'contraflow' ? request.area : null;
  const chosen = request.kind === 'closures' ? request.segmentIds : [];
  if (classes.length === 0 && !area && chosen.length === 0) return null;
  const conditions = [eq(roadSegments.layerId, layerId)];
  if (classes.length > 0) conditions.push(inArray(roadSegments.roadClass, classes));
  if (chosen.length > 0) conditions.push(inArray(roadSegments.id, chosen));
  if (area) {
    const ring = [...area, ...(area[0]![0] === area.at(-1)![0] && area[0]![1] === area.at(-1)![1] ? [] : [area[0]!])];
    const wkt = `POLYGON((${ring.map(([x, y]) => `${x} ${y}`).join(', ')}))`;
    conditions.push(sql`ST_Intersects(${roadSegments.geom}, ST_GeomFromText(${wkt}, 4326))`);
  }
  const rows = await db.select({ id: roadSegments.id }).from(roadSegments).where(and(...conditions));
  if (chosen.length > 0 && rows.length < new Set(chosen).size && classes.length === 0) {
    throw new BadRequestError('Some of the chosen segments are not on the plan’s road layer.');
  }
  if (rows.length === 0) throw new BadRequestError('No road segment matches the limits given (classes, area or chosen roads).');
  return rows.map((r) => r.id).sort((a, b) => a - b);
}

export async function startProposal(
  db: Database,
  actor: Actor,
  planId: string,
  request: ParsedProposalRequest,
  budget: RunBudget,
): Promise<ProposalRow> {
  const scenario = request.scenarioId ? await getScenario(db, actor.organizationId, planId, request.scenarioId) : null;
  // Prepared when it is started (runs are now prepared by the worker; a search still reads its snapshot here).
  const prepared = buildRunInput(await loadPlanModel(db, actor.organizationId, planId), request.parameters, budget, scenario);
  if (request.kind !== 'lanes') {
    // What the search builds over time, on the layout that fits (refused before it is queued).
    const choice = chooseSearchLayout(request.kind, prepared.input.problem, budget);
    if (choice.layout === null) throw new BadRequestError(searchTooLargeReason(request.kind, choice.refusal));
  }
  const candidateSegmentIds = await candidateSegments(db, prepared.layerId, request);
  const input: ProposalInput = { run: prepared.input, request, candidateSegmentIds, runInputHash: prepared.inputHash, budget };
  const inputHash = createHash('sha256')
    .update(JSON.stringify({ engine: ENGINE_VERSION, request, candidateSegmentIds, problem: prepared.input.problem }))
    .digest('hex');
  return db.transaction(async (tx) => {
    const [same] = await tx
      .select({ id: proposals.id, result: proposals.result })
      .from(proposals)
      .where(and(eq(proposals.planId, planId), eq(proposals.inputHash, inputHash), eq(proposals.status, 'succeeded')))
      .orderBy(desc(proposals.createdAt))
      .limit(1);
    const now = new Date();
    const base = { planId, scenarioId: request.scenarioId, kind: request.kind, input, inputHash, createdBy: actor.userId };
    const [row] = await tx
      .insert(proposals)
      .values(same?.result ? { ...base, status: 'succeeded', phase: `reused the answer of ${same.id}`, progress: 1, result: same.result, startedAt: now, finishedAt: now } : base)
      .returning();
    await recordAudit(tx, actor, 'proposal.start', 'proposal', row!.id, { planId, kind: request.kind, reusedFrom: same?.result ? same.id : null });
    return row!;
  });
}

const { input: _input, result: _result, ...headColumns } = getTableColumns(proposals);

export async function listProposals(db: Database, organizationId: string, planId: string, page: Page): Promise<Proposal[]> {
  await assertPlanInOrganization(db, organizationId, planId);
  const rows = await db
    .select({ ...headColumns, request: sql<ParsedProposalRequest>`${proposals.input} -> 'request'` })
    .from(proposals)
    .where(eq(proposals.planId, planId))
    .orderBy(desc(proposals.createdAt), desc(proposals.id))
    .limit(limitPlusOne(page))
    .offset(page.offset);
  return rows.map(({ request, ...r }) => toProposal({ ...r, result: null, input: { request } as ProposalInput }, false));
}

export async function getProposalRow(db: Database, organizationId: string, planId: string, proposalId: string): Promise<ProposalRow> {
  await assertPlanInOrganization(db, organizationId, planId);
  const [row] = await db.select().from(proposals).where(and(eq(proposals.id, proposalId), eq(proposals.planId, planId)));
  if (!row) throw new NotFoundError('proposal');
  return row;
}

export async function cancelProposal(db: Database, actor: Actor, planId: string, proposalId: string): Promise<Proposal> {
  await getProposalRow(db, actor.organizationId, planId, proposalId);
  return db.transaction(async (tx) => {
    const [row] = await tx
      .update(proposals)
      .set({ status: 'cancelled', phase: 'cancelled', finishedAt: new Date() })
      .where(and(eq(proposals.id, proposalId), eq(proposals.planId, planId), inArray(proposals.status, ['queued', 'running'])))
      .returning();
    if (!row) {
      const [existing] = await tx.select({ status: proposals.status }).from(proposals).where(eq(proposals.id, proposalId));
      throw new ConflictError(`The search has already ${existing?.status === 'cancelled' ? 'been cancelled' : existing?.status}.`);
    }
    await recordAudit(tx, actor, 'proposal.cancel', 'proposal', proposalId, { planId });
    return toProposal(row);
  });
}

/**
 * The proposal's change as a new scenario: on top of the scenario it was computed under (its
 * overlay is kept), so running the new scenario evaluates exactly what was proposed.
 */
export async function saveProposalAsScenario(
  db: Database,
  actor: Actor,
  planId: string,
  proposalId: string,
  body: { name: string; segmentId?: number | undefined },
) {
  const row = await getProposalRow(db, actor.organizationId, planId, proposalId);
  if (row.status !== 'succeeded' || !row.result) throw new ConflictError('The search has no answer yet.');
  let change: ScenarioOverlay | null = row.result.overlay;
  const answer = row.result.answer;
  if (answer.kind === 'closures') {
    if (body.segmentId === undefined) throw new BadRequestError('Choose which ranked road to close.');
    if (!answer.roads.some((r) => r.segmentId === body.segmentId)) throw new BadRequestError('That road is not in the ranking.');
    change = { ...emptyOverlay(), closures: [{ segmentId: body.segmentId, fromMinutes: answer.closeAtMinutes, untilMinutes: null }] };
  }
  if (!change) throw new ConflictError('This answer proposes no change to save as a scenario.');
  const base = row.scenarioId ? (await getScenario(db, actor.organizationId, planId, row.scenarioId)).overlay : emptyOverlay();
  const overlay = mergeOverlays(base, change);
  const scenario = await createScenario(db, actor, planId, {
    name: body.name,
    description: `Saved from a search (${answer.kind}). ${row.result.caution}`.slice(0, 2000),
    overlay,
  });
  await db.transaction(async (tx) => {
    await tx.update(proposals).set({ savedScenarioId: scenario.id }).where(eq(proposals.id, proposalId));
    await recordAudit(tx, actor, 'proposal.save', 'proposal', proposalId, { planId, scenarioId: scenario.id });
  });
  return scenario;
}

export function emptyOverlay(): ScenarioOverlay {
  return { closures: [], laneChanges: [], contraflow: [], classFactors: [], removedShelterIds: [], addedShelters: [], departureDelays: [], departureSchedules: [] };
}

function mergeOverlays(base: ScenarioOverlay, change: ScenarioOverlay): ScenarioOverlay {
  const schedules = new Set(change.departureSchedules.map((s) => s.zoneId));
  return {
    closures: [...base.closures, ...change.closures],
    laneChanges: [...base.laneChanges.filter((l) => !change.laneChanges.some((c) => c.segmentId === l.segmentId)), ...change.laneChanges],
    contraflow: [...base.contraflow, ...change.contraflow],
    classFactors: base.classFactors,
    removedShelterIds: base.removedShelterIds,
    addedShelters: base.addedShelters,
    // A schedule replaces the zone's delay: the schedule already says when it leaves.
    departureDelays: base.departureDelays.filter((d) => !schedules.has(d.zoneId)),
    departureSchedules: [...base.departureSchedules.filter((s) => !schedules.has(s.zoneId)), ...change.departureSchedules],
  };
}

/** At most `perMinute` searches started by one person in the last minute (429 beyond). */
export async function assertProposalQuota(db: Database, actor: Actor, perMinute: number): Promise<void> {
  if (!actor.userId) return;
  const [recent] = await db
    .select({ n: count() })
    .from(proposals)
    .where(and(eq(proposals.createdBy, actor.userId), gt(proposals.createdAt, new Date(Date.now() - 60_000))));
  if (recent!.n + 1 > perMinute) {
    throw new HttpError(429, 'rate_limited', `You have started ${recent!.n} searches in the last minute; at most ${perMinute} a minute are allowed. Wait a minute and try again.`);
  }
}

/** The answers of finished searches on exactly the problem this run solved (same input hash), oldest first, one per kind (the latest). */
export async function searchesOfRun(db: Database, planId: string, runInputHash: string | null): Promise<ProposalResult[]> {
  if (!runInputHash) return [];
  const rows = await db
    .select({ kind: proposals.kind, result: proposals.result })
    .from(proposals)
    .where(and(eq(proposals.planId, planId), eq(proposals.status, 'succeeded'), sql`${proposals.input} ->> 'runInputHash' = ${runInputHash}`))
    .orderBy(desc(proposals.createdAt));
  const seen = new Set<string>();
  const out: ProposalResult[] = [];
  for (const r of rows) {
    if (!r.result || seen.has(r.kind)) continue;
    seen.add(r.kind);
    out.push(r.result);
  }
  return out.reverse();
}

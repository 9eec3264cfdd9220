// Runs: build the engine problem from a plan snapshot, queue it, solve it off the main thread,
// store the result. Identical inputs (same problem, algorithm and engine) reuse a stored result.
import { createHash } from 'node:crypto';
import { asc, and, desc, eq, getTableColumns, inArray, sql } from 'drizzle-orm';
import type { Database } from '../db/client';
import { plans, runInputs, runs } from '../db/schema';
import type { Run, RunParameters } from '../../shared/api/runs';
import { buildEvacuationProblem, ModelInputError, type BuiltEvacuationProblem } from '../../shared/model/build-evacuation-problem';
import { BadRequestError, ConflictError, NotFoundError } from '../errors';
import { ENGINE_VERSION } from '../run-execution/engine-version';
import { attachAll, loadPlanModel, modelSegments, type PlanModel } from './plan-model';
import type { Scenario } from '../../shared/api/scenarios';
import { applyScenarioToProblem, scenarioSegmentOverrides } from '../../shared/model/apply-scenario';
import type { RunInput } from '../../shared/model/run-input';
import { recordAudit, type Actor } from './audit';
import { assertPlanInOrganization } from './plan-access';
import { limitPlusOne, type Page } from '../../shared/api/pagination';

type RunRow = typeof runs.$inferSelect;

export function toRun(row: RunRow): Run {
  return {
    id: row.id,
    planId: row.planId,
    scenarioId: row.scenarioId,
    status: row.status,
    phase: row.phase,
    progress: row.progress,
    parameters: row.parameters,
    dataVersion: row.dataVersion,
    failureReason: row.failureReason,
    createdBy: row.createdBy,
    createdAt: row.createdAt.toISOString(),
    startedAt: row.startedAt?.toISOString() ?? null,
    finishedAt: row.finishedAt?.toISOString() ?? null,
  };
}

export type PreparedRun = { dataVersion: number; layerId: number; input: RunInput; inputHash: string };

export function horizonSteps(parameters: RunParameters): number {
  return Math.max(1, Math.round((parameters.horizonMinutes * 60) / parameters.timeStepSeconds));
}

/** The scenario's shelter changes on the plan's shelters; added ones get negative ids. */
function withScenarioShelters(model: PlanModel, scenario: Scenario): PlanModel {
  const known = new Set(model.shelters.map((s) => s.id));
  const unknown = scenario.overlay.removedShelterIds.filter((id) => !known.has(id));
  if (unknown.length > 0) throw new BadRequestError(`The scenario removes shelter ${unknown.join(', ')}, which is not in the plan.`);
  const removed = new Set(scenario.overlay.removedShelterIds);
  return {
    ...model,
    shelters: [
      ...model.shelters.filter((s) => !removed.has(s.id)),
      ...scenario.overlay.addedShelters.map((s, i) => ({ ...s, id: -(i + 1) })),
    ],
  };
}

/** The plan snapshot and the engine problem for these parameters; 400 with the reason if it cannot be built. */
export async function prepareRun(
  db: Database,
  organizationId: string,
  planId: string,
  parameters: RunParameters,
  maxExpandedArcs: number,
  scenario: Scenario | null = null,
  // A batch sweeping participation sets every zone's rate.
  participationRate: number | null = null,
): Promise<PreparedRun> {
  const loaded = await loadPlanModel(db, organizationId, planId);
  const base = participationRate === null ? loaded : { ...loaded, zones: loaded.zones.map((z) => ({ ...z, participationRate })) };
  const model = scenario ? withScenarioShelters(base, scenario) : base;
  const lookup = {
    indexOf: new Map(model.segments.map((seg, i) => [seg.id, i])),
    roadClassOf: (i: number) => model.segments[i]!.roadClass,
  };
  if (model.zones.length === 0) throw new BadRequestError('Add at least one evacuation zone before running.');
  if (model.shelters.length === 0) throw new BadRequestError('Add at least one shelter or exit before running.');
  const attached = attachAll(model);
  let built: BuiltEvacuationProblem;
  try {
    built = buildEvacuationProblem(
      { nodeCount: model.nodes.length, segments: modelSegments(model) },
      model.capacityTable,
      scenario ? scenarioSegmentOverrides(scenario.overlay, lookup) : [],
      model.zones.map((z, i) => ({ id: String(z.id), attributes: z, entryNodes: attached.zones[i]!.entryNodes })),
      model.shelters.map((s, i) => ({ id: String(s.id), attributes: s, node: attached.shelters[i]!.node })),
      { timeStepSeconds: parameters.timeStepSeconds, horizonSteps: horizonSteps(parameters), capacityFactor: model.capacityTable.capacityFactor * parameters.capacityFactor },
    );
    if (scenario) applyScenarioToProblem(built, scenario.overlay, lookup);
  } catch (e) {
    if (e instanceof ModelInputError) throw new BadRequestError(`The plan's data cannot be analysed: ${e.message}.`);
    throw e;
  }
  const expandedArcs = (built.problem.roads.length + built.problem.nodeCount) * (built.problem.horizonSteps + 1);
  if (expandedArcs > maxExpandedArcs) {
    throw new BadRequestError(
      `This analysis would need about ${(expandedArcs / 1e6).toFixed(1)} million time-expanded arcs, more than this server's budget of ` +
        `${(maxExpandedArcs / 1e6).toFixed(0)} million. Use a longer time step or a shorter horizon.`,
    );
  }
  const input: RunInput = {
    problem: built.problem,
    algorithm: parameters.algorithm,
    roadOrigins: built.roadOrigins,
    segments: model.segments.map((seg) => ({ id: seg.id, name: seg.name ?? '', roadClass: seg.roadClass })),
    zones: model.zones.map((z, i) => ({ id: z.id, name: z.name, vehicles: built.zones[i]!.vehicles, persons: built.zones[i]!.evacuatingPersons })),
    shelters: model.shelters.map((sh, i) => ({ id: sh.id, name: sh.name, capacityPersons: sh.capacityPersons, capacityVehicles: built.shelters[i]!.capacityVehicles })),
    personsPerVehicleAtShelters: built.personsPerVehicleAtShelters,
  };
  const inputHash = createHash('sha256')
    .update(JSON.stringify({ engine: ENGINE_VERSION, algorithm: parameters.algorithm, problem: built.problem }))
    .digest('hex');
  return { dataVersion: model.dataVersion, layerId: model.layerId, input, inputHash };
}

/** Creates the run row; returns it with `reused` when an identical finished run supplied the result. */
export async function createRun(
  db: Database,
  actor: Actor,
  planId: string,
  parameters: RunParameters,
  prepared: PreparedRun,
  scenarioId: string | null = null,
  batch: { batchId: string; sweepValue: number } | null = null,
): Promise<{ row: RunRow; reused: boolean }> {
  return db.transaction(async (tx) => {
    const [same] = await tx
      .select()
      .from(runs)
      .where(and(eq(runs.planId, planId), eq(runs.inputHash, prepared.inputHash), eq(runs.status, 'succeeded')))
      .orderBy(desc(runs.createdAt))
      .limit(1);
    const now = new Date();
    const base = {
      planId,
      parameters,
      dataVersion: prepared.dataVersion,
      roadLayerId: prepared.layerId,
      inputHash: prepared.inputHash,
      scenarioId,
      ...(batch ?? {}),
      createdBy: actor.userId,
    };
    const [row] = await tx
      .insert(runs)
      .values(
        same?.result
          ? { ...base, status: 'succeeded', phase: `reused the result of run ${same.id}`, progress: 1, result: same.result, startedAt: now, finishedAt: now }
          : base,
      )
      .returning();
    if (!same?.result) await tx.insert(runInputs).values({ runId: row!.id, input: prepared.input });
    await recordAudit(tx, actor, 'run.start', 'run', row!.id, { planId, parameters, reusedFrom: same?.result ? same.id : null });
    return { row: row!, reused: Boolean(same?.result) };
  });
}

export async function listRuns(db: Database, organizationId: string, planId: string, page: Page): Promise<Run[]> {
  await assertPlanInOrganization(db, organizationId, planId);
  const rows = await db
    .select(runColumnsWithoutResult)
    .from(runs)
    .where(eq(runs.planId, planId))
    .orderBy(desc(runs.createdAt), asc(runs.id))
    .limit(limitPlusOne(page))
    .offset(page.offset);
  return rows.map((r) => toRun({ ...r, result: null } as RunRow));
}

// Lists leave out the result, which can run to megabytes on a large network.
const { result: _result, ...runColumnsWithoutResult } = getTableColumns(runs);

export async function getRunRow(db: Database, organizationId: string, planId: string, runId: string): Promise<RunRow> {
  await assertPlanInOrganization(db, organizationId, planId);
  const [row] = await db.select().from(runs).where(and(eq(runs.id, runId), eq(runs.planId, planId)));
  if (!row) throw new NotFoundError('run');
  return row;
}

const finishedStatuses: ReadonlySet<Run['status']> = new Set(['succeeded', 'failed', 'cancelled']);

/**
 * Workers change a run only while it is queued or running (server/run-execution/run-executor.ts), so a
 * finished run's answer is fixed and can be kept ready (server/http/answer-cache.ts).
 */
export const isFinishedRun = (run: Run) => finishedStatuses.has(run.status);

/** The run without its result. One query; the plan's organization is checked in it. */
export async function getRunHead(db: Database, organizationId: string, planId: string, runId: string): Promise<Run> {
  const [row] = await db
    .select(runColumnsWithoutResult)
    .from(runs)
    .innerJoin(plans, eq(plans.id, runs.planId))
    .where(and(eq(runs.id, runId), eq(runs.planId, planId), eq(plans.organizationId, organizationId)));
  if (!row) {
    // Which of the two is missing decides the message.
    await assertPlanInOrganization(db, organizationId, planId);
    throw new NotFoundError('run');
  }
  return toRun({ ...row, result: null } as RunRow);
}

/**
 * A run read with getRunHead and its stored result, as the JSON text of a RunWithResult
 * (shared/api/runs). The result, hundreds of kilobytes on the demo town and megabytes on a
 * city, is sent as PostgreSQL renders it: parsing and serialising it again took most of the
 * server's time on this route.
 */
export async function runWithResultJson(db: Database, run: Run): Promise<string> {
  const [row] = await db.select({ resultJson: sql<string | null>`${runs.result}::text` }).from(runs).where(eq(runs.id, run.id));
  return `${JSON.stringify(run).slice(0, -1)},"result":${row?.resultJson ?? 'null'}}`;
}

export async function markCancelled(db: Database, actor: Actor, planId: string, runId: string): Promise<Run> {
  return db.transaction(async (tx) => {
    const [row] = await tx
      .update(runs)
      .set({ status: 'cancelled', phase: 'cancelled', finishedAt: new Date() })
      .where(and(eq(runs.id, runId), eq(runs.planId, planId), inArray(runs.status, ['queued', 'running'])))
      .returning();
    if (!row) {
      const [existing] = await tx.select({ status: runs.status }).from(runs).where(and(eq(runs.id, runId), eq(runs.planId, planId)));
      if (!existing) throw new NotFoundError('run');
      throw new ConflictError(`The run has already ${existing.status === 'cancelled' ? 'been cancelled' : existing.status}.`);
    }
    await recordAudit(tx, actor, 'run.cancel', 'run', runId, { planId });
    return toRun(row);
  });
}

// Runs: read, list, cancel. Starting is services/start-runs.ts; preparing and solving happen in
// the workers (server/run-execution/).
import { asc, and, desc, eq, getTableColumns, inArray, sql } from 'drizzle-orm';
import type { Database } from '../db/client';
import { plans, runs } from '../db/schema';
import type { Run, RunParameters } from '../../shared/api/runs';
import { ConflictError, NotFoundError } from '../errors';
import { recordAudit, type Actor } from './audit';
import { assertPlanInOrganization } from './plan-access';
import { limitPlusOne, type Page } from '../../shared/api/pagination';

export type RunRow = typeof runs.$inferSelect;

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

export function horizonSteps(parameters: RunParameters): number {
  return Math.max(1, Math.round((parameters.horizonMinutes * 60) / parameters.timeStepSeconds));
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

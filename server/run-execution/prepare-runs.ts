// A worker's first phase of a run: load the plan snapshot once, attach zones and shelters, build
// and hash each run's problem, and either reuse an identical stored result or store the input
// for the solve. A sweep's runs share the one snapshot. Safe to repeat after a crash: a run that
// already has its input, or is no longer queued or running, is left alone.
import { and, desc, eq, inArray, isNotNull } from 'drizzle-orm';
import type { RunBudget } from '../../shared/model/run-budget';
import type { Database, Tx } from '../db/client';
import { sweeps, plans, runInputs, runs, scenarios } from '../db/schema';
import { storedOverlay, type Scenario } from '../../shared/api/scenarios';
import { HttpError } from '../errors';
import { loadPlanModel, type PlanModel } from '../services/plan-model';
import { buildRunInput } from './build-run-input';
import { copyRoadResults } from './road-results';
import { drawRunOverviewTiles } from '../services/map-tiles';

type RunRow = typeof runs.$inferSelect;
const inFlight = inArray(runs.status, ['queued', 'running']);

export type PrepareOptions = {
  budget: RunBudget;
  /** A sweep's runs are queued for their solve as each is prepared, in the same transaction. */
  queueSolve?: (runId: string, tx: Tx) => Promise<void>;
  /** Called with each run's phase while it is prepared. */
  onPhase?: (runId: string, phase: string) => Promise<void>;
};

/** Sets a run failed with the reason, if it is still queued or running. */
export async function failRun(db: Database | Tx, runId: string, reason: string): Promise<void> {
  await db
    .update(runs)
    .set({ status: 'failed', phase: 'failed', failureReason: reason, finishedAt: new Date() })
    .where(and(eq(runs.id, runId), inFlight));
}

const reasonOf = (e: unknown) => (e instanceof HttpError ? e.message : null);

/**
 * Prepares the runs (all of one plan, one scenario, one sweep at most) that still need it;
 * returns the ids of those that are ready to solve (input stored, not reused, not failed).
 */
export async function prepareRuns(db: Database, runIds: string[], options: PrepareOptions): Promise<string[]> {
  if (runIds.length === 0) return [];
  const rows = await db.select().from(runs).where(and(inArray(runs.id, runIds), inFlight));
  const prepared = new Set(
    (await db.select({ runId: runInputs.runId }).from(runInputs).where(inArray(runInputs.runId, runIds))).map((r) => r.runId),
  );
  const todo = rows.filter((r) => !prepared.has(r.id));
  const ready = rows.filter((r) => prepared.has(r.id)).map((r) => r.id);
  if (todo.length === 0) return ready;
  const first = todo[0]!;

  let model: PlanModel;
  let scenario: Scenario | null = null;
  let sweepParameter: string | null = null;
  try {
    for (const r of todo) await options.onPhase?.(r.id, 'preparing: loading the plan');
    const [plan] = await db.select({ organizationId: plans.organizationId }).from(plans).where(eq(plans.id, first.planId));
    if (!plan) throw new HttpError(404, 'not_found', 'The plan was deleted before the analysis started.');
    if (first.scenarioId) {
      const [s] = await db.select().from(scenarios).where(and(eq(scenarios.id, first.scenarioId), eq(scenarios.planId, first.planId)));
      if (!s) throw new HttpError(404, 'not_found', 'The scenario was deleted before the analysis started.');
      scenario = { ...s, overlay: storedOverlay(s.overlay), createdAt: s.createdAt.toISOString(), updatedAt: s.updatedAt.toISOString() } as Scenario;
    }
    if (first.sweepId) {
      const [b] = await db.select({ parameter: sweeps.parameter }).from(sweeps).where(eq(sweeps.id, first.sweepId));
      sweepParameter = b?.parameter ?? null;
    }
    model = await loadPlanModel(db, plan.organizationId, first.planId);
  } catch (e) {
    const reason = reasonOf(e);
    if (reason === null) throw e;
    for (const r of todo) await failRun(db, r.id, reason);
    return ready;
  }

  for (const r of todo) {
    if (await prepareOne(db, r, model, scenario, sweepParameter, options)) ready.push(r.id);
  }
  return ready;
}

async function prepareOne(db: Database, r: RunRow, model: PlanModel, scenario: Scenario | null, sweepParameter: string | null, options: PrepareOptions): Promise<boolean> {
  await options.onPhase?.(r.id, 'preparing: building the network over time');
  let built: ReturnType<typeof buildRunInput>;
  try {
    const participation = sweepParameter === 'participationRate' ? r.sweepValue : null;
    built = buildRunInput(model, r.parameters, options.budget, scenario, participation);
  } catch (e) {
    const reason = reasonOf(e);
    if (reason === null) throw e;
    await failRun(db, r.id, reason);
    return false;
  }
  return db.transaction(async (tx) => {
    // The row lock orders this against a cancel and against another worker preparing the same run.
    const [locked] = await tx.select({ id: runs.id }).from(runs).where(and(eq(runs.id, r.id), inFlight)).for('update');
    if (!locked) return false;
    const [already] = await tx.select({ runId: runInputs.runId }).from(runInputs).where(eq(runInputs.runId, r.id));
    if (already) return true;
    const [same] = await tx
      .select({ id: runs.id, result: runs.result })
      .from(runs)
      .where(and(eq(runs.planId, r.planId), eq(runs.inputHash, built.inputHash), eq(runs.status, 'succeeded'), isNotNull(runs.result)))
      .orderBy(desc(runs.createdAt))
      .limit(1);
    const identity = { inputHash: built.inputHash, dataVersion: built.dataVersion, roadLayerId: built.layerId };
    if (same?.result) {
      // The roads' figures come along with the result, and the whole-plan map tiles, kept before
      // the run is marked finished (map-tiles.ts).
      await copyRoadResults(tx, same.id, r.id);
      await drawRunOverviewTiles(tx, r.id, { layerId: built.layerId, dataVersion: built.dataVersion }, undefined, same.id);
      const now = new Date();
      await tx
        .update(runs)
        .set({ ...identity, status: 'succeeded', phase: `reused the result of run ${same.id}`, progress: 1, result: same.result, startedAt: r.startedAt ?? now, finishedAt: now })
        .where(eq(runs.id, r.id));
      return false;
    }
    await tx.insert(runInputs).values({ runId: r.id, input: built.input });
    await tx.update(runs).set({ ...identity, phase: 'prepared' }).where(eq(runs.id, r.id));
    await options.queueSolve?.(r.id, tx);
    return true;
  });
}

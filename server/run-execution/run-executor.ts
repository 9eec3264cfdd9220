// Executes one job of the run queue. A run: prepares it if it has no stored input yet
// (prepare-runs.ts: snapshot, problem, hash, or an identical result reused), then solves it in a
// worker thread within the budget, writing progress (throttled) and the mapped result. A sweep:
// prepares all its runs from one snapshot and queues each for its solve. Safe to call again for
// the same job after a crash: a run that already finished is left alone, so no result is stored
// twice.
import { and, asc, eq, inArray } from 'drizzle-orm';
import { runBudget } from './run-budget';
import type { Database } from '../db/client';
import { plans, runInputs, runs } from '../db/schema';
import type { Config } from '../config';
import { queueSqlOf, type RunEnqueuer, type RunJob } from '../queue/run-enqueuer';
import { prepareRuns } from './prepare-runs';
import { solveInWorker, SolveFailure } from './solve-in-worker';
import { toRunResult } from './to-run-result';
import { saveRoadResults, toRoadResults } from './road-results';
import { drawRunOverviewTiles } from '../services/map-tiles';

const cancelPollMs = 1000;

export function createRunExecutor(
  db: Database,
  config: Pick<Config, 'RUN_TIME_BUDGET_SECONDS' | 'RUN_MEMORY_BUDGET_MEGABYTES' | 'RUN_MAX_EXPANDED_ARCS' | 'RUN_MAX_EXPANDED_MEGABYTES'>,
  log: (err: unknown) => void,
  // Where a sweep's prepared runs are queued for their solve.
  queue: RunEnqueuer,
) {
  const active = new Map<string, { cancel: () => void; interrupt: () => void }>();

  /** Updates the run only while it is still queued or running; false when it is not (cancelled, finished). */
  async function setState(runId: string, values: Partial<typeof runs.$inferInsert>): Promise<boolean> {
    const rows = await db
      .update(runs)
      .set(values)
      .where(and(eq(runs.id, runId), inArray(runs.status, ['queued', 'running'])))
      .returning({ id: runs.id });
    return rows.length > 0;
  }

  async function execute(queued: RunJob): Promise<void> {
    if ('sweepId' in queued) return prepareSweep(queued.sweepId);
    const { runId } = queued;
    if (!(await setState(runId, { status: 'running', phase: 'preparing', progress: 0, startedAt: new Date() }))) return;
    // In hand while it is prepared too: a stopping worker waits for it, then gives it back rather
    // than start its solve. (A cancel is seen in the database: a cancelled run is not prepared.)
    let interrupted = false;
    active.set(runId, { cancel: () => undefined, interrupt: () => void (interrupted = true) });
    let ready: string[];
    try {
      ready = await prepareRuns(db, [runId], {
        budget: runBudget(config),
        onPhase: async (id, phase) => void (await setState(id, { phase })),
      });
    } finally {
      active.delete(runId);
    }
    if (!ready.includes(runId)) return;
    if (interrupted) {
      await setState(runId, { status: 'queued', phase: 'back in the queue: its worker stopped', progress: 0, startedAt: null });
      throw new SolveFailure('Interrupted: the worker is stopping.', 'interrupted');
    }
    const [row] = await db.select({ input: runInputs.input }).from(runInputs).where(eq(runInputs.runId, runId));
    if (!row || !(await setState(runId, { phase: 'starting' }))) return;
    let lastWrite = 0;
    const job = solveInWorker(
      { problem: row.input.problem, options: { algorithm: row.input.algorithm } },
      { timeSeconds: config.RUN_TIME_BUDGET_SECONDS, memoryMegabytes: config.RUN_MEMORY_BUDGET_MEGABYTES },
      (phase, fraction) => {
        const now = Date.now();
        if (now - lastWrite < 250 && fraction < 1) return;
        lastWrite = now;
        setState(runId, { phase, progress: Math.min(1, Math.max(0, fraction)) }).catch(log);
      },
    );
    active.set(runId, job);
    // A planner's cancel may reach another process: notice it in the database.
    let cancelled = false;
    const watch = setInterval(() => {
      db.select({ status: runs.status })
        .from(runs)
        .where(eq(runs.id, runId))
        .then(([r]) => {
          if (r?.status !== 'cancelled') return;
          cancelled = true;
          job.cancel();
        }, log);
    }, cancelPollMs);
    try {
      const done = await job.done;
      const result = toRunResult(row.input, done);
      const roads = toRoadResults(row.input, done);
      if (!(await setState(runId, { phase: 'saving', progress: 0 }))) return;
      // The roads' figures, the map's whole-plan tiles drawn from them (seconds on a county, so
      // drawn here once rather than by the first person to open the run), then the result: one
      // transaction, and only while the run is still wanted. The run is marked finished last, so
      // whoever sees it finished reads stored tiles; a cancel or a crash meanwhile writes nothing.
      await db.transaction(async (tx) => {
        await saveRoadResults(tx, runId, roads);
        const [where] = await tx
          .select({ layerId: runs.roadLayerId, dataVersion: plans.dataVersion })
          .from(runs)
          .innerJoin(plans, eq(plans.id, runs.planId))
          .where(eq(runs.id, runId));
        if (where?.layerId != null) {
          let lastTileWrite = 0;
          await drawRunOverviewTiles(tx, runId, { layerId: where.layerId, dataVersion: where.dataVersion }, async (drawn, total) => {
            if (cancelled) throw new SolveFailure('Cancelled.', 'cancelled');
            const now = Date.now();
            if (now - lastTileWrite < 250 && drawn < total) return;
            lastTileWrite = now;
            // Outside the transaction, so the progress shows while it draws.
            if (!(await setState(runId, { phase: 'tiles', progress: drawn / total }))) throw new SolveFailure('Cancelled.', 'cancelled');
          });
        }
        const rows = await tx
          .update(runs)
          .set({ status: 'succeeded', phase: 'done', progress: 1, result, finishedAt: new Date() })
          .where(and(eq(runs.id, runId), inArray(runs.status, ['queued', 'running'])))
          .returning({ id: runs.id });
        // Cancelled (or finished elsewhere) meanwhile: roll back, nothing written.
        if (rows.length === 0) throw new SolveFailure('The run is no longer wanted.', 'cancelled');
      });
    } catch (e) {
      if (e instanceof SolveFailure && e.kind === 'cancelled') return;
      if (e instanceof SolveFailure && e.kind === 'interrupted') {
        await setState(runId, { status: 'queued', phase: 'back in the queue: its worker stopped', progress: 0, startedAt: null });
        // Failing the job makes the queue hand it to another worker at once.
        throw e;
      }
      if (!(e instanceof SolveFailure)) log(e);
      await setState(runId, { status: 'failed', phase: 'failed', failureReason: e instanceof Error ? e.message : String(e), finishedAt: new Date() });
    } finally {
      clearInterval(watch);
      active.delete(runId);
    }
  }

  /** A sweep's first phase: one snapshot for all its runs, each queued for its solve once prepared. */
  async function prepareSweep(sweepId: string): Promise<void> {
    const members = await db
      .select({ id: runs.id })
      .from(runs)
      .where(and(eq(runs.sweepId, sweepId), inArray(runs.status, ['queued', 'running'])))
      .orderBy(asc(runs.sweepValue));
    const ids = members.map((m) => m.id);
    await prepareRuns(db, ids, {
      budget: runBudget(config),
      onPhase: async (id, phase) => void (await setState(id, { phase })),
      queueSolve: (runId, tx) => queue.enqueue({ runId }, queueSqlOf(tx)),
    });
    // Runs prepared by an earlier attempt of this job were queued in the same transaction as their input.
  }

  function cancel(runId: string): void {
    active.get(runId)?.cancel();
  }

  /** Resolves true once no run is in hand, false if some still are after `ms`. */
  async function drain(ms: number): Promise<boolean> {
    const end = Date.now() + ms;
    while (active.size > 0 && Date.now() < end) await new Promise((r) => setTimeout(r, 100));
    return active.size === 0;
  }

  /** Stops every solve in hand and puts its run back in the queue; returns their ids. */
  function interruptAll(): string[] {
    const ids = [...active.keys()];
    for (const job of active.values()) job.interrupt();
    return ids;
  }

  return { execute, cancel, drain, interruptAll, activeCount: () => active.size };
}
export type RunExecutor = ReturnType<typeof createRunExecutor>;

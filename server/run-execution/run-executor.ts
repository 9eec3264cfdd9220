// Executes one queued run: loads its stored input, solves it in a worker thread within the
// budget, writes progress (throttled) and the mapped result. Safe to call again for the same
// run after a crash: a run that already finished is left alone, so no result is stored twice.
import { and, eq, inArray } from 'drizzle-orm';
import type { Database } from '../db/client';
import { runInputs, runs } from '../db/schema';
import type { Config } from '../config';
import { solveInWorker, SolveFailure } from './solve-in-worker';
import { toRunResult } from './to-run-result';

const cancelPollMs = 1000;

export function createRunExecutor(db: Database, config: Pick<Config, 'RUN_TIME_BUDGET_SECONDS' | 'RUN_MEMORY_BUDGET_MEGABYTES'>, log: (err: unknown) => void) {
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

  async function execute(runId: string): Promise<void> {
    const [row] = await db.select({ input: runInputs.input }).from(runInputs).where(eq(runInputs.runId, runId));
    if (!row) return;
    if (!(await setState(runId, { status: 'running', phase: 'starting', progress: 0, startedAt: new Date() }))) return;
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
    const watch = setInterval(() => {
      db.select({ status: runs.status })
        .from(runs)
        .where(eq(runs.id, runId))
        .then(([r]) => r?.status === 'cancelled' && job.cancel(), log);
    }, cancelPollMs);
    try {
      const done = await job.done;
      await setState(runId, { status: 'succeeded', phase: 'done', progress: 1, result: toRunResult(row.input, done), finishedAt: new Date() });
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

// Executes one queued proposal: loads its stored input, computes it in a worker thread within
// the runs' budget, writes progress and the answer. Writes only while the proposal is queued or
// running, so a cancelled proposal stays cancelled and an answer is never stored twice.
import { and, eq, inArray } from 'drizzle-orm';
import type { Config } from '../config';
import type { Database } from '../db/client';
import { proposals } from '../db/schema';
import { SolveFailure } from '../run-execution/solve-in-worker';
import { proposalInWorker } from './proposal-in-worker';

export function createProposalExecutor(db: Database, config: Pick<Config, 'RUN_TIME_BUDGET_SECONDS' | 'RUN_MEMORY_BUDGET_MEGABYTES'>, log: (err: unknown) => void) {
  const active = new Map<string, { cancel: () => void; interrupt: () => void }>();

  async function setState(id: string, values: Partial<typeof proposals.$inferInsert>): Promise<boolean> {
    const rows = await db
      .update(proposals)
      .set(values)
      .where(and(eq(proposals.id, id), inArray(proposals.status, ['queued', 'running'])))
      .returning({ id: proposals.id });
    return rows.length > 0;
  }

  async function execute(id: string): Promise<void> {
    const [row] = await db.select({ input: proposals.input }).from(proposals).where(eq(proposals.id, id));
    if (!row) return;
    if (!(await setState(id, { status: 'running', phase: 'searching', progress: 0, startedAt: new Date() }))) return;
    let lastWrite = 0;
    const job = proposalInWorker(row.input, { timeSeconds: config.RUN_TIME_BUDGET_SECONDS, memoryMegabytes: config.RUN_MEMORY_BUDGET_MEGABYTES }, (fraction) => {
      const now = Date.now();
      if (now - lastWrite < 250 && fraction < 1) return;
      lastWrite = now;
      setState(id, { progress: Math.min(1, Math.max(0, fraction)) }).catch(log);
    });
    active.set(id, job);
    const watch = setInterval(() => {
      db.select({ status: proposals.status })
        .from(proposals)
        .where(eq(proposals.id, id))
        .then(([r]) => r?.status === 'cancelled' && job.cancel(), log);
    }, 1000);
    try {
      const result = await job.done;
      await setState(id, { status: 'succeeded', phase: 'done', progress: 1, result, finishedAt: new Date() });
    } catch (e) {
      if (e instanceof SolveFailure && e.kind === 'cancelled') return;
      if (e instanceof SolveFailure && e.kind === 'interrupted') {
        await setState(id, { status: 'queued', phase: 'back in the queue: its worker stopped', progress: 0, startedAt: null });
        throw e;
      }
      if (!(e instanceof SolveFailure)) log(e);
      await setState(id, { status: 'failed', phase: 'failed', failureReason: e instanceof Error ? e.message : String(e), finishedAt: new Date() });
    } finally {
      clearInterval(watch);
      active.delete(id);
    }
  }

  return {
    execute,
    async drain(ms: number): Promise<boolean> {
      const end = Date.now() + ms;
      while (active.size > 0 && Date.now() < end) await new Promise((r) => setTimeout(r, 100));
      return active.size === 0;
    },
    interruptAll(): string[] {
      const ids = [...active.keys()];
      for (const job of active.values()) job.interrupt();
      return ids;
    },
    activeCount: () => active.size,
  };
}
export type ProposalExecutor = ReturnType<typeof createProposalExecutor>;

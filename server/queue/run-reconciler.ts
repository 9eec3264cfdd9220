// Runs with no live job: a run queued or running whose job is gone for good (its retries ran
// out, or it ended without finishing the run) would wait for ever and count against its
// organization's in-flight limit. Every worker looks for them now and then:
// - a job that failed, was cancelled or completed while the run is still in flight: the run fails,
//   with the reason;
// - no job at all (a run queued before runs and jobs were written in one transaction): the run is
//   queued again.
// A sweep's run counts its sweep's preparation job as its own until that job has queued it.
import { sql } from 'drizzle-orm';
import type { Database } from '../db/client';
import { queueSqlOf, type RunEnqueuer } from './run-enqueuer';
import { RUN_QUEUE } from './run-queue';

export type Reconciled = { failed: string[]; requeued: string[] };

// A job of this run (or of its sweep) in pg-boss's live table or its archive, in these states.
const jobOf = (table: string, states: string) => sql`
  EXISTS (SELECT 1 FROM pgboss.${sql.raw(table)} j
          WHERE j.name = ${RUN_QUEUE} AND j.state IN (${sql.raw(states)})
            AND (j.data->>'runId' = r.id::text OR (r.batch_id IS NOT NULL AND j.data->>'sweepId' = r.batch_id::text)))`;
const live = "'created', 'retry', 'active'";
const over = "'completed', 'cancelled', 'failed'";

export async function reconcileRuns(db: Database, queue: RunEnqueuer, options: { requeueAfterSeconds: number }): Promise<Reconciled> {
  const failed = await db.execute<{ id: string }>(sql`
    UPDATE runs r SET status = 'failed', phase = 'failed', finished_at = now(),
      failure_reason = 'No worker could finish this analysis: its job stopped (its workers stopped or failed too often). Start it again.'
    WHERE r.status IN ('queued', 'running')
      AND NOT ${jobOf('job', live)}
      AND (${jobOf('job', over)} OR ${jobOf('archive', over)})
    RETURNING r.id`);

  const orphans = await db.execute<{ id: string }>(sql`
    SELECT r.id FROM runs r
    WHERE r.status IN ('queued', 'running') AND r.created_at < now() - make_interval(secs => ${options.requeueAfterSeconds})
      AND NOT ${jobOf('job', `${live}, ${over}`)} AND NOT ${jobOf('archive', over)}`);
  const requeued: string[] = [];
  for (const { id } of orphans.rows) {
    // The row lock and the second look keep two workers reconciling at once from queuing it twice.
    // The second look is its own statement, so it sees a job another worker committed while this one waited for the lock.
    const done = await db.transaction(async (tx) => {
      await tx.execute(sql`SELECT 1 FROM runs WHERE id = ${id} FOR UPDATE`);
      const still = await tx.execute(sql`
        SELECT 1 FROM runs r WHERE r.id = ${id} AND r.status IN ('queued', 'running')
          AND NOT ${jobOf('job', `${live}, ${over}`)} AND NOT ${jobOf('archive', over)}`);
      if (still.rows.length === 0) return false;
      await tx.execute(sql`UPDATE runs SET status = 'queued', phase = 'queued again: it had no job', progress = 0 WHERE id = ${id}`);
      await queue.enqueue({ runId: id }, queueSqlOf(tx));
      return true;
    });
    if (done) requeued.push(id);
  }
  return { failed: failed.rows.map((r) => r.id), requeued };
}

/** Reconciles every `seconds` until stopped; errors go to `log` and the next round tries again. */
export function startRunReconciler(
  db: Database,
  queue: RunEnqueuer,
  seconds: number,
  log: (e: unknown) => void,
  // More of the same kind each round (imports whose upload never finished).
  alsoEachRound: () => Promise<void> = async () => undefined,
): { stop: () => void } {
  let running = false;
  const timer = setInterval(() => {
    if (running) return;
    running = true;
    reconcileRuns(db, queue, { requeueAfterSeconds: Math.max(60, seconds) })
      .then((r) => {
        for (const id of r.failed) console.log(`[worker] run ${id} had no live job: failed`);
        for (const id of r.requeued) console.log(`[worker] run ${id} had no job: queued again`);
      }, log)
      .then(alsoEachRound)
      .catch(log)
      .finally(() => (running = false));
  }, seconds * 1000);
  timer.unref();
  return { stop: () => clearInterval(timer) };
}

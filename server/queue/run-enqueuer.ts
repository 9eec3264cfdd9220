// What the API and the workers need from the run queue: put a job in it as part of the caller's
// own transaction, so a run row and its job are committed together or not at all.
import type { Tx } from '../db/client';

/** A job on the run queue: one run to prepare (if need be) and solve, or a sweep to prepare. */
export type RunJob = { runId: string } | { sweepId: string };

/** pg-boss runs its insert through this (its `db` option): here, the caller's transaction. */
export type QueueSql = { executeSql(text: string, values: unknown[]): Promise<{ rows: unknown[] }> };

export type RunEnqueuer = {
  /** Queues the job inside `within`; throws if it could not be queued (the transaction then rolls back). */
  enqueue(job: RunJob, within: QueueSql): Promise<void>;
};

/**
 * The transaction's own connection as pg-boss's executor. Drizzle keeps the pool client of a
 * node-postgres transaction on its session; pg-boss needs only `query(text, values)` on it.
 */
export function queueSqlOf(tx: Tx): QueueSql {
  const client = (tx as unknown as { session?: { client?: { query: (text: string, values: unknown[]) => Promise<{ rows: unknown[] }> } } }).session?.client;
  if (!client || typeof client.query !== 'function') throw new Error('queueSqlOf: not a node-postgres transaction');
  return { executeSql: (text, values) => client.query(text, values) };
}

export const jobKey = (job: RunJob) => ('runId' in job ? `run:${job.runId}` : `sweep:${job.sweepId}`);

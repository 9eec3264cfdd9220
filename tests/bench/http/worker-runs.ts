// What the worker did during the load, read from the bench database's runs table: runs it
// solved (phase 'done'; a reused result never reaches the worker), runs that failed, and runs
// still waiting or running when the load stopped.
import pg from 'pg';
import type { WorkerRuns } from './report';

export async function workerRunsBetween(databaseUrl: string, from: Date, to: Date): Promise<WorkerRuns> {
  const client = new pg.Client({ connectionString: databaseUrl });
  await client.connect();
  try {
    const { rows } = await client.query<{ solved: string; failed: string; median_seconds: number | null; waiting: string }>(
      `SELECT
         count(*) FILTER (WHERE status = 'succeeded' AND phase = 'done' AND finished_at BETWEEN $1 AND $2) AS solved,
         count(*) FILTER (WHERE status = 'failed' AND finished_at BETWEEN $1 AND $2) AS failed,
         percentile_cont(0.5) WITHIN GROUP (ORDER BY extract(epoch FROM finished_at - started_at))
           FILTER (WHERE status = 'succeeded' AND phase = 'done' AND finished_at BETWEEN $1 AND $2) AS median_seconds,
         count(*) FILTER (WHERE status IN ('queued', 'running')) AS waiting
       FROM runs`,
      [from, to],
    );
    const r = rows[0]!;
    return { solved: Number(r.solved), failed: Number(r.failed), medianSolveSeconds: r.median_seconds, waitingAtEnd: Number(r.waiting) };
  } finally {
    await client.end();
  }
}

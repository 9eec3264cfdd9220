// Runs wait in a PostgreSQL-backed queue (pg-boss). Any number of worker processes, on this
// machine or others pointing at the same database, take jobs from it; a job whose worker dies
// expires and is retried by another.
import PgBoss from 'pg-boss';
import type { Config } from '../config';
import { jobKey, type QueueSql, type RunEnqueuer, type RunJob } from './run-enqueuer';

export const RUN_QUEUE = 'runs';
// Road, zone and shelter files to read and save (server/import-execution/).
export const IMPORT_QUEUE = 'imports';
export type ImportJob = { importId: string };
export type ImportEnqueuer = { enqueueImport(importId: string, within: QueueSql): Promise<void> };

export async function startRunQueue(
  config: Pick<Config, 'DATABASE_URL' | 'RUN_TIME_BUDGET_SECONDS' | 'QUEUE_MAINTENANCE_SECONDS' | 'RUN_EXPIRY_SLACK_SECONDS' | 'IMPORT_TIME_BUDGET_SECONDS'>,
) {
  const boss = new PgBoss({
    connectionString: config.DATABASE_URL,
    schema: 'pgboss',
    max: 4,
    maintenanceIntervalSeconds: config.QUEUE_MAINTENANCE_SECONDS,
    monitorStateIntervalSeconds: Math.max(config.QUEUE_MAINTENANCE_SECONDS, 1),
  });
  // 57P01: the database shut the connection (a restart, or a dropped test database).
  boss.on('error', (e: Error & { code?: string }) => {
    if (e.code !== '57P01') console.error('[queue]', e);
  });
  await boss.start();
  // A queue must exist before send(), or pg-boss 10 drops the job silently. Processes started
  // together on a new database (API processes, workers) create it at the same moment, and
  // PostgreSQL may end one of them as a deadlock (40P01); that one tries again.
  for (let attempt = 1; ; attempt++) {
    try {
      await boss.createQueue(RUN_QUEUE);
      await boss.createQueue(IMPORT_QUEUE);
      break;
    } catch (e) {
      if ((e as { code?: string }).code !== '40P01' || attempt >= 5) throw e;
      await new Promise((r) => setTimeout(r, 50 * attempt));
    }
  }

  return {
    boss,
    async enqueue(job: RunJob, within: QueueSql): Promise<void> {
      const id = await boss.send(RUN_QUEUE, job, {
        // The caller's transaction: the job exists exactly when the run rows that need it do.
        db: within,
        singletonKey: jobKey(job),
        // Retries follow a worker's death or shutdown, never a solve's own failure (that is final).
        retryLimit: 5,
        retryDelay: 1,
        // A job still active after the budget (plus slack) belongs to a dead worker: retry it.
        expireInSeconds: Math.ceil(config.RUN_TIME_BUDGET_SECONDS + config.RUN_EXPIRY_SLACK_SECONDS),
      });
      if (id === null) throw new Error(`${jobKey(job)} could not be queued`);
    },
    async work(concurrency: number, handler: (job: RunJob) => Promise<void>): Promise<void> {
      for (let i = 0; i < concurrency; i++) {
        await boss.work<RunJob>(RUN_QUEUE, { batchSize: 1, pollingIntervalSeconds: 0.5 }, async ([job]) => {
          if (job) await handler(job.data);
        });
      }
    },
    async enqueueImport(importId: string, within: QueueSql): Promise<void> {
      const id = await boss.send(IMPORT_QUEUE, { importId } satisfies ImportJob, {
        db: within,
        singletonKey: `import:${importId}`,
        retryLimit: 3,
        retryDelay: 1,
        expireInSeconds: Math.ceil(config.IMPORT_TIME_BUDGET_SECONDS + config.RUN_EXPIRY_SLACK_SECONDS + 60),
      });
      if (id === null) throw new Error(`import ${importId} could not be queued`);
    },
    async workImports(concurrency: number, handler: (job: ImportJob) => Promise<void>): Promise<void> {
      for (let i = 0; i < concurrency; i++) {
        await boss.work<ImportJob>(IMPORT_QUEUE, { batchSize: 1, pollingIntervalSeconds: 0.5 }, async ([job]) => {
          if (job) await handler(job.data);
        });
      }
    },
    /** Stops fetching new jobs; the handlers in progress go on. */
    async stopTaking(): Promise<void> {
      await boss.offWork(RUN_QUEUE);
      await boss.offWork(IMPORT_QUEUE);
    },
    async stop(): Promise<void> {
      await boss.stop({ graceful: true, wait: true, timeout: 10_000 });
    },
  } satisfies RunEnqueuer & ImportEnqueuer & Record<string, unknown>;
}
export type RunQueue = Awaited<ReturnType<typeof startRunQueue>>;

// `npm run worker`: takes runs from the queue and solves them, each in a worker thread. Start
// as many as the machines allow, here or on other machines with the same DATABASE_URL.
import { hostname } from 'node:os';
import { loadConfig } from './config';
import { createDatabase } from './db/client';
import { startRunQueue } from './queue/run-queue';
import { startRunReconciler } from './queue/run-reconciler';
import { createImportExecutor } from './import-execution/import-executor';
import { reconcileImports } from './services/imports';
import { createRunExecutor } from './run-execution/run-executor';
import { startProposalQueue } from './queue/proposal-queue';
import { createProposalExecutor } from './optimization/proposal-executor';
import { lowerProcessPriority } from './run-execution/lower-priority';

const config = loadConfig();
if (config.WORKER_NICENESS > 0) lowerProcessPriority(config.WORKER_NICENESS);
const { db, pool } = createDatabase(config.DATABASE_URL);
const queue = await startRunQueue(config);
const log = (e: unknown) => console.error('[worker]', e);
const executor = createRunExecutor(db, config, log, queue);
await queue.work(config.WORKER_CONCURRENCY, async (job) => {
  const what = 'runId' in job ? `run ${job.runId}` : `sweep ${job.sweepId}`;
  console.log(`[worker] pid ${process.pid} took ${what}`);
  await executor.execute(job);
  console.log(`[worker] pid ${process.pid} finished ${what}`);
});
const importer = createImportExecutor(db, config, log);
await queue.workImports(1, async ({ importId }) => {
  console.log(`[worker] pid ${process.pid} took import ${importId}`);
  await importer.execute(importId);
  console.log(`[worker] pid ${process.pid} finished import ${importId}`);
});
// An import still receiving its file well after any upload could have arrived lost its API process.
const reconciler = startRunReconciler(db, queue, config.RUN_RECONCILE_SECONDS, log, async () => {
  for (const id of await reconcileImports(db, config.UPLOAD_READ_TIMEOUT_SECONDS + 600)) console.log(`[worker] import ${id} never finished arriving: failed`);
});
// Searches for the best change (proposals) share the worker and its budget.
const proposalQueue = await startProposalQueue(queue.boss, config);
const proposalExecutor = createProposalExecutor(db, config, log);
await proposalQueue.work(config.WORKER_CONCURRENCY, async ({ proposalId }) => {
  console.log(`[worker] pid ${process.pid} took proposal ${proposalId}`);
  await proposalExecutor.execute(proposalId);
});
console.log(`[worker] ${hostname()} pid ${process.pid}: taking runs from the queue (${config.WORKER_CONCURRENCY} at a time)`);

let stopping = false;
// Graceful: take no new runs, let the runs in hand finish within the grace period, and put
// what is still running back in the queue (run row "queued", job failed so it is retried at
// once elsewhere) rather than leave it to expire.
async function shutdown(signal: string) {
  if (stopping) return;
  stopping = true;
  const grace = config.WORKER_SHUTDOWN_GRACE_SECONDS;
  console.log(`[worker] pid ${process.pid} ${signal}: taking no new runs; ${executor.activeCount()} in hand, waiting up to ${grace} s`);
  reconciler.stop();
  await queue.stopTaking();
  await proposalQueue.stopTaking();
  if (!(await executor.drain(grace * 1000))) {
    for (const runId of executor.interruptAll()) console.log(`[worker] pid ${process.pid} returned run ${runId} to the queue`);
    await executor.drain(10_000);
  }
  if (!(await proposalExecutor.drain(1000))) {
    for (const id of proposalExecutor.interruptAll()) console.log(`[worker] pid ${process.pid} returned proposal ${id} to the queue`);
    await proposalExecutor.drain(10_000);
  }
  await queue.stop();
  await pool.end();
  console.log(`[worker] pid ${process.pid} stopped`);
  process.exit(0);
}
process.on('SIGINT', () => void shutdown('SIGINT'));
process.on('SIGTERM', () => void shutdown('SIGTERM'));

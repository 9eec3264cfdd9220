// `npm run worker`: takes runs from the queue and solves them, each in a worker thread. Start
// as many as the machines allow, here or on other machines with the same DATABASE_URL.
import { hostname } from 'node:os';
import { loadConfig } from './config';
import { createDatabase } from './db/client';
import { startRunQueue } from './queue/run-queue';
import { createRunExecutor } from './runs/run-executor';

const config = loadConfig();
const { db, pool } = createDatabase(config.DATABASE_URL);
const queue = await startRunQueue(config);
const executor = createRunExecutor(db, config, (e) => console.error('[worker]', e));
await queue.work(config.WORKER_CONCURRENCY, async ({ runId }) => {
  console.log(`[worker] pid ${process.pid} took run ${runId}`);
  await executor.execute(runId);
  console.log(`[worker] pid ${process.pid} finished run ${runId}`);
});
console.log(`[worker] ${hostname()} pid ${process.pid}: taking runs from the queue (${config.WORKER_CONCURRENCY} at a time)`);

let stopping = false;
async function shutdown() {
  if (stopping) return;
  stopping = true;
  // Graceful: the queue waits for the runs in hand to finish (up to its timeout); one that
  // does not finish stays active in the queue and is retried elsewhere after it expires.
  await queue.stop();
  await pool.end();
  process.exit(0);
}
process.on('SIGINT', shutdown);
process.on('SIGTERM', shutdown);

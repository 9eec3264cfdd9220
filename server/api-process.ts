// One API process: the database pool, the run queue, the development outbox and the app on its
// port, with a graceful shutdown. `server/index.ts` starts one, or several through api-primary.ts.
import cluster from 'node:cluster';
import type { Config } from './config';
import { createDatabase } from './db/client';
import { createApp } from './app';
import { demoAccounts } from './seed/demo-accounts';
import { demoWanted } from './seed/seed-command';
import { organizations } from './db/schema';
import { startRunQueue } from './queue/run-queue';
import { startProposalQueue } from './queue/proposal-queue';
import { startDevOutbox } from './services/briefings/outbox';
import { closeSchemaReaders } from './import/gis/read-schema-in-worker';
import { closeRenderPools } from './services/briefings/render-in-worker';
import { closeVerifierPools } from './services/briefings/signing/verify-in-worker';
import { importUploadsSettled } from './services/imports';

export async function startApiProcess(config: Config): Promise<void> {
  const { db, pool } = createDatabase(config.DATABASE_URL);
  const runQueue = await startRunQueue(config);
  const proposalQueue = await startProposalQueue(runQueue.boss, config);
  // Development outbox: briefing e-mail goes to a loopback SMTP server that keeps it (admins read it on /outbox).
  const outbox = await startDevOutbox(db, config);
  let stopping = false;
  const app = createApp({ config: outbox ? { ...config, SMTP_URL: outbox.url } : config, db, pool, runQueue, importQueue: runQueue, proposalQueue, isStopping: () => stopping });

  // A fresh production installation has no organization and no demo: say how to make the first.
  const noOrganization = config.NODE_ENV === 'production' && (await db.select({ id: organizations.id }).from(organizations).limit(1)).length === 0;
  const server = app.listen(config.PORT, config.HOST, () => {
    // Of several API processes, the first one speaks for all.
    if (cluster.isWorker && cluster.worker?.id !== 1) return;
    const url = `http://${config.HOST === '0.0.0.0' ? 'localhost' : config.HOST}:${config.PORT}/`;
    const lines = [
      '',
      `Cutline is running at ${url}${config.API_PROCESSES > 1 ? ` (${config.API_PROCESSES} API processes)` : ''}`,
      '',
      // The demo's published passwords, printed only where the demo is seeded (never in production unless asked for).
      ...(demoWanted(config, false)
        ? ['Demo sign-ins (an invented organization, for trying Cutline out; not for real use):', ...demoAccounts.map((a) => `  ${a.role.padEnd(9)} ${a.email.padEnd(32)} password: ${a.password}`), '']
        : []),
      ...(noOrganization ? ['No organization yet: create yours and its first administrator with `npm run org:create`.', ''] : []),
      ...(outbox ? [`E-mail is kept in the development outbox (${outbox.url}, admins: ${url}outbox), never delivered.`, ''] : []),
      'Stop with Ctrl+C.',
    ];
    console.log(lines.join('\n'));
  });

  // Graceful: /readyz turns 503, no new connections are taken, requests in progress get the grace
  // period to finish, then the queue, the outbox and the database pool are closed.
  async function shutdown(signal: string) {
    if (stopping) return;
    stopping = true;
    console.log(`${signal}: API process ${process.pid} finishing requests in progress (up to ${config.SHUTDOWN_GRACE_SECONDS} s), then stopping`);
    const closed = new Promise<void>((resolve) => server.close(() => resolve()));
    server.closeIdleConnections();
    const grace = new Promise<void>((resolve) => setTimeout(resolve, config.SHUTDOWN_GRACE_SECONDS * 1000).unref());
    // Uploads already answered are still storing their last pieces and queuing their job.
    await Promise.race([Promise.all([closed, importUploadsSettled()]), grace]);
    server.closeAllConnections();
    await Promise.allSettled([runQueue.stop(), outbox?.close(), closeSchemaReaders(), closeRenderPools(), closeVerifierPools()]);
    await pool.end();
    process.exit(0);
  }
  process.on('SIGINT', () => void shutdown('SIGINT'));
  process.on('SIGTERM', () => void shutdown('SIGTERM'));
}

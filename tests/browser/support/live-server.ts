// The real server (API and built client) on an ephemeral loopback port, on a fresh test database.
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import { fileURLToPath } from 'node:url';
import fs from 'node:fs';
import { createApp } from '../../../server/app';
import { loadConfig } from '../../../server/config';
import { seedDemo } from '../../../server/seed/seed-demo';
import { createTestDatabase, type TestDatabase } from '../../server/support/database';
import { startRunQueue } from '../../../server/queue/run-queue';
import { createRunExecutor } from '../../../server/run-execution/run-executor';
import { createImportExecutor } from '../../../server/import-execution/import-executor';
import { startProposalQueue } from '../../../server/queue/proposal-queue';
import { createProposalExecutor } from '../../../server/optimization/proposal-executor';

const clientDir = fileURLToPath(new URL('../../../dist', import.meta.url));

export type LiveServer = TestDatabase & { url: string; stop: () => Promise<void> };

export async function startLiveServer(): Promise<LiveServer> {
  if (!fs.existsSync(`${clientDir}/index.html`)) throw new Error('The client is not built: run `npx vite build` (npm test does).');
  const database = await createTestDatabase();
  const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: database.url, PASSWORD_HASH_ROUNDS: '4' });
  await seedDemo(database.db, config.PASSWORD_HASH_ROUNDS);
  const runQueue = await startRunQueue(config);
  const executor = createRunExecutor(database.db, config, console.error, runQueue);
  await runQueue.work(1, (job) => executor.execute(job));
  const importer = createImportExecutor(database.db, config, console.error);
  await runQueue.workImports(1, ({ importId }) => importer.execute(importId));
  const proposalQueue = await startProposalQueue(runQueue.boss, config);
  const proposalExecutor = createProposalExecutor(database.db, config, console.error);
  await proposalQueue.work(1, ({ proposalId }) => proposalExecutor.execute(proposalId));
  const app = createApp({ config, db: database.db, pool: database.pool, clientDir, runQueue, importQueue: runQueue, proposalQueue });
  const server: Server = await new Promise((resolve) => {
    const s = app.listen(0, '127.0.0.1', () => resolve(s));
  });
  const { port } = server.address() as AddressInfo;
  return {
    ...database,
    url: `http://127.0.0.1:${port}`,
    stop: async () => {
      await new Promise((resolve) => server.close(resolve));
      await runQueue.stop();
      await database.drop();
    },
  };
}

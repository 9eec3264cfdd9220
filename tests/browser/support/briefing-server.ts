// The real server and built client on a loopback port, with mail going to a fake SMTP server
// on loopback that keeps every message in the outbox table (as `npm start` does), and the
// public address set to this server so that links in mail and on signed briefings point here.
import { createServer } from 'node:http';
import type { AddressInfo } from 'node:net';
import { fileURLToPath } from 'node:url';
import fs from 'node:fs';
import { createApp, type AppDeps } from '../../../server/app';
import { loadConfig } from '../../../server/config';
import { seedDemo } from '../../../server/seed/seed-demo';
import { startFakeSmtpServer, type FakeSmtpServer } from '../../../server/services/briefings/mail/fake-smtp-server';
import { keepOutboxMessage } from '../../../server/services/briefings/outbox';
import { createTestDatabase, type TestDatabase } from '../../server/support/database';

// CUTLINE_CLIENT_DIR: a client built elsewhere (e.g. while the working tree's client does not build).
const clientDir = process.env.CUTLINE_CLIENT_DIR ?? fileURLToPath(new URL('../../../dist', import.meta.url));

// These tests queue no analysis: runs are inserted as finished rows.
const noQueue = {
  enqueue: async () => {
    throw new Error('no run queue in the briefing browser test');
  },
} as unknown as AppDeps['runQueue'];

export type BriefingServer = TestDatabase & { url: string; smtp: FakeSmtpServer; organizationId: string; planId: string; userIds: Record<string, string>; stop: () => Promise<void> };

export async function startBriefingServer(): Promise<BriefingServer> {
  if (!fs.existsSync(`${clientDir}/index.html`)) throw new Error('The client is not built: run `npx vite build` (npm test does).');
  const database = await createTestDatabase();
  const smtp = await startFakeSmtpServer({ onMessage: (m) => keepOutboxMessage(database.db, m) });
  // Listen first, so that the configuration can name the port in its public address.
  let handler: ReturnType<typeof createApp> | null = null;
  const server = createServer((req, res) => handler!(req, res));
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: database.url, PASSWORD_HASH_ROUNDS: '4', SMTP_URL: smtp.url, PUBLIC_BASE_URL: url, DEV_OUTBOX: 'on' });
  const demo = await seedDemo(database.db, config.PASSWORD_HASH_ROUNDS);
  handler = createApp({ config, db: database.db, pool: database.pool, clientDir, runQueue: noQueue });
  return {
    ...database,
    url,
    smtp,
    organizationId: demo.organizationId,
    planId: demo.planId!,
    userIds: demo.userIds,
    stop: async () => {
      server.closeAllConnections();
      await new Promise((resolve) => server.close(resolve));
      await smtp.close();
      await database.drop();
    },
  };
}

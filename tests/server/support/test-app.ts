// A real app on a fresh test database with two organizations: the demo one (one account per
// role) and "Other", whose records the demo accounts must never see.
import request from 'supertest';
import type { Role } from '../../../shared/api/roles';
import { createApp } from '../../../server/app';
import { loadConfig, type Config } from '../../../server/config';
import { seedDemo } from '../../../server/seed/seed-demo';
import { seedOrganization } from '../../../server/seed/seed-organization';
import { demoAccounts } from '../../../server/seed/demo-accounts';
import { createTestDatabase, type TestDatabase } from './database';
import { startRunQueue } from '../../../server/queue/run-queue';
import { createRunExecutor } from '../../../server/run-execution/run-executor';
import type { RunEnqueuer } from '../../../server/queue/run-enqueuer';
import { createImportExecutor } from '../../../server/import-execution/import-executor';
import { startProposalQueue, type ProposalQueue } from '../../../server/queue/proposal-queue';
import { createProposalExecutor } from '../../../server/optimization/proposal-executor';

export const otherAccounts = [
  { role: 'admin' as Role, email: 'admin@other.example', displayName: 'Other Admin', password: 'other-admin-2026' },
  { role: 'planner' as Role, email: 'planner@other.example', displayName: 'Other Planner', password: 'other-planner-2026' },
];

export function accountFor(role: Role) {
  const account = demoAccounts.find((a) => a.role === role);
  if (!account) throw new Error(`no demo account for ${role}`);
  return account;
}

export type TestContext = TestDatabase & {
  app: ReturnType<typeof createApp>;
  config: Config;
  demoOrganizationId: string;
  otherOrganizationId: string;
  userIds: Record<string, string>;
  errors: unknown[];
};

export type TestContextOptions = {
  // A real pg-boss queue on the test database and an in-process worker solving what it queues.
  withRunWorker?: boolean;
};

const noQueue: RunEnqueuer = {
  enqueue: async () => {
    throw new Error('this test context has no run queue: pass { withRunWorker: true }');
  },
};

export async function createTestContext(env: Record<string, string> = {}, options: TestContextOptions = {}): Promise<TestContext> {
  const database = await createTestDatabase();
  const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: database.url, PASSWORD_HASH_ROUNDS: '4', ...env });
  const demo = await seedDemo(database.db, config.PASSWORD_HASH_ROUNDS);
  const other = await seedOrganization(database.db, { name: 'Other County', slug: 'other' }, otherAccounts, config.PASSWORD_HASH_ROUNDS);
  const errors: unknown[] = [];
  const log = (e: unknown) => errors.push(e);
  const queue = options.withRunWorker ? await startRunQueue(config) : null;
  let proposalQueue: ProposalQueue | null = null;
  if (queue) {
    const executor = createRunExecutor(database.db, config, log, queue);
    await queue.work(1, (job) => executor.execute(job));
    const importer = createImportExecutor(database.db, config, log);
    await queue.workImports(1, ({ importId }) => importer.execute(importId));
    proposalQueue = await startProposalQueue(queue.boss, config);
    const proposalExecutor = createProposalExecutor(database.db, config, log);
    await proposalQueue.work(1, ({ proposalId }) => proposalExecutor.execute(proposalId));
  }
  const app = createApp({ config, db: database.db, pool: database.pool, log, clientDir: '/nonexistent', runQueue: queue ?? noQueue, ...(queue ? { importQueue: queue } : {}), proposalQueue: proposalQueue ?? undefined });
  return {
    ...database,
    drop: async () => {
      await queue?.stop();
      await database.drop();
    },
    app,
    config,
    demoOrganizationId: demo.organizationId,
    otherOrganizationId: other.organizationId,
    userIds: { ...demo.userIds, ...other.userIds },
    errors,
  };
}

export type SignedInAgent = { agent: ReturnType<typeof request.agent>; csrf: string };

export async function csrfFor(agent: ReturnType<typeof request.agent>): Promise<string> {
  const res = await agent.get('/api/auth/session').expect(200);
  return res.body.csrfToken as string;
}

export async function signIn(app: TestContext['app'], email: string, password: string): Promise<SignedInAgent> {
  const agent = request.agent(app);
  const csrf = await csrfFor(agent);
  const res = await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({ email, password });
  if (res.status !== 200) throw new Error(`sign-in of ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
  return { agent, csrf: res.body.csrfToken as string };
}

export function signInAs(app: TestContext['app'], role: Role) {
  const account = accountFor(role);
  return signIn(app, account.email, account.password);
}

export async function countRows(ctx: TestDatabase, table: string): Promise<number> {
  const { rows } = await ctx.pool.query<{ n: string }>(`SELECT count(*) AS n FROM "${table}"`);
  return Number(rows[0]!.n);
}

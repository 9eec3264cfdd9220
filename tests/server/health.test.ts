// /healthz and /readyz: public, cookie-free probes. Ready means the database and the queue's
// tables are reachable and the process is not shutting down; a failed check names no address.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createApp } from '../../server/app';
import { createDatabase } from '../../server/db/client';
import { createTestContext, type TestContext } from './support/test-app';

let ctx: TestContext;
beforeAll(async () => {
  ctx = await createTestContext();
});
afterAll(async () => {
  await ctx.drop();
});

const appWith = (over: Partial<Parameters<typeof createApp>[0]>) =>
  createApp({ config: ctx.config, db: ctx.db, pool: ctx.pool, clientDir: '/nonexistent', runQueue: { enqueue: async () => undefined }, log: () => undefined, ...over });

describe('health probes', () => {
  it('answers /healthz without a session cookie', async () => {
    const res = await request(ctx.app).get('/healthz').expect(200);
    expect(res.body).toEqual({ status: 'ok' });
    expect(res.headers['set-cookie']).toBeUndefined();
  });

  it('reports ready when the database and the queue tables are there', async () => {
    // The test template is migrated but pg-boss creates its schema on first start.
    await ctx.pool.query('CREATE SCHEMA IF NOT EXISTS pgboss; CREATE TABLE IF NOT EXISTS pgboss.job (id int)');
    const res = await request(ctx.app).get('/readyz').expect(200);
    expect(res.body).toEqual({ status: 'ready', checks: { database: 'ok', queue: 'ok' } });
  });

  it('is not ready while shutting down', async () => {
    const res = await request(appWith({ isStopping: () => true })).get('/readyz').expect(503);
    expect(res.body.status).toBe('stopping');
  });

  it('is not ready without its database, and says so without naming the address', async () => {
    const logged: unknown[] = [];
    const { db, pool } = createDatabase('postgres://nobody@127.0.0.1:1/none');
    try {
      const res = await request(appWith({ db, pool, log: (e) => logged.push(e) })).get('/readyz').expect(503);
      expect(res.body).toEqual({ status: 'not ready', checks: { database: 'unreachable', queue: 'unknown' } });
      expect(JSON.stringify(res.body)).not.toMatch(/127\.0\.0\.1|ECONNREFUSED/);
      expect(logged.length).toBeGreaterThanOrEqual(1);
    } finally {
      await pool.end();
    }
  });
});

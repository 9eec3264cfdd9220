// Test databases: one template migrated per test run (global-setup.ts), cloned for every test
// file, so files run in parallel on the real PostgreSQL without seeing each other's rows.
import { randomBytes } from 'node:crypto';
import pg from 'pg';
import { createDatabase, type Database } from '../../../server/db/client';

// Set by global-setup.ts for this test run.
export function templateDatabase(): string {
  const name = process.env.CUTLINE_TEST_TEMPLATE;
  if (!name) throw new Error('no test template database: run the tests through vitest (global setup)');
  return name;
}

/** Creation time and a random tail, so stale leftovers can be told from live databases. */
export function testDatabaseStamp(): string {
  return `${Math.floor(Date.now() / 1000)}_${randomBytes(5).toString('hex')}`;
}

export function baseUrl(): string {
  return process.env.CUTLINE_TEST_DATABASE_BASE_URL ?? `postgres://postgres@127.0.0.1:${process.env.CUTLINE_PG_PORT ?? 54329}/`;
}

export function databaseUrl(name: string): string {
  return new URL(name, baseUrl()).toString();
}

export async function withAdminClient<T>(fn: (client: pg.Client) => Promise<T>): Promise<T> {
  const client = new pg.Client({ connectionString: databaseUrl('postgres') });
  await client.connect();
  try {
    return await fn(client);
  } finally {
    await client.end();
  }
}

export type TestDatabase = { name: string; url: string; db: Database; pool: pg.Pool; drop: () => Promise<void> };

export async function createTestDatabase(): Promise<TestDatabase> {
  const name = `cutline_test_${testDatabaseStamp()}`;
  await withAdminClient((c) => c.query(`CREATE DATABASE "${name}" TEMPLATE "${templateDatabase()}"`));
  const url = databaseUrl(name);
  const { db, pool } = createDatabase(url);
  // DROP … WITH (FORCE) may reach a client that pool.end() is still closing; that is expected.
  pool.on('error', () => undefined);
  return {
    name,
    url,
    db,
    pool,
    drop: async () => {
      await pool.end();
      await withAdminClient((c) => c.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`));
    },
  };
}

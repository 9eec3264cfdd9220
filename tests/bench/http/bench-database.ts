// One throwaway database per bench run on the private cluster: PostgreSQL started if it is not,
// the committed migrations applied, the demo organization seeded, dropped at the end.
import { spawnSync } from 'node:child_process';
import pg from 'pg';
import { loadConfig } from '../../../server/config';
import { createDatabase } from '../../../server/db/client';
import { migrateDatabase } from '../../../server/db/migrate';
import { seedDemo } from '../../../server/seed/seed-demo';

const clusterBase = `postgres://postgres@127.0.0.1:${process.env.CUTLINE_PG_PORT ?? '54329'}/`;
const urlOf = (name: string) => new URL(name, clusterBase).toString();

async function withAdminClient<T>(fn: (client: pg.Client) => Promise<T>): Promise<T> {
  const client = new pg.Client({ connectionString: urlOf('postgres') });
  await client.connect();
  try {
    return await fn(client);
  } finally {
    await client.end();
  }
}

/** Starts the private cluster (idempotent); throws with the script's output when it cannot. */
export function ensurePostgres(root: string): void {
  const result = spawnSync('bash', ['docker-free-scripts/pg-start.sh'], { cwd: root, encoding: 'utf8' });
  if (result.status !== 0) throw new Error(`PostgreSQL could not be started:\n${result.stderr}${result.stdout}`);
}

export type BenchDatabase = { name: string; url: string; drop: () => Promise<void> };

export async function createBenchDatabase(): Promise<BenchDatabase> {
  const name = `cutline_bench_http_${Math.floor(Date.now() / 1000)}_${process.pid}`;
  await withAdminClient((c) => c.query(`CREATE DATABASE "${name}"`));
  const url = urlOf(name);
  const drop = () => withAdminClient((c) => c.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`)).then(() => undefined);
  try {
    await migrateDatabase(url);
    const { db, pool } = createDatabase(url);
    try {
      // The product's own hash cost, so signing in costs what it costs in use.
      await seedDemo(db, loadConfig({}).PASSWORD_HASH_ROUNDS);
    } finally {
      await pool.end();
    }
  } catch (e) {
    await drop().catch(() => undefined);
    throw e;
  }
  return { name, url, drop };
}

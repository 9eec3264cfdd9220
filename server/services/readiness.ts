// What /readyz checks: the database answers and the run queue's tables exist.
import type pg from 'pg';

export type ReadinessChecks = Record<string, string>;

export async function readinessChecks(pool: pg.Pool, log: (err: unknown) => void): Promise<ReadinessChecks> {
  const checks: ReadinessChecks = {};
  try {
    await pool.query('SELECT 1');
    checks.database = 'ok';
    // pg-boss keeps its tables in the pgboss schema; the queue is reachable when they are.
    const { rows } = await pool.query("SELECT to_regclass('pgboss.job') IS NOT NULL AS ok");
    checks.queue = rows[0]?.ok ? 'ok' : 'not initialised';
  } catch (e) {
    // The cause goes to the log; an unauthenticated probe learns no addresses or names.
    log(e);
    checks.database ??= 'unreachable';
    checks.queue ??= 'unknown';
  }
  return checks;
}

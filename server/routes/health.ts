// /healthz: the process answers. /readyz: it can reach the database and the run queue.
import { Router } from 'express';
import type pg from 'pg';

export function healthRouter(pool: pg.Pool): Router {
  const router = Router();
  router.get('/healthz', (_req, res) => {
    res.json({ status: 'ok' });
  });
  router.get('/readyz', async (_req, res) => {
    const checks: Record<string, string> = {};
    try {
      await pool.query('SELECT 1');
      checks.database = 'ok';
      // pg-boss keeps its tables in the pgboss schema; the queue is reachable when they are.
      const { rows } = await pool.query("SELECT to_regclass('pgboss.job') IS NOT NULL AS ok");
      checks.queue = rows[0]?.ok ? 'ok' : 'not initialised';
    } catch (e) {
      checks.database = checks.database ?? `unreachable: ${e instanceof Error ? e.message : String(e)}`;
    }
    const ready = Object.values(checks).every((v) => v === 'ok');
    res.status(ready ? 200 : 503).json({ status: ready ? 'ready' : 'not ready', checks });
  });
  return router;
}

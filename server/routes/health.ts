// /healthz: the process answers. /readyz: it can reach the database and the run queue, and is
// not shutting down (so a load balancer stops sending it requests first).
import { Router } from 'express';
import type pg from 'pg';

export function healthRouter(pool: pg.Pool, log: (err: unknown) => void, isStopping: () => boolean = () => false): Router {
  const router = Router();
  router.get('/healthz', (_req, res) => {
    res.json({ status: 'ok' });
  });
  router.get('/readyz', async (_req, res) => {
    if (isStopping()) {
      res.status(503).json({ status: 'stopping', checks: {} });
      return;
    }
    const checks: Record<string, string> = {};
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
    const ready = Object.values(checks).every((v) => v === 'ok');
    res.status(ready ? 200 : 503).json({ status: ready ? 'ready' : 'not ready', checks });
  });
  return router;
}

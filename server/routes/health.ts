// /healthz: the process answers. /readyz: it can reach the database and the run queue, and is
// not shutting down (so a load balancer stops sending it requests first).
import { Router } from 'express';
import type pg from 'pg';
import { readinessChecks } from '../services/readiness';

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
    const checks = await readinessChecks(pool, log);
    const ready = Object.values(checks).every((v) => v === 'ok');
    res.status(ready ? 200 : 503).json({ status: ready ? 'ready' : 'not ready', checks });
  });
  return router;
}

// /api/audit: the organization's audit trail, newest first, paged by id.
import { Router } from 'express';
import { auditQuerySchema } from '../../shared/api/audit';
import type { Database } from '../db/client';
import { actorOf, requireMember } from '../middleware/require-member';
import { listAudit } from '../services/audit';

export function auditRouter(db: Database): Router {
  const router = Router();
  router.get('/', requireMember('users:manage'), async (req, res) => {
    const query = auditQuerySchema.parse(req.query);
    res.json({ events: await listAudit(db, actorOf(req).organizationId, query) });
  });
  return router;
}

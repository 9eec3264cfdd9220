// /api/members: administrators manage who belongs to their organization, and in which role.
import { Router } from 'express';
import { memberCreateSchema, memberUpdateSchema, userIdParamsSchema } from '../../shared/api/users';
import type { Database } from '../db/client';
import type { Config } from '../config';
import { actorOf, requireMember } from '../middleware/require-member';
import { createMember, listMembers, removeMember, updateMemberRole } from '../services/users';
import { unlockMember } from '../services/sign-in-lockout';

export function membersRouter(db: Database, config: Config): Router {
  const router = Router();
  router.use(requireMember('users:manage'));

  router.get('/', async (req, res) => {
    res.json({ members: await listMembers(db, actorOf(req).organizationId) });
  });

  router.post('/', async (req, res) => {
    const input = memberCreateSchema.parse(req.body);
    res.status(201).json(await createMember(db, actorOf(req), input, config.PASSWORD_HASH_ROUNDS));
  });

  router.patch('/:userId', async (req, res) => {
    const { userId } = userIdParamsSchema.parse(req.params);
    const { role } = memberUpdateSchema.parse(req.body);
    res.json(await updateMemberRole(db, actorOf(req), userId, role));
  });

  // Lifts a sign-in lockout (server/services/sign-in-lockout.ts) before it runs out.
  router.post('/:userId/unlock', async (req, res) => {
    const { userId } = userIdParamsSchema.parse(req.params);
    await unlockMember(db, actorOf(req), userId);
    const member = (await listMembers(db, actorOf(req).organizationId)).find((m) => m.userId === userId);
    res.json(member);
  });

  router.delete('/:userId', async (req, res) => {
    const { userId } = userIdParamsSchema.parse(req.params);
    await removeMember(db, actorOf(req), userId);
    res.status(204).end();
  });

  return router;
}

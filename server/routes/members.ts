// /api/members: administrators manage who belongs to their organization, and in which role.
import { Router } from 'express';
import { memberCreateSchema, memberPasswordSchema, memberUpdateSchema, userIdParamsSchema } from '../../shared/api/users';
import type { Database } from '../db/client';
import type { Config } from '../config';
import { listCaps } from '../../shared/api/pagination';
import { pageOf, sendPage } from '../http/list-page';
import { actorOf, requireMember } from '../middleware/require-member';
import { createMember, getMember, listMembers, removeMember, updateMemberRole } from '../services/users';
import { unlockMember } from '../services/sign-in-lockout';
import { resetMemberPassword } from '../services/account-passwords';

export function membersRouter(db: Database, config: Config): Router {
  const router = Router();
  router.use(requireMember('users:manage'));

  router.get('/', async (req, res) => {
    const page = pageOf(req, listCaps.members);
    sendPage(res, 'members', await listMembers(db, actorOf(req).organizationId, page), page);
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
    res.json(await getMember(db, actorOf(req).organizationId, userId));
  });

  // Sets a new password for a member who forgot theirs; their sessions end and a lock lifts.
  router.post('/:userId/password', async (req, res) => {
    const { userId } = userIdParamsSchema.parse(req.params);
    const { password } = memberPasswordSchema.parse(req.body);
    await resetMemberPassword(db, actorOf(req), userId, password, config.PASSWORD_HASH_ROUNDS);
    res.json(await getMember(db, actorOf(req).organizationId, userId));
  });

  router.delete('/:userId', async (req, res) => {
    const { userId } = userIdParamsSchema.parse(req.params);
    await removeMember(db, actorOf(req), userId);
    res.status(204).end();
  });

  return router;
}

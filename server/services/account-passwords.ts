// Passwords after an account exists: a person changes their own (the current one required), an
// administrator sets a new one for a member of their organization. Both are audited, clear a
// sign-in lockout, and end the account's other sessions.
import { and, eq, ne } from 'drizzle-orm';
import type { Database } from '../db/client';
import { memberships, users } from '../db/schema';
import { BadRequestError, ConflictError, NotFoundError } from '../errors';
import { hashPassword, verifyPassword } from './password';
import { endSessionsOf } from './user-sessions';
import { forgetAuthUser } from './auth-user-cache';
import { recordAudit, type Actor } from './audit';
import type { OwnPasswordChange } from '../../shared/api/users';

/**
 * The signed-in person changes their own password. A wrong current password changes nothing
 * (400 under `currentPassword`); the route rate-limits the attempts. The session making the
 * change stays signed in; every other session of the account ends. One audit entry per
 * organization the person belongs to, as each keeps its own trail.
 */
export async function changeOwnPassword(db: Database, userId: string, sessionId: string, input: OwnPasswordChange, rounds: number): Promise<void> {
  const [row] = await db.select({ passwordHash: users.passwordHash }).from(users).where(eq(users.id, userId));
  if (!row) throw new NotFoundError('account');
  if (!(await verifyPassword(input.currentPassword, row.passwordHash))) {
    throw new BadRequestError('That is not your current password.', [{ path: 'currentPassword', message: 'That is not your current password.' }]);
  }
  const passwordHash = await hashPassword(input.newPassword, rounds);
  await db.transaction(async (tx) => {
    await tx.update(users).set({ passwordHash, failedSignIns: 0, lockedUntil: null, updatedAt: new Date() }).where(eq(users.id, userId));
    const ended = await endSessionsOf(tx, userId, sessionId);
    const joined = await tx.select({ organizationId: memberships.organizationId }).from(memberships).where(eq(memberships.userId, userId));
    for (const { organizationId } of joined) {
      await recordAudit(tx, { userId, organizationId }, 'account.password-change', 'user', userId, { otherSessionsEnded: ended });
    }
  });
  forgetAuthUser(userId);
}

/**
 * An administrator sets a new password for a member of their own organization (404 for anyone
 * else). Refused for the administrator's own account (they change it with their current one)
 * and for a person who also belongs to another organization: an administrator of one
 * organization must not be able to take over an account another organization relies on.
 */
export async function resetMemberPassword(db: Database, actor: Actor, userId: string, password: string, rounds: number): Promise<void> {
  const passwordHash = await hashPassword(password, rounds);
  await db.transaction(async (tx) => {
    const [member] = await tx
      .select({ userId: memberships.userId })
      .from(memberships)
      .where(and(eq(memberships.organizationId, actor.organizationId), eq(memberships.userId, userId)))
      .for('update');
    if (!member) throw new NotFoundError('member');
    if (userId === actor.userId) throw new ConflictError('Change your own password from your account page, with your current password.');
    const [elsewhere] = await tx
      .select({ organizationId: memberships.organizationId })
      .from(memberships)
      .where(and(eq(memberships.userId, userId), ne(memberships.organizationId, actor.organizationId)))
      .limit(1);
    if (elsewhere) throw new ConflictError('This person also belongs to another organization, so only they can change their password.');
    await tx.update(users).set({ passwordHash, failedSignIns: 0, lockedUntil: null, updatedAt: new Date() }).where(eq(users.id, userId));
    const ended = await endSessionsOf(tx, userId);
    await recordAudit(tx, actor, 'member.password-reset', 'user', userId, { sessionsEnded: ended });
  });
  forgetAuthUser(userId);
}

// Account lockout: failed sign-ins in a row are counted on the account (whatever address they
// come from, which the per-address rate limit cannot see); enough of them lock it for a while.
// A successful sign-in or an administrator's unlock clears the count.
import { and, eq, sql } from 'drizzle-orm';
import type { Database } from '../db/client';
import type { Config } from '../config';
import { memberships, users } from '../db/schema';
import { recordAudit, type Actor } from './audit';
import { NotFoundError } from '../errors';

/** Counts one failure in a single statement (so concurrent attempts all count); returns the lock's end when this one locked the account. */
export async function recordFailedSignIn(
  db: Database,
  userId: string,
  config: Pick<Config, 'SIGN_IN_LOCKOUT_FAILURES' | 'SIGN_IN_LOCKOUT_MINUTES'>,
): Promise<Date | undefined> {
  return db.transaction(async (tx) => {
    const [row] = await tx
      .update(users)
      .set({ failedSignIns: sql`${users.failedSignIns} + 1` })
      .where(eq(users.id, userId))
      .returning({ failedSignIns: users.failedSignIns });
    if (!row || row.failedSignIns < config.SIGN_IN_LOCKOUT_FAILURES) return undefined;
    const lockedUntil = new Date(Date.now() + config.SIGN_IN_LOCKOUT_MINUTES * 60_000);
    await tx.update(users).set({ failedSignIns: 0, lockedUntil }).where(eq(users.id, userId));
    const organizations = await tx.select({ organizationId: memberships.organizationId }).from(memberships).where(eq(memberships.userId, userId));
    for (const { organizationId } of organizations) {
      await recordAudit(tx, { userId: null, organizationId }, 'session.locked', 'user', userId, { failures: row.failedSignIns, lockedUntil: lockedUntil.toISOString() });
    }
    return lockedUntil;
  });
}

export async function clearFailedSignIns(db: Database, userId: string): Promise<void> {
  await db
    .update(users)
    .set({ failedSignIns: 0, lockedUntil: null })
    .where(and(eq(users.id, userId), sql`(${users.failedSignIns} > 0 OR ${users.lockedUntil} IS NOT NULL)`));
}

/** An administrator lifts a lock on a member of their own organization. */
export async function unlockMember(db: Database, actor: Actor, userId: string): Promise<void> {
  await db.transaction(async (tx) => {
    const [member] = await tx
      .select({ userId: memberships.userId })
      .from(memberships)
      .where(and(eq(memberships.organizationId, actor.organizationId), eq(memberships.userId, userId)));
    if (!member) throw new NotFoundError('member');
    await tx.update(users).set({ failedSignIns: 0, lockedUntil: null }).where(eq(users.id, userId));
    await recordAudit(tx, actor, 'member.unlock', 'user', userId);
  });
}

// Account back-off: failed sign-ins in a row are counted on the account (whatever address they
// come from, which the per-address rate limit cannot see). After SIGN_IN_LOCKOUT_FAILURES of them
// the account waits before its next attempt: SIGN_IN_BACKOFF_SECONDS after that failure, twice
// as long after the next, and so on up to SIGN_IN_LOCKOUT_MINUTES. Attempts during a wait are
// refused without being counted, so a guesser gets one try per wait and the waits soon reach
// the longest; a person who mistyped a few times waits seconds, not the longest wait. The count
// starts again after a success, an administrator's unlock or new password, or once the account
// has been quiet for a whole longest wait after its last one ended.
import { and, eq, sql } from 'drizzle-orm';
import type { Database } from '../db/client';
import type { Config } from '../config';
import { memberships, users } from '../db/schema';
import { recordAudit, type Actor } from './audit';
import { NotFoundError } from '../errors';

export type BackoffConfig = Pick<Config, 'SIGN_IN_LOCKOUT_FAILURES' | 'SIGN_IN_BACKOFF_SECONDS' | 'SIGN_IN_LOCKOUT_MINUTES'>;

/** The wait after the `failures`-th failure in a row, in milliseconds (0 below the threshold). */
export function backoffMilliseconds(failures: number, config: BackoffConfig): number {
  if (failures < config.SIGN_IN_LOCKOUT_FAILURES) return 0;
  const doublings = Math.min(failures - config.SIGN_IN_LOCKOUT_FAILURES, 40);
  return Math.min(config.SIGN_IN_LOCKOUT_MINUTES * 60_000, config.SIGN_IN_BACKOFF_SECONDS * 1000 * 2 ** doublings);
}

/** Counts one failure in a single statement (so concurrent attempts all count); returns the wait's end when this one starts a wait. */
export async function recordFailedSignIn(db: Database, userId: string, config: BackoffConfig): Promise<Date | undefined> {
  const quietMs = config.SIGN_IN_LOCKOUT_MINUTES * 60_000;
  return db.transaction(async (tx) => {
    const [row] = await tx
      .update(users)
      .set({
        failedSignIns: sql`CASE WHEN ${users.lockedUntil} IS NOT NULL AND ${users.lockedUntil} < now() - make_interval(secs => ${quietMs / 1000}) THEN 1 ELSE ${users.failedSignIns} + 1 END`,
      })
      .where(eq(users.id, userId))
      .returning({ failedSignIns: users.failedSignIns });
    const waitMs = row ? backoffMilliseconds(row.failedSignIns, config) : 0;
    if (!row || waitMs === 0) return undefined;
    const lockedUntil = new Date(Date.now() + waitMs);
    await tx.update(users).set({ lockedUntil }).where(eq(users.id, userId));
    const organizations = await tx.select({ organizationId: memberships.organizationId }).from(memberships).where(eq(memberships.userId, userId));
    for (const { organizationId } of organizations) {
      await recordAudit(tx, { userId: null, organizationId }, 'session.locked', 'user', userId, { failures: row.failedSignIns, lockedUntil: lockedUntil.toISOString(), waitSeconds: waitMs / 1000 });
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

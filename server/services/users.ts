// Users and memberships: lookups for sign-in, and the administrator's member management.
import { and, asc, eq } from 'drizzle-orm';
import type { Database, Tx } from '../db/client';
import { memberships, organizations, users } from '../db/schema';
import type { Member, MemberCreate } from '../../shared/api/users';
import type { Role } from '../../shared/api/roles';
import { ConflictError, NotFoundError } from '../errors';
import { hashPassword } from './password';
import { forgetAuthUser } from './auth-user-cache';
import { endSessionsOf } from './user-sessions';
import { recordAudit, type Actor } from './audit';
import { limitPlusOne, type Page } from '../../shared/api/pagination';

export async function findUserForSignIn(db: Database, email: string) {
  const [row] = await db.select().from(users).where(eq(users.email, email.toLowerCase()));
  return row;
}

// Runs on every signed-in request (passport's deserializeUser): one round trip, the user's
// rows joined with their memberships.
export async function loadAuthUser(db: Database, userId: string): Promise<Express.User | null> {
  const rows = await db
    .select({
      id: users.id,
      email: users.email,
      displayName: users.displayName,
      disabled: users.disabled,
      organizationId: memberships.organizationId,
      organizationName: organizations.name,
      role: memberships.role,
    })
    .from(users)
    .leftJoin(memberships, eq(memberships.userId, users.id))
    .leftJoin(organizations, eq(organizations.id, memberships.organizationId))
    .where(eq(users.id, userId))
    .orderBy(asc(organizations.name));
  const user = rows[0];
  if (!user || user.disabled) return null;
  const joined = rows.flatMap((r) =>
    r.organizationId !== null && r.organizationName !== null && r.role !== null
      ? [{ organizationId: r.organizationId, organizationName: r.organizationName, role: r.role }]
      : [],
  );
  return { id: user.id, email: user.email, displayName: user.displayName, memberships: joined };
}

function toMember(row: { userId: string; email: string; displayName: string; role: Role; joinedAt: Date; lockedUntil: Date | null }): Member {
  const locked = row.lockedUntil && row.lockedUntil > new Date() ? row.lockedUntil.toISOString() : null;
  return { ...row, joinedAt: row.joinedAt.toISOString(), lockedUntil: locked };
}

const memberColumns = {
  userId: users.id,
  email: users.email,
  displayName: users.displayName,
  role: memberships.role,
  joinedAt: memberships.joinedAt,
  lockedUntil: users.lockedUntil,
};

export async function listMembers(db: Database, organizationId: string, page: Page): Promise<Member[]> {
  const rows = await db
    .select(memberColumns)
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.organizationId, organizationId))
    .orderBy(asc(users.displayName), asc(users.id))
    .limit(limitPlusOne(page))
    .offset(page.offset);
  return rows.map(toMember);
}

function membershipQuery(db: Database | Tx, organizationId: string, userId: string) {
  return db
    .select(memberColumns)
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.organizationId, organizationId), eq(memberships.userId, userId)));
}

export async function getMember(db: Database, organizationId: string, userId: string): Promise<Member> {
  const [row] = await membershipQuery(db, organizationId, userId);
  if (!row) throw new NotFoundError('member');
  return toMember(row);
}

/**
 * Adds a member. A new address gets an account; an address whose account belongs to no
 * organization any more (a member removed earlier, whose account row stays for the audit
 * trail) is taken back: the administrator's name and password replace the old ones, any old
 * lockout and sessions end, and the audit entry says it was a return. An address already in
 * this organization, or in another one, is refused (409): taking over an account another
 * organization relies on is not an administrator's to do.
 */
export async function createMember(db: Database, actor: Actor, input: MemberCreate, rounds: number): Promise<Member> {
  const passwordHash = await hashPassword(input.password, rounds);
  const member = await db.transaction(async (tx) => {
    // Locked, so two administrators adding the same returning person at once take turns.
    const [existing] = await tx.select({ id: users.id, disabled: users.disabled }).from(users).where(eq(users.email, input.email)).for('update');
    let userId: string;
    if (existing) {
      const joined = await tx.select({ organizationId: memberships.organizationId }).from(memberships).where(eq(memberships.userId, existing.id));
      if (joined.some((m) => m.organizationId === actor.organizationId)) throw new ConflictError('That person is already a member of this organization.');
      if (joined.length > 0) throw new ConflictError('A user with that e-mail address already exists.');
      // Disabled by the installation's operator (in the database): not an administrator's to undo.
      if (existing.disabled) throw new ConflictError('That account is disabled on this installation.');
      await tx
        .update(users)
        .set({ displayName: input.displayName, passwordHash, failedSignIns: 0, lockedUntil: null, updatedAt: new Date() })
        .where(eq(users.id, existing.id));
      await endSessionsOf(tx, existing.id);
      userId = existing.id;
    } else {
      const [user] = await tx.insert(users).values({ email: input.email, displayName: input.displayName, passwordHash }).returning({ id: users.id });
      userId = user!.id;
    }
    const [membership] = await tx
      .insert(memberships)
      .values({ userId, organizationId: actor.organizationId, role: input.role })
      .returning();
    await recordAudit(tx, actor, 'member.create', 'user', userId, { email: input.email, role: input.role, ...(existing ? { returning: true } : {}) });
    return toMember({ userId, email: input.email, displayName: input.displayName, role: membership!.role, joinedAt: membership!.joinedAt, lockedUntil: null });
  });
  forgetAuthUser(member.userId);
  return member;
}

async function lockMembership(tx: Tx, organizationId: string, userId: string) {
  const [row] = await membershipQuery(tx, organizationId, userId).for('update', { of: memberships });
  if (!row) throw new NotFoundError('member');
  return row;
}

/**
 * Locks every administrator membership of the organization, always in the same order, before
 * any role change or removal: two administrators demoting each other at once are then
 * serialised, and the second sees the first's change (so at least one administrator remains),
 * instead of both seeing the other still an administrator.
 */
async function lockAdministrators(tx: Tx, organizationId: string): Promise<string[]> {
  const admins = await tx
    .select({ userId: memberships.userId })
    .from(memberships)
    .where(and(eq(memberships.organizationId, organizationId), eq(memberships.role, 'admin')))
    .orderBy(asc(memberships.userId))
    .for('update');
  return admins.map((a) => a.userId);
}

function assertAnotherAdmin(admins: string[], userId: string) {
  if (!admins.some((a) => a !== userId)) {
    throw new ConflictError('An organization needs at least one administrator.');
  }
}

export async function updateMemberRole(db: Database, actor: Actor, userId: string, role: Role): Promise<Member> {
  const member = await db.transaction(async (tx) => {
    const admins = await lockAdministrators(tx, actor.organizationId);
    const current = await lockMembership(tx, actor.organizationId, userId);
    if (current.role === 'admin' && role !== 'admin') assertAnotherAdmin(admins, userId);
    await tx
      .update(memberships)
      .set({ role })
      .where(and(eq(memberships.organizationId, actor.organizationId), eq(memberships.userId, userId)));
    await recordAudit(tx, actor, 'member.role', 'user', userId, { from: current.role, to: role });
    return toMember({ ...current, role });
  });
  // After the commit, so a request in between cannot cache the old role again.
  forgetAuthUser(userId);
  return member;
}

export async function removeMember(db: Database, actor: Actor, userId: string): Promise<void> {
  await db.transaction(async (tx) => {
    const admins = await lockAdministrators(tx, actor.organizationId);
    const current = await lockMembership(tx, actor.organizationId, userId);
    if (current.role === 'admin') assertAnotherAdmin(admins, userId);
    await tx
      .delete(memberships)
      .where(and(eq(memberships.organizationId, actor.organizationId), eq(memberships.userId, userId)));
    await recordAudit(tx, actor, 'member.remove', 'user', userId, { email: current.email });
  });
  forgetAuthUser(userId);
}

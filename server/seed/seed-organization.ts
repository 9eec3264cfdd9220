// Creates an organization with the given accounts, or brings an existing one up to date.
// Idempotent: running it twice changes nothing the second time.
import { eq } from 'drizzle-orm';
import type { Database } from '../db/client';
import { memberships, organizations, users } from '../db/schema';
import type { Role } from '../../shared/api/roles';
import { hashPassword, verifyPassword } from '../services/password';

export type SeedAccount = { role: Role; email: string; displayName: string; password: string };

export async function seedOrganization(
  db: Database,
  organization: { name: string; slug: string },
  accounts: SeedAccount[],
  rounds: number,
): Promise<{ organizationId: string; userIds: Record<string, string> }> {
  return db.transaction(async (tx) => {
    const [org] = await tx
      .insert(organizations)
      .values(organization)
      .onConflictDoUpdate({ target: organizations.slug, set: { name: organization.name } })
      .returning();
    const userIds: Record<string, string> = {};
    for (const account of accounts) {
      const [existing] = await tx.select().from(users).where(eq(users.email, account.email));
      let userId = existing?.id;
      if (!existing) {
        const passwordHash = await hashPassword(account.password, rounds);
        const [created] = await tx.insert(users).values({ email: account.email, displayName: account.displayName, passwordHash }).returning();
        userId = created!.id;
      } else if (!(await verifyPassword(account.password, existing.passwordHash))) {
        await tx.update(users).set({ passwordHash: await hashPassword(account.password, rounds) }).where(eq(users.id, existing.id));
      }
      await tx
        .insert(memberships)
        .values({ userId: userId!, organizationId: org!.id, role: account.role })
        .onConflictDoUpdate({ target: [memberships.userId, memberships.organizationId], set: { role: account.role } });
      userIds[account.email] = userId!;
    }
    return { organizationId: org!.id, userIds };
  });
}

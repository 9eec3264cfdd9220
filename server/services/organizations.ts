// Creating an organization with its first administrator: the way into a fresh installation
// (`npm run org:create`), since members are otherwise added by an administrator of their own
// organization. Refuses an existing slug or e-mail address and changes nothing then.
import { eq } from 'drizzle-orm';
import type { Database } from '../db/client';
import { memberships, organizations, users } from '../db/schema';
import type { OrganizationCreate } from '../../shared/api/organizations';
import { ConflictError } from '../errors';
import { hashPassword } from './password';
import { recordAudit } from './audit';

export async function createOrganizationWithAdministrator(
  db: Database,
  input: OrganizationCreate,
  rounds: number,
): Promise<{ organizationId: string; userId: string }> {
  const passwordHash = await hashPassword(input.administrator.password, rounds);
  return db.transaction(async (tx) => {
    const [slugTaken] = await tx.select({ id: organizations.id }).from(organizations).where(eq(organizations.slug, input.organization.slug));
    if (slugTaken) throw new ConflictError(`An organization with the short name "${input.organization.slug}" already exists.`);
    const [emailTaken] = await tx.select({ id: users.id }).from(users).where(eq(users.email, input.administrator.email));
    if (emailTaken) throw new ConflictError('A user with that e-mail address already exists.');
    const [organization] = await tx.insert(organizations).values(input.organization).returning({ id: organizations.id });
    const [user] = await tx
      .insert(users)
      .values({ email: input.administrator.email, displayName: input.administrator.displayName, passwordHash })
      .returning({ id: users.id });
    await tx.insert(memberships).values({ userId: user!.id, organizationId: organization!.id, role: 'admin' });
    // No one is signed in: the audit rows name no actor, and say the command made them.
    const actor = { userId: null, organizationId: organization!.id };
    await recordAudit(tx, actor, 'organization.create', 'organization', organization!.id, { name: input.organization.name, slug: input.organization.slug, by: 'org:create command' });
    await recordAudit(tx, actor, 'member.create', 'user', user!.id, { email: input.administrator.email, role: 'admin', by: 'org:create command' });
    return { organizationId: organization!.id, userId: user!.id };
  });
}

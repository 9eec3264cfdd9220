// The demo organization and its accounts (and, once road layers exist, its ready plan).
import { and, eq } from 'drizzle-orm';
import type { Database } from '../db/client';
import { plans } from '../db/schema';
import { demoAccounts, demoOrganization } from './demo-accounts';
import { seedOrganization } from './seed-organization';

export const demoPlanName = 'Demo town evacuation';

export async function seedDemo(db: Database, rounds: number) {
  const { organizationId, userIds } = await seedOrganization(db, demoOrganization, demoAccounts, rounds);
  const [existing] = await db
    .select({ id: plans.id })
    .from(plans)
    .where(and(eq(plans.organizationId, organizationId), eq(plans.name, demoPlanName)));
  if (!existing) {
    await db.insert(plans).values({
      organizationId,
      name: demoPlanName,
      description: 'An invented town for trying Cutline: its roads, evacuation zones and shelters.',
      createdBy: userIds['planner@cutline.example'] ?? null,
    });
  }
  return { organizationId, userIds };
}

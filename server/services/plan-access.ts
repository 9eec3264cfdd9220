// Every plan-scoped change goes through here: the plan must belong to the actor's organization
// (else it is "not found"), and the plan's data version moves on by one.
import { and, eq, sql } from 'drizzle-orm';
import type { Database, Tx } from '../db/client';
import { plans } from '../db/schema';
import { NotFoundError } from '../errors';

export async function assertPlanInOrganization(db: Database | Tx, organizationId: string, planId: string): Promise<void> {
  const [row] = await db.select({ id: plans.id }).from(plans).where(and(eq(plans.id, planId), eq(plans.organizationId, organizationId)));
  if (!row) throw new NotFoundError('plan');
}

/** The plan's data version, in the query that checks its organization: what names its roads', zones' and shelters' content. */
export async function planDataVersion(db: Database | Tx, organizationId: string, planId: string): Promise<number> {
  const [row] = await db.select({ dataVersion: plans.dataVersion }).from(plans).where(and(eq(plans.id, planId), eq(plans.organizationId, organizationId)));
  if (!row) throw new NotFoundError('plan');
  return row.dataVersion;
}

/** Locks the plan row for the rest of the transaction and returns its new data version. */
export async function bumpDataVersion(tx: Tx, organizationId: string, planId: string): Promise<number> {
  const [row] = await tx
    .update(plans)
    .set({ dataVersion: sql`${plans.dataVersion} + 1`, updatedAt: new Date() })
    .where(and(eq(plans.id, planId), eq(plans.organizationId, organizationId)))
    .returning({ dataVersion: plans.dataVersion });
  if (!row) throw new NotFoundError('plan');
  return row.dataVersion;
}

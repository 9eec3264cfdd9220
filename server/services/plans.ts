// Plans of one organization. Every query filters by the actor's organization, so a plan of
// another organization is simply not found.
import { asc, and, count, desc, eq } from 'drizzle-orm';
import type { Database } from '../db/client';
import { briefings, plans } from '../db/schema';
import type { Plan, PlanCreate, PlanUpdate } from '../../shared/api/plans';
import { ConflictError, NotFoundError } from '../errors';
import { recordAudit, type Actor } from './audit';
import { limitPlusOne, type Page } from '../../shared/api/pagination';

type PlanRow = typeof plans.$inferSelect;

function toPlan(row: PlanRow): Plan {
  return { ...row, createdAt: row.createdAt.toISOString(), updatedAt: row.updatedAt.toISOString() };
}

export async function listPlans(db: Database, organizationId: string, page: Page): Promise<Plan[]> {
  const rows = await db
    .select()
    .from(plans)
    .where(eq(plans.organizationId, organizationId))
    .orderBy(desc(plans.updatedAt), asc(plans.id))
    .limit(limitPlusOne(page))
    .offset(page.offset);
  return rows.map(toPlan);
}

export async function getPlan(db: Database, organizationId: string, planId: string): Promise<Plan> {
  const [row] = await db.select().from(plans).where(and(eq(plans.id, planId), eq(plans.organizationId, organizationId)));
  if (!row) throw new NotFoundError('plan');
  return toPlan(row);
}

export async function createPlan(db: Database, actor: Actor, input: PlanCreate): Promise<Plan> {
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(plans)
      .values({ ...input, organizationId: actor.organizationId, createdBy: actor.userId })
      .returning();
    await recordAudit(tx, actor, 'plan.create', 'plan', row!.id, { name: input.name });
    return toPlan(row!);
  });
}

export async function updatePlan(db: Database, actor: Actor, planId: string, input: PlanUpdate): Promise<Plan> {
  return db.transaction(async (tx) => {
    const [row] = await tx
      .update(plans)
      .set({ ...input, updatedAt: new Date() })
      .where(and(eq(plans.id, planId), eq(plans.organizationId, actor.organizationId)))
      .returning();
    if (!row) throw new NotFoundError('plan');
    await recordAudit(tx, actor, 'plan.update', 'plan', planId, input);
    return toPlan(row);
  });
}

export async function deletePlan(db: Database, actor: Actor, planId: string): Promise<void> {
  await db.transaction(async (tx) => {
    // Briefings are part of the record and keep their plan (no cascade in the schema): a plan
    // with any is refused with the reason, rather than failing on the foreign key.
    const [plan] = await tx
      .select({ id: plans.id })
      .from(plans)
      .where(and(eq(plans.id, planId), eq(plans.organizationId, actor.organizationId)))
      .for('update');
    if (!plan) throw new NotFoundError('plan');
    const [{ n } = { n: 0 }] = await tx.select({ n: count() }).from(briefings).where(eq(briefings.planId, planId));
    if (n > 0) {
      throw new ConflictError(
        `This plan has ${n} briefing${n === 1 ? '' : 's'}, which ${n === 1 ? 'is' : 'are'} part of the record, so it cannot be deleted. Keep it, or rename it to mark it as no longer in use.`,
      );
    }
    const [row] = await tx
      .delete(plans)
      .where(and(eq(plans.id, planId), eq(plans.organizationId, actor.organizationId)))
      .returning({ id: plans.id, name: plans.name });
    if (!row) throw new NotFoundError('plan');
    await recordAudit(tx, actor, 'plan.delete', 'plan', planId, { name: row.name });
  });
}

// Scenarios of a plan: create, edit, delete. They never alter the base data.
import { and, asc, eq } from 'drizzle-orm';
import type { Database } from '../db/client';
import { scenarios } from '../db/schema';
import type { Scenario } from '../../shared/api/scenarios';
import { scenarioCreateSchema, scenarioUpdateSchema, storedOverlay } from '../../shared/api/scenarios';
import type { z } from 'zod';
import { NotFoundError } from '../errors';
import { recordAudit, type Actor } from './audit';
import { assertPlanInOrganization } from './plan-access';
import { limitPlusOne, type Page } from '../../shared/api/pagination';

type Row = typeof scenarios.$inferSelect;
function toScenario(r: Row): Scenario {
  return { id: r.id, planId: r.planId, name: r.name, description: r.description, overlay: storedOverlay(r.overlay), createdAt: r.createdAt.toISOString(), updatedAt: r.updatedAt.toISOString() };
}

export async function listScenarios(db: Database, organizationId: string, planId: string, page: Page): Promise<Scenario[]> {
  await assertPlanInOrganization(db, organizationId, planId);
  const rows = await db
    .select()
    .from(scenarios)
    .where(eq(scenarios.planId, planId))
    .orderBy(asc(scenarios.createdAt), asc(scenarios.id))
    .limit(limitPlusOne(page))
    .offset(page.offset);
  return rows.map(toScenario);
}

export async function getScenario(db: Database, organizationId: string, planId: string, scenarioId: string): Promise<Scenario> {
  await assertPlanInOrganization(db, organizationId, planId);
  const [row] = await db.select().from(scenarios).where(and(eq(scenarios.id, scenarioId), eq(scenarios.planId, planId)));
  if (!row) throw new NotFoundError('scenario');
  return toScenario(row);
}

export async function createScenario(db: Database, actor: Actor, planId: string, input: z.output<typeof scenarioCreateSchema>): Promise<Scenario> {
  return db.transaction(async (tx) => {
    await assertPlanInOrganization(tx, actor.organizationId, planId);
    const [row] = await tx.insert(scenarios).values({ ...input, planId, createdBy: actor.userId }).returning();
    await recordAudit(tx, actor, 'scenario.create', 'scenario', row!.id, { planId, name: input.name });
    return toScenario(row!);
  });
}

export async function updateScenario(db: Database, actor: Actor, planId: string, scenarioId: string, patch: z.output<typeof scenarioUpdateSchema>): Promise<Scenario> {
  return db.transaction(async (tx) => {
    await assertPlanInOrganization(tx, actor.organizationId, planId);
    const [row] = await tx
      .update(scenarios)
      .set({ ...patch, updatedAt: new Date() })
      .where(and(eq(scenarios.id, scenarioId), eq(scenarios.planId, planId)))
      .returning();
    if (!row) throw new NotFoundError('scenario');
    await recordAudit(tx, actor, 'scenario.update', 'scenario', scenarioId, { planId, fields: Object.keys(patch) });
    return toScenario(row);
  });
}

export async function deleteScenario(db: Database, actor: Actor, planId: string, scenarioId: string): Promise<void> {
  await db.transaction(async (tx) => {
    await assertPlanInOrganization(tx, actor.organizationId, planId);
    const [row] = await tx.delete(scenarios).where(and(eq(scenarios.id, scenarioId), eq(scenarios.planId, planId))).returning({ name: scenarios.name });
    if (!row) throw new NotFoundError('scenario');
    await recordAudit(tx, actor, 'scenario.delete', 'scenario', scenarioId, { planId, name: row.name });
  });
}

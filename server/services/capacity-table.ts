// The plan's capacity table: the published defaults until a planner changes them.
import { eq } from 'drizzle-orm';
import type { Database } from '../db/client';
import { capacityTables } from '../db/schema';
import type { CapacityTable } from '../../shared/api/capacity-table';
import { defaultCapacityTable } from '../../shared/model/capacity-defaults';
import { recordAudit, type Actor } from './audit';
import { assertPlanInOrganization, bumpDataVersion } from './plan-access';

export async function getCapacityTable(db: Database, organizationId: string, planId: string): Promise<CapacityTable> {
  await assertPlanInOrganization(db, organizationId, planId);
  const [row] = await db.select().from(capacityTables).where(eq(capacityTables.planId, planId));
  return row?.table ?? defaultCapacityTable();
}

export async function putCapacityTable(db: Database, actor: Actor, planId: string, table: CapacityTable): Promise<CapacityTable> {
  return db.transaction(async (tx) => {
    const version = await bumpDataVersion(tx, actor.organizationId, planId);
    await tx
      .insert(capacityTables)
      .values({ planId, table })
      .onConflictDoUpdate({ target: capacityTables.planId, set: { table, updatedAt: new Date() } });
    await recordAudit(tx, actor, 'capacity-table.update', 'plan', planId, { capacityFactor: table.capacityFactor, dataVersion: version });
    return table;
  });
}

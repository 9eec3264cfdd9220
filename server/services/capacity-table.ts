// The plan's capacity table: the published defaults until a planner changes them. Each change
// records, in the audit trail, every cell it changed (before and after); a value changed must
// come with a new source, so the table never prints an old source beside a new number.
import { and, desc, eq } from 'drizzle-orm';
import type { Database } from '../db/client';
import { auditEvents, capacityTables, users } from '../db/schema';
import {
  capacityTableChanges,
  capacityTableChangeSchema,
  valuesMissingNewSource,
  type CapacityTable,
  type CapacityTableHistoryEntry,
} from '../../shared/api/capacity-table';
import { limitPlusOne, type Page } from '../../shared/api/pagination';
import { defaultCapacityTable } from '../../shared/model/capacity-defaults';
import { BadRequestError } from '../errors';
import { recordAudit, type Actor } from './audit';
import { assertPlanInOrganization, bumpDataVersion } from './plan-access';

const UPDATE_ACTION = 'capacity-table.update';

export async function getCapacityTable(db: Database, organizationId: string, planId: string): Promise<CapacityTable> {
  await assertPlanInOrganization(db, organizationId, planId);
  const [row] = await db.select().from(capacityTables).where(eq(capacityTables.planId, planId));
  return row?.table ?? defaultCapacityTable();
}

export async function putCapacityTable(db: Database, actor: Actor, planId: string, table: CapacityTable): Promise<CapacityTable> {
  return db.transaction(async (tx) => {
    const version = await bumpDataVersion(tx, actor.organizationId, planId);
    const [stored] = await tx.select().from(capacityTables).where(eq(capacityTables.planId, planId)).for('update');
    const before = stored?.table ?? defaultCapacityTable();
    const missing = valuesMissingNewSource(before, table);
    if (missing.length) {
      throw new BadRequestError(
        'Say where each changed value comes from: a changed value needs its own source.',
        missing.map((m) => ({ path: `rows.${m.index}.${m.sourceField}`, message: 'The value changed: give its source (a handbook, a count, a local rule).' })),
      );
    }
    const changes = capacityTableChanges(before, table);
    await tx
      .insert(capacityTables)
      .values({ planId, table })
      .onConflictDoUpdate({ target: capacityTables.planId, set: { table, updatedAt: new Date() } });
    await recordAudit(tx, actor, UPDATE_ACTION, 'plan', planId, { capacityFactor: table.capacityFactor, dataVersion: version, changes });
    return table;
  });
}

/** The table's changes, newest first: who, when, and each cell before and after. */
export async function capacityTableHistory(db: Database, organizationId: string, planId: string, page: Page): Promise<CapacityTableHistoryEntry[]> {
  await assertPlanInOrganization(db, organizationId, planId);
  const rows = await db
    .select({ id: auditEvents.id, at: auditEvents.at, actorName: users.displayName, details: auditEvents.details })
    .from(auditEvents)
    .leftJoin(users, eq(users.id, auditEvents.actorUserId))
    .where(and(eq(auditEvents.organizationId, organizationId), eq(auditEvents.entityType, 'plan'), eq(auditEvents.entityId, planId), eq(auditEvents.action, UPDATE_ACTION)))
    .orderBy(desc(auditEvents.id))
    .limit(limitPlusOne(page))
    .offset(page.offset);
  return rows.map((r) => {
    // Entries written before changes were recorded carry none.
    const changes = Array.isArray((r.details as { changes?: unknown }).changes) ? ((r.details as { changes: unknown[] }).changes) : [];
    return {
      id: r.id,
      at: r.at.toISOString(),
      actorName: r.actorName ?? null,
      changes: changes.flatMap((c) => {
        const parsed = capacityTableChangeSchema.safeParse(c);
        return parsed.success ? [parsed.data] : [];
      }),
    };
  });
}

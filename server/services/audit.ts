// The audit trail: written inside the same transaction as the change it records.
import { and, desc, eq, lt } from 'drizzle-orm';
import type { Database, Tx } from '../db/client';
import { auditEvents, users } from '../db/schema';
import type { AuditEvent } from '../../shared/api/audit';

export type Actor = { userId: string | null; organizationId: string };

export async function recordAudit(
  tx: Tx | Database,
  actor: Actor,
  action: string,
  entityType: string,
  entityId: string | null,
  details: Record<string, unknown> = {},
): Promise<void> {
  await tx.insert(auditEvents).values({
    organizationId: actor.organizationId,
    actorUserId: actor.userId,
    action,
    entityType,
    entityId,
    details,
  });
}

export async function listAudit(
  db: Database,
  organizationId: string,
  query: { limit: number; before?: number | undefined },
): Promise<AuditEvent[]> {
  const where = query.before
    ? and(eq(auditEvents.organizationId, organizationId), lt(auditEvents.id, query.before))
    : eq(auditEvents.organizationId, organizationId);
  const rows = await db
    .select({
      id: auditEvents.id,
      at: auditEvents.at,
      actorUserId: auditEvents.actorUserId,
      actorName: users.displayName,
      action: auditEvents.action,
      entityType: auditEvents.entityType,
      entityId: auditEvents.entityId,
      details: auditEvents.details,
    })
    .from(auditEvents)
    .leftJoin(users, eq(users.id, auditEvents.actorUserId))
    .where(where)
    .orderBy(desc(auditEvents.id))
    .limit(query.limit);
  return rows.map((r) => ({ ...r, at: r.at.toISOString() }));
}

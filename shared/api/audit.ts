// Audit trail entries: who did what, when, to which record.
import { z } from 'zod';

export const auditEventSchema = z.object({
  id: z.number(),
  at: z.string(),
  actorUserId: z.string().nullable(),
  actorName: z.string().nullable(),
  action: z.string(),
  entityType: z.string(),
  entityId: z.string().nullable(),
  details: z.record(z.string(), z.unknown()),
});
export type AuditEvent = z.infer<typeof auditEventSchema>;

export const auditListSchema = z.object({ events: z.array(auditEventSchema) });

export const auditQuerySchema = z.object({
  limit: z.coerce.number().int().min(1).max(200).default(50),
  before: z.coerce.number().int().positive().optional(),
});

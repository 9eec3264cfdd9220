// Imports of road, zone and shelter files: queued jobs a worker reads and saves, with the
// phase and share done, and a cancel. The upload answers at once with the queued import.
import { z } from 'zod';
import { importFailureSchema } from './road-import';

export const importKindSchema = z.enum(['road-layer', 'zones', 'shelters']);
export type ImportKind = z.infer<typeof importKindSchema>;

export const importSchema = z.object({
  id: z.string().uuid(),
  planId: z.string().uuid(),
  kind: importKindSchema,
  status: z.enum(['queued', 'running', 'succeeded', 'failed', 'cancelled']),
  phase: z.string(),
  /** 0 to 1. */
  progress: z.number(),
  fileName: z.string(),
  sizeBytes: z.number().int(),
  /** Why the file was refused or the import stopped (failed only). */
  failure: importFailureSchema.nullable(),
  /** What was written: `{ layerId }` for a road layer, `{ created }` for zones and shelters. */
  outcome: z.record(z.string(), z.unknown()).nullable(),
  createdAt: z.string(),
  finishedAt: z.string().nullable(),
});
export type Import = z.infer<typeof importSchema>;

export const importParamsSchema = z.object({ planId: z.string().uuid(), importId: z.string().uuid('Not a valid identifier.') });

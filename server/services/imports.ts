// Imports as queued jobs: the upload stores the file's bytes and queues the job in one
// transaction (any worker machine can take it: the bytes live in PostgreSQL, not on a disk);
// planners read the job's phase and progress, and may cancel it.
import { and, eq, getTableColumns, inArray } from 'drizzle-orm';
import type { Database } from '../db/client';
import { imports } from '../db/schema';
import type { Import, ImportKind } from '../../shared/api/imports';
import type { ImportJobOptions } from '../../shared/api/road-import';
import { ConflictError, NotFoundError } from '../errors';
import { queueSqlOf } from '../queue/run-enqueuer';
import type { ImportEnqueuer } from '../queue/run-queue';
import { recordAudit, type Actor } from './audit';
import { assertPlanInOrganization } from './plan-access';

const { bytes: _bytes, ...columnsWithoutBytes } = getTableColumns(imports);
type ImportRow = Omit<typeof imports.$inferSelect, 'bytes'>;

export function toImport(r: ImportRow): Import {
  return {
    id: r.id,
    planId: r.planId,
    kind: r.kind,
    status: r.status,
    phase: r.phase,
    progress: r.progress,
    fileName: r.fileName,
    sizeBytes: r.sizeBytes,
    failure: r.failure ?? null,
    outcome: r.outcome ?? null,
    createdAt: r.createdAt.toISOString(),
    finishedAt: r.finishedAt?.toISOString() ?? null,
  };
}

export type ImportUpload = { kind: ImportKind; bytes: Buffer; fileName: string; layerName?: string | undefined; options?: ImportJobOptions | undefined };

/** Stores the upload and queues its import, in one transaction; answers with the queued import. */
export async function queueImport(db: Database, queue: ImportEnqueuer, actor: Actor, planId: string, upload: ImportUpload): Promise<Import> {
  return db.transaction(async (tx) => {
    await assertPlanInOrganization(tx, actor.organizationId, planId);
    const [row] = await tx
      .insert(imports)
      .values({
        planId,
        kind: upload.kind,
        fileName: upload.fileName,
        sizeBytes: upload.bytes.length,
        layerName: upload.layerName ?? null,
        options: upload.options ?? null,
        bytes: upload.bytes,
        createdBy: actor.userId,
      })
      .returning(columnsWithoutBytes);
    await recordAudit(tx, actor, 'import.queue', 'import', row!.id, { planId, kind: upload.kind, file: upload.fileName, sizeBytes: upload.bytes.length });
    await queue.enqueueImport(row!.id, queueSqlOf(tx));
    return toImport(row!);
  });
}

export async function getImport(db: Database, organizationId: string, planId: string, importId: string): Promise<Import> {
  await assertPlanInOrganization(db, organizationId, planId);
  const [row] = await db.select(columnsWithoutBytes).from(imports).where(and(eq(imports.id, importId), eq(imports.planId, planId)));
  if (!row) throw new NotFoundError('import');
  return toImport(row);
}

/** Cancels a queued or running import; its worker stops and writes nothing. */
export async function cancelImport(db: Database, actor: Actor, planId: string, importId: string): Promise<Import> {
  await assertPlanInOrganization(db, actor.organizationId, planId);
  return db.transaction(async (tx) => {
    const [row] = await tx
      .update(imports)
      .set({ status: 'cancelled', phase: 'cancelled', finishedAt: new Date(), bytes: null })
      .where(and(eq(imports.id, importId), eq(imports.planId, planId), inArray(imports.status, ['queued', 'running'])))
      .returning(columnsWithoutBytes);
    if (!row) {
      const [existing] = await tx.select({ status: imports.status }).from(imports).where(and(eq(imports.id, importId), eq(imports.planId, planId)));
      if (!existing) throw new NotFoundError('import');
      throw new ConflictError(`The import has already ${existing.status === 'cancelled' ? 'been cancelled' : existing.status}.`);
    }
    await recordAudit(tx, actor, 'import.cancel', 'import', importId, { planId });
    return toImport(row);
  });
}

// Imports as queued jobs: the upload stores the file's bytes and queues the job in one
// transaction (any worker machine can take it: the bytes live in PostgreSQL, not on a disk);
// planners read the job's phase and progress, and may cancel it.
import { and, eq, inArray } from 'drizzle-orm';
import type { Database } from '../db/client';
import { importChunks, imports } from '../db/schema';
import type { Import, ImportKind } from '../../shared/api/imports';
import type { ImportJobOptions } from '../../shared/api/road-import';
import { ConflictError, NotFoundError } from '../errors';
import { queueSqlOf } from '../queue/run-enqueuer';
import type { ImportEnqueuer } from '../queue/run-queue';
import { recordAudit, type Actor } from './audit';
import { assertPlanInOrganization } from './plan-access';

type ImportRow = typeof imports.$inferSelect;

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

export type ImportDetails = { layerName?: string | undefined; options?: ImportJobOptions | undefined };
export type ImportUpload = {
  kind: ImportKind;
  fileName: string;
  /** The file's bytes as they arrive (about 1 MB each); a fault of the upload is thrown from here. */
  pieces: AsyncIterable<Uint8Array>;
  /** The rest of the request (a road layer's name and options), once the whole upload has arrived; throws what it refuses. */
  details: () => Promise<ImportDetails>;
};

/**
 * Stores the upload piece by piece as it arrives and queues its import, all in one transaction:
 * the caller is answered once the last piece is stored and the job queued, and an upload that
 * fails on the way (too large, cut short, refused fields) rolls back, leaving nothing.
 */
export async function queueImport(db: Database, queue: ImportEnqueuer, actor: Actor, planId: string, upload: ImportUpload): Promise<Import> {
  return db.transaction(async (tx) => {
    await assertPlanInOrganization(tx, actor.organizationId, planId);
    const [created] = await tx
      .insert(imports)
      .values({ planId, kind: upload.kind, fileName: upload.fileName, sizeBytes: 0, createdBy: actor.userId })
      .returning({ id: imports.id });
    const importId = created!.id;
    let sizeBytes = 0;
    let seq = 0;
    // One piece is stored while the next arrives: the request ends about one piece's insert after its last byte.
    let storing: Promise<unknown> = Promise.resolve();
    for await (const piece of upload.pieces) {
      await storing;
      storing = tx.insert(importChunks).values({ importId, seq: seq++, bytes: Buffer.from(piece.buffer, piece.byteOffset, piece.byteLength) }).execute();
      // Awaited at the next piece or after the last; a failure before then is not unhandled.
      storing.catch(() => undefined);
      sizeBytes += piece.byteLength;
    }
    await storing;
    const details = await upload.details();
    const [row] = await tx
      .update(imports)
      .set({ sizeBytes, layerName: details.layerName ?? null, options: details.options ?? null })
      .where(eq(imports.id, importId))
      .returning();
    await recordAudit(tx, actor, 'import.queue', 'import', importId, { planId, kind: upload.kind, file: upload.fileName, sizeBytes });
    await queue.enqueueImport(importId, queueSqlOf(tx));
    return toImport(row!);
  });
}

/** The stored upload, whole, for the worker that reads it; null once the import has ended. */
export async function importBytes(db: Database, importId: string): Promise<Uint8Array | null> {
  const rows = await db.select({ bytes: importChunks.bytes }).from(importChunks).where(eq(importChunks.importId, importId)).orderBy(importChunks.seq);
  if (rows.length === 0) return null;
  const whole = Buffer.concat(rows.map((r) => r.bytes));
  return new Uint8Array(whole.buffer, whole.byteOffset, whole.byteLength);
}

/** Frees an ended import's bytes. */
export async function dropImportBytes(db: Pick<Database, 'delete'>, importId: string): Promise<void> {
  await db.delete(importChunks).where(eq(importChunks.importId, importId));
}

export async function getImport(db: Database, organizationId: string, planId: string, importId: string): Promise<Import> {
  await assertPlanInOrganization(db, organizationId, planId);
  const [row] = await db.select().from(imports).where(and(eq(imports.id, importId), eq(imports.planId, planId)));
  if (!row) throw new NotFoundError('import');
  return toImport(row);
}

/** Cancels a queued or running import; its worker stops and writes nothing. */
export async function cancelImport(db: Database, actor: Actor, planId: string, importId: string): Promise<Import> {
  await assertPlanInOrganization(db, actor.organizationId, planId);
  return db.transaction(async (tx) => {
    const [row] = await tx
      .update(imports)
      .set({ status: 'cancelled', phase: 'cancelled', finishedAt: new Date() })
      .where(and(eq(imports.id, importId), eq(imports.planId, planId), inArray(imports.status, ['queued', 'running'])))
      .returning();
    if (!row) {
      const [existing] = await tx.select({ status: imports.status }).from(imports).where(and(eq(imports.id, importId), eq(imports.planId, planId)));
      if (!existing) throw new NotFoundError('import');
      throw new ConflictError(`The import has already ${existing.status === 'cancelled' ? 'been cancelled' : existing.status}.`);
    }
    await dropImportBytes(tx, importId);
    await recordAudit(tx, actor, 'import.cancel', 'import', importId, { planId });
    return toImport(row);
  });
}

// Imports as queued jobs: the upload stores the file's bytes and queues the job in one
// transaction (any worker machine can take it: the bytes live in PostgreSQL, not on a disk);
// planners read the job's phase and progress, and may cancel it.
import { and, eq, inArray, sql } from 'drizzle-orm';
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

/** The phase of an import whose file is still arriving or being stored; it has no job yet. */
export const RECEIVING_PHASE = 'receiving the file';

/**
 * Stores an upload's pieces one after another in their own statements, behind the reading: the
 * request keeps reading the socket at its own pace while the database catches up (a piece waits
 * in memory until its turn, so at most the file's size, which the upload limit bounds).
 */
function pieceWriter(db: Database, importId: string) {
  let seq = 0;
  let chain: Promise<void> = Promise.resolve();
  let failure: unknown = null;
  return {
    push(piece: Uint8Array): void {
      const row = { importId, seq: seq++, bytes: Buffer.from(piece.buffer, piece.byteOffset, piece.byteLength) };
      chain = chain.then(async () => {
        if (failure !== null) return;
        try {
          await db.insert(importChunks).values(row).execute();
        } catch (e) {
          // Not the query's error itself: its message holds the piece, a megabyte, as text.
          const cause = e instanceof Error && e.cause instanceof Error ? e.cause.message : e instanceof Error ? e.message.split('\n')[0] : String(e);
          failure = new Error(`Storing piece ${row.seq} of import ${importId} failed: ${cause}`);
        }
      });
    },
    /** Resolves once every piece pushed is stored; throws the first failure. */
    async done(): Promise<void> {
      await chain;
      if (failure !== null) throw failure;
    },
  };
}

/**
 * Receives an upload and queues its import. The import row is written first (phase "receiving
 * the file", no job yet); the pieces are stored as they arrive, behind the reading; once the whole
 * body has arrived and its fields are accepted, the caller is answered, and the last pieces, the
 * audit row and the job follow in one transaction behind the answer (measured: a 7.9 MB road file
 * takes about as long to store as to send, so waiting for it would double the request). An upload
 * refused on the way (too large, cut short, refused fields) deletes its import and pieces before
 * the refusal is answered; one whose storing fails after the answer is marked failed; one whose API
 * process died meanwhile is failed by a worker's reconciler (reconcileImports).
 */
export async function queueImport(db: Database, queue: ImportEnqueuer, actor: Actor, planId: string, upload: ImportUpload, log: (err: unknown) => void): Promise<Import> {
  const row = await db.transaction(async (tx) => {
    await assertPlanInOrganization(tx, actor.organizationId, planId);
    const [created] = await tx
      .insert(imports)
      .values({ planId, kind: upload.kind, fileName: upload.fileName, sizeBytes: 0, createdBy: actor.userId, phase: RECEIVING_PHASE })
      .returning();
    return created!;
  });
  const importId = row.id;
  const writer = pieceWriter(db, importId);
  let sizeBytes = 0;
  let details: ImportDetails;
  try {
    for await (const piece of upload.pieces) {
      writer.push(piece);
      sizeBytes += piece.byteLength;
    }
    details = await upload.details();
  } catch (e) {
    // Refused: nothing of it stays (its pieces go with it).
    await writer.done().catch(() => undefined);
    await db.delete(imports).where(eq(imports.id, importId));
    throw e;
  }
  const finishing = finishQueuing(db, queue, actor, row, writer, sizeBytes, details).catch(async (e: unknown) => {
    log(e);
    await failImportUnstored(db, importId).catch(log);
  });
  finishingUploads.add(finishing);
  void finishing.finally(() => finishingUploads.delete(finishing));
  return toImport({ ...row, sizeBytes });
}

// Uploads answered whose pieces and job are still being written (this process's).
const finishingUploads = new Set<Promise<void>>();

/** Resolves once every upload this process has answered has stored its file and queued its job (for a graceful stop). */
export async function importUploadsSettled(): Promise<void> {
  while (finishingUploads.size > 0) await Promise.allSettled([...finishingUploads]);
}

async function finishQueuing(
  db: Database,
  queue: ImportEnqueuer,
  actor: Actor,
  row: ImportRow,
  writer: ReturnType<typeof pieceWriter>,
  sizeBytes: number,
  details: ImportDetails,
): Promise<void> {
  await writer.done();
  await db.transaction(async (tx) => {
    const [queued] = await tx
      .update(imports)
      .set({ sizeBytes, layerName: details.layerName ?? null, options: details.options ?? null, phase: 'queued' })
      .where(and(eq(imports.id, row.id), eq(imports.status, 'queued')))
      .returning({ id: imports.id });
    // Cancelled while its file was stored: drop what was stored, queue nothing.
    if (!queued) return void (await dropImportBytes(tx, row.id));
    await recordAudit(tx, actor, 'import.queue', 'import', row.id, { planId: row.planId, kind: row.kind, file: row.fileName, sizeBytes });
    await queue.enqueueImport(row.id, queueSqlOf(tx));
  });
}

const unstoredFailure = (message: string) => ({ code: 'unreadableFile' as const, message, badFeatures: [] });

/** An import whose file could not be stored after its upload was answered: failed, its pieces dropped. */
async function failImportUnstored(db: Database, importId: string): Promise<void> {
  await db.transaction(async (tx) => {
    await tx
      .update(imports)
      .set({ status: 'failed', phase: 'failed', failure: unstoredFailure('The file arrived but could not be stored. Upload it again.'), finishedAt: new Date() })
      .where(and(eq(imports.id, importId), inArray(imports.status, ['queued', 'running'])));
    await dropImportBytes(tx, importId);
  });
}

/**
 * Imports still "receiving the file" long after any upload could have arrived and been stored:
 * their API process stopped meanwhile. They fail (their pieces dropped), so the planner sees why.
 * Run by each worker with the run reconciler.
 */
export async function reconcileImports(db: Database, olderThanSeconds: number): Promise<string[]> {
  const { rows } = await db.execute<{ id: string }>(sql`
    UPDATE imports SET status = 'failed', phase = 'failed', finished_at = now(),
      failure = ${JSON.stringify(unstoredFailure('The upload did not finish: the server receiving it stopped. Upload the file again.'))}::jsonb
    WHERE status = 'queued' AND phase = ${RECEIVING_PHASE} AND created_at < now() - make_interval(secs => ${olderThanSeconds})
    RETURNING id`);
  for (const { id } of rows) await dropImportBytes(db, id);
  return rows.map((r) => r.id);
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

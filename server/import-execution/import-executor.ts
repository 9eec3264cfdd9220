// The import service: executes one queued import, in two steps: decode (the stored upload read
// and built in a worker thread, server/import/read-import.ts: untrusted parsing off the event
// loop, within a time and memory budget), then save (services/save-import.ts: the save service of
// its kind, one transaction with its audit row), writing phase and progress to the import row. A cancel
// stops the thread, and one that lands while saving rolls the save back: nothing is written.
// Safe to run again after a worker died: a finished import is left alone.
import { and, eq, inArray } from 'drizzle-orm';
import type { Config } from '../config';
import type { Database, Tx } from '../db/client';
import { imports, plans } from '../db/schema';
import { saveImport } from '../services/save-import';
import { dropImportBytes, importBytes } from '../services/imports';
import { ImportFailed, readUploadInWorker } from './read-upload-in-worker';

const cancelPollMs = 500;
const inFlight = inArray(imports.status, ['queued', 'running']);

class CancelledWhileSaving extends Error {}

export function createImportExecutor(db: Database, config: Pick<Config, 'IMPORT_TIME_BUDGET_SECONDS' | 'IMPORT_MEMORY_BUDGET_MEGABYTES'>, log: (e: unknown) => void) {
  async function setState(importId: string, values: Partial<typeof imports.$inferInsert>): Promise<boolean> {
    const rows = await db.update(imports).set(values).where(and(eq(imports.id, importId), inFlight)).returning({ id: imports.id });
    return rows.length > 0;
  }

  /** Ends an import still in flight and frees its bytes, in one transaction (no reader sees it ended with its bytes still there). */
  async function endImport(importId: string, values: Partial<typeof imports.$inferInsert>): Promise<void> {
    await db.transaction(async (tx) => {
      const rows = await tx.update(imports).set(values).where(and(eq(imports.id, importId), inFlight)).returning({ id: imports.id });
      if (rows.length > 0) await dropImportBytes(tx, importId);
    });
  }

  /** Inside the save's transaction, last: the import must still be running, or everything rolls back. */
  const stillRunning = (importId: string) => async (tx: Tx) => {
    const [row] = await tx.select({ status: imports.status }).from(imports).where(eq(imports.id, importId)).for('update');
    if (row?.status !== 'running') throw new CancelledWhileSaving();
  };

  async function execute(importId: string): Promise<void> {
    const [job] = await db
      .select({ imp: imports, organizationId: plans.organizationId })
      .from(imports)
      .innerJoin(plans, eq(plans.id, imports.planId))
      .where(and(eq(imports.id, importId), inFlight));
    if (!job) return;
    const { imp } = job;
    // An empty file has no pieces: it is read (and refused by its reader) like any other. Pieces
    // missing otherwise: the import ended meanwhile, and its bytes went with it.
    const bytes = (await importBytes(db, importId)) ?? (imp.sizeBytes === 0 ? new Uint8Array(0) : null);
    if (!bytes) return;
    if (!(await setState(importId, { status: 'running', phase: 'reading the file', progress: 0.05, startedAt: new Date() }))) return;
    const actor = { userId: imp.createdBy, organizationId: job.organizationId };
    const reading = readUploadInWorker(
      { kind: imp.kind, bytes, fileName: imp.fileName, options: imp.options },
      { timeSeconds: config.IMPORT_TIME_BUDGET_SECONDS, memoryMegabytes: config.IMPORT_MEMORY_BUDGET_MEGABYTES },
    );
    // A planner's cancel may reach another process: notice it in the database.
    const watch = setInterval(() => {
      db.select({ status: imports.status })
        .from(imports)
        .where(eq(imports.id, importId))
        .then(([r]) => r?.status === 'cancelled' && reading.cancel(), log);
    }, cancelPollMs);
    try {
      const value = await reading.done;
      clearInterval(watch);
      if (!(await setState(importId, { phase: 'saving', progress: 0.6 }))) return;
      const outcome = await saveImport(db, actor, imp, value, {
        onProgress: async (share) => void (await setState(importId, { progress: 0.6 + 0.38 * share })),
        beforeCommit: stillRunning(importId),
      });
      await endImport(importId, { status: 'succeeded', phase: 'done', progress: 1, outcome, finishedAt: new Date() });
    } catch (e) {
      if (e instanceof CancelledWhileSaving) return;
      if (e instanceof ImportFailed && e.kind === 'cancelled') return;
      if (!(e instanceof ImportFailed)) log(e);
      const failure = e instanceof ImportFailed && e.failure ? e.failure : { code: 'unreadableFile' as const, message: e instanceof Error ? e.message : String(e), badFeatures: [] };
      await endImport(importId, { status: 'failed', phase: 'failed', failure, finishedAt: new Date() });
    } finally {
      clearInterval(watch);
    }
  }

  return { execute };
}
export type ImportExecutor = ReturnType<typeof createImportExecutor>;

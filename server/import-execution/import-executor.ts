// Executes one queued import: reads the stored upload in a worker thread (untrusted parsing off
// the event loop, within a time and memory budget), then saves it with the one save service of
// its kind (decode, build, save, audit), writing phase and progress to the import row. A cancel
// stops the thread, and one that lands while saving rolls the save back: nothing is written.
// Safe to run again after a worker died: a finished import is left alone.
import { and, eq, inArray } from 'drizzle-orm';
import type { Config } from '../config';
import type { Database, Tx } from '../db/client';
import { imports, plans } from '../db/schema';
import type { RoadGraph } from '../../shared/geo/build-road-graph';
import type { ShelterFeature } from '../../shared/geo/read-shelters';
import type { ZoneFeature } from '../../shared/geo/read-zones';
import { zoneGeometrySchema } from '../../shared/api/zones-shelters';
import { importOptionsSchema } from '../../shared/api/road-import';
import { saveRoadLayer } from '../services/road-layers';
import { createShelters, createZones } from '../services/zones-shelters';
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
    const bytes = await importBytes(db, importId);
    if (!bytes) return;
    const { imp } = job;
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
      let outcome: Record<string, unknown>;
      if (imp.kind === 'road-layer') {
        const network = value as RoadGraph;
        const layer = await saveRoadLayer(
          db,
          actor,
          imp.planId,
          network,
          { name: imp.layerName ?? imp.fileName, sourceFileName: imp.fileName, importOptions: importOptionsSchema.parse(imp.options ?? {}) },
          { onProgress: async (share) => void (await setState(importId, { progress: 0.6 + 0.38 * share })), beforeCommit: stillRunning(importId) },
        );
        outcome = { layerId: layer.id, segments: layer.segmentCount, nodes: layer.nodeCount };
      } else if (imp.kind === 'zones') {
        const features = value as ZoneFeature[];
        const created = await createZones(
          db,
          actor,
          imp.planId,
          features.map((f) => ({ ...f.attributes, geometry: zoneGeometrySchema.parse(f.geometry) })),
          imp.fileName,
          stillRunning(importId),
        );
        outcome = { created: created.length, defaulted: features.map((f) => f.defaulted) };
      } else {
        const features = value as ShelterFeature[];
        const created = await createShelters(
          db,
          actor,
          imp.planId,
          features.map((f) => ({ ...f.attributes, lon: f.coordinates[0], lat: f.coordinates[1] })),
          imp.fileName,
          stillRunning(importId),
        );
        outcome = { created: created.length };
      }
      if (await setState(importId, { status: 'succeeded', phase: 'done', progress: 1, outcome, finishedAt: new Date() })) await dropImportBytes(db, importId);
    } catch (e) {
      if (e instanceof CancelledWhileSaving) return;
      if (e instanceof ImportFailed && e.kind === 'cancelled') return;
      if (!(e instanceof ImportFailed)) log(e);
      const failure = e instanceof ImportFailed && e.failure ? e.failure : { code: 'unreadableFile' as const, message: e instanceof Error ? e.message : String(e), badFeatures: [] };
      if (await setState(importId, { status: 'failed', phase: 'failed', failure, finishedAt: new Date() })) await dropImportBytes(db, importId);
    } finally {
      clearInterval(watch);
    }
  }

  return { execute };
}
export type ImportExecutor = ReturnType<typeof createImportExecutor>;

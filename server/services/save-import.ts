// The import job's save step: what the decode step read (server/import/read-import.ts) saved by
// the one save service of its kind, each one transaction with its audit row: a road layer
// (`saveRoadLayer`), zones (`createZones`), shelters (`createShelters`). Returns what the import
// row reports as its outcome. A `beforeCommit` that throws (the import was cancelled meanwhile)
// rolls the whole save back.
import type { ImportKind } from '../../shared/api/imports';
import { importOptionsSchema, type ImportJobOptions } from '../../shared/api/road-import';
import { zoneGeometrySchema } from '../../shared/api/zones-shelters';
import type { RoadGraph } from '../../shared/geo/build-road-graph';
import type { ShelterFeature } from '../../shared/geo/read-shelters';
import type { ZoneFeature } from '../../shared/geo/read-zones';
import type { Database, Tx } from '../db/client';
import type { Actor } from './audit';
import { saveRoadLayer } from './road-layers';
import { createShelters, createZones } from './zones-shelters';

export type ImportTarget = { kind: ImportKind; planId: string; fileName: string; layerName: string | null; options: ImportJobOptions | null };
export type SaveHooks = { onProgress?: (share: number) => Promise<void>; beforeCommit?: (tx: Tx) => Promise<void> };

export async function saveImport(db: Database, actor: Actor, target: ImportTarget, reading: unknown, hooks: SaveHooks = {}): Promise<Record<string, unknown>> {
  const { planId, fileName } = target;
  if (target.kind === 'road-layer') {
    const layer = await saveRoadLayer(
      db,
      actor,
      planId,
      reading as RoadGraph,
      { name: target.layerName ?? fileName, sourceFileName: fileName, importOptions: importOptionsSchema.parse(target.options ?? {}) },
      hooks,
    );
    return { layerId: layer.id, segments: layer.segmentCount, nodes: layer.nodeCount };
  }
  if (target.kind === 'zones') {
    const features = reading as ZoneFeature[];
    const zones = features.map((f) => ({ ...f.attributes, geometry: zoneGeometrySchema.parse(f.geometry) }));
    const created = await createZones(db, actor, planId, zones, fileName, hooks.beforeCommit);
    return { created: created.length, defaulted: features.map((f) => f.defaulted) };
  }
  const features = reading as ShelterFeature[];
  const shelters = features.map((f) => ({ ...f.attributes, lon: f.coordinates[0], lat: f.coordinates[1] }));
  const created = await createShelters(db, actor, planId, shelters, fileName, hooks.beforeCommit);
  return { created: created.length };
}

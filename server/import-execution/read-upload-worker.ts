// Runs in a worker thread (read-upload-in-worker.ts): an uploaded file's bytes in, the road
// graph or the zone or shelter features out, or the reader's refusal. Untrusted parsing happens
// here, never on a process's event loop; the import path is server/import/'s, so every reader
// there (and every format it learns) serves the job.
import { parentPort, workerData } from 'node:worker_threads';
import type { ImportJobOptions, ImportOptions, ShelterUploadOptions, ZoneUploadOptions } from '../../shared/api/road-import';
import { RoadImportError } from '../../shared/geo/road-import-error';
import { importRoadLayerUpload } from '../import/import-road-layer';
import { readSheltersUpload, readZonesUpload } from '../import/import-zones-and-shelters';

export type ReadRequest = { kind: 'road-layer' | 'zones' | 'shelters'; bytes: Uint8Array; fileName: string; options: ImportJobOptions | null };
export type ReadMessage =
  | { type: 'done'; value: unknown }
  | { type: 'refused'; failure: RoadImportError['failure'] }
  | { type: 'error'; message: string };

const { kind, bytes, fileName, options } = workerData as ReadRequest;
const post = (m: ReadMessage) => parentPort!.postMessage(m);

// Every format readGisFile reads (Shapefile, GeoPackage, KML, PBF, CSV, GeoJSON with a crs).
try {
  const value =
    kind === 'road-layer'
      ? await importRoadLayerUpload(bytes, (options ?? {}) as ImportOptions, fileName)
      : kind === 'zones'
        ? await readZonesUpload(bytes, (options ?? {}) as ZoneUploadOptions, fileName)
        : await readSheltersUpload(bytes, (options ?? {}) as ShelterUploadOptions, fileName);
  post({ type: 'done', value });
} catch (e) {
  if (e instanceof RoadImportError) post({ type: 'refused', failure: e.failure });
  else post({ type: 'error', message: e instanceof Error ? e.message : String(e) });
}

// The import job's decode step: one uploaded file's bytes and the planner's options in, the road
// graph or the zone or shelter features out, or a RoadImportError with the whole failure. A
// worker runs it in a worker thread (server/import-execution/read-upload-worker.ts), never on an
// event loop; the hostile-file tests run the same function. Nothing here touches the database.
import type { ImportKind } from '../../shared/api/imports';
import type { ImportJobOptions, ImportOptions, ShelterUploadOptions, ZoneUploadOptions } from '../../shared/api/road-import';
import type { RoadGraph } from '../../shared/geo/build-road-graph';
import type { ShelterFeature } from '../../shared/geo/read-shelters';
import type { ZoneFeature } from '../../shared/geo/read-zones';
import { importRoadLayerUpload } from './import-road-layer';
import { readSheltersUpload, readZonesUpload } from './import-zones-and-shelters';

export type ImportRequest = { kind: ImportKind; bytes: Uint8Array; fileName: string; options: ImportJobOptions | null };
export type ImportReading = { 'road-layer': RoadGraph; zones: ZoneFeature[]; shelters: ShelterFeature[] };

/** Every format readGisFile reads (Shapefile, GeoPackage, KML, PBF, CSV, GeoJSON with a crs), each optionally compressed. */
export async function readImport(request: ImportRequest): Promise<ImportReading[ImportKind]> {
  const { kind, bytes, fileName, options } = request;
  if (kind === 'road-layer') return importRoadLayerUpload(bytes, (options ?? {}) as ImportOptions, fileName);
  if (kind === 'zones') return readZonesUpload(bytes, (options ?? {}) as ZoneUploadOptions, fileName);
  return readSheltersUpload(bytes, (options ?? {}) as ShelterUploadOptions, fileName);
}

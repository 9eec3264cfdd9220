// Runs in a pooled worker thread: one uploaded file in, its reading out (a built road network,
// zones, shelters or the file's schema). Untrusted parsers (zip, SQLite, XML, protocol
// buffers) run here, never on the API's event loop, under the thread's memory limit.
import { RoadImportError } from '../../../shared/geo/road-import-error';
import { importRoadLayerUpload } from '../import-road-layer';
import { readSheltersUpload, readZonesUpload } from '../import-zones-and-shelters';
import type { ImportTask, ImportWorkerMessage } from './import-task';
import { readFileSchema } from './read-file-schema';

async function run(task: ImportTask): Promise<unknown> {
  switch (task.kind) {
    case 'roads':
      return importRoadLayerUpload(task.bytes, task.options, task.fileName);
    case 'zones':
      return readZonesUpload(task.bytes, task.options, task.fileName);
    case 'shelters':
      return readSheltersUpload(task.bytes, task.options, task.fileName);
    case 'schema':
      return readFileSchema(task.bytes, task.options, task.fileName);
  }
}

export default async function importTask(task: ImportTask): Promise<ImportWorkerMessage> {
  try {
    return { type: 'done', result: await run(task) };
  } catch (e) {
    if (e instanceof RoadImportError) return { type: 'refused', failure: e.failure };
    return { type: 'error', message: e instanceof Error ? e.message : String(e) };
  }
}

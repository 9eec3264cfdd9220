// Runs in a worker thread (read-upload-in-worker.ts): the import job's decode step
// (server/import/read-import.ts) on an uploaded file's bytes, answering the road graph or the
// zone or shelter features, or the reader's refusal. Untrusted parsing happens here, never on a
// process's event loop.
import { parentPort, workerData } from 'node:worker_threads';
import { RoadImportError } from '../../shared/geo/road-import-error';
import { readImport, type ImportRequest } from '../import/read-import';

export type ReadRequest = ImportRequest;
export type ReadMessage =
  | { type: 'done'; value: unknown }
  | { type: 'refused'; failure: RoadImportError['failure'] }
  | { type: 'error'; message: string };

const post = (m: ReadMessage) => parentPort!.postMessage(m);

try {
  post({ type: 'done', value: await readImport(workerData as ReadRequest) });
} catch (e) {
  if (e instanceof RoadImportError) post({ type: 'refused', failure: e.failure });
  else post({ type: 'error', message: e instanceof Error ? e.message : String(e) });
}

// Runs in a worker thread (write-export-in-worker.ts): an export bundle in, the file's bytes out.
import { parentPort, workerData } from 'node:worker_threads';
import type { ExportBundle } from '../../shared/format/export-tables';
import { writeExport, type ExportFormat } from './write-export';

export type WriteRequest = { format: ExportFormat; bundle: ExportBundle; table?: string };
export type WriteMessage = { type: 'done'; bytes: Uint8Array } | { type: 'error'; message: string };

const { format, bundle, table } = workerData as WriteRequest;
try {
  const bytes = await writeExport(format, bundle, table);
  parentPort!.postMessage({ type: 'done', bytes } satisfies WriteMessage, [bytes.buffer as ArrayBuffer]);
} catch (e) {
  parentPort!.postMessage({ type: 'error', message: e instanceof Error ? e.message : String(e) } satisfies WriteMessage);
}

// Writes an export file off the API's event loop when it is big (a county's roads: seconds of
// SQLite inserts or zipping), in a worker thread with a time and memory budget; a small one is
// written at once, since starting a thread (loading the TypeScript writers) costs more.
import { budgetedThread, type ThreadBudget } from '../budgeted-thread';
import type { ExportBundle } from '../../shared/format/export-tables';
import { HttpError } from '../errors';
import { writeExport, type ExportFormat } from './write-export';
import type { WriteMessage, WriteRequest } from './write-export-worker';

export const EXPORT_WRITE_BUDGET: ThreadBudget = { timeSeconds: 300, memoryMegabytes: 3072 };
/** Rows (all tables together) above which the file is written in a worker thread. */
export const INLINE_EXPORT_ROWS = 5_000;

function rowsOf(bundle: ExportBundle): number {
  return bundle.tables.reduce((n, t) => n + t.rows.length, 0);
}

export async function writeExportFile(
  request: WriteRequest,
  options: { inlineRows?: number; budget?: ThreadBudget } = {},
): Promise<Uint8Array> {
  if (rowsOf(request.bundle) <= (options.inlineRows ?? INLINE_EXPORT_ROWS)) return writeExport(request.format, request.bundle, request.table);
  const budget = options.budget ?? EXPORT_WRITE_BUDGET;
  const unavailable = (message: string) => new HttpError(503, 'busy', message);
  const { done } = budgetedThread<Uint8Array, WriteMessage>({
    entry: new URL('./write-export-worker-entry.mjs', import.meta.url),
    workerData: request,
    budget,
    words: {
      tooLong: `Writing the file took longer than ${budget.timeSeconds} s and was stopped.`,
      tooBig: `Writing the file needed more than ${budget.memoryMegabytes} MB and was stopped.`,
      failed: (message) => `The file could not be written: ${message}`,
      noAnswer: 'The file writer stopped without an answer.',
    },
    fail: (_kind, message) => unavailable(message),
    onMessage: (m, settle) => {
      if (m.type === 'done') settle.resolve(new Uint8Array(m.bytes));
      else settle.reject(unavailable(`The file could not be written: ${m.message}`));
    },
  });
  return done;
}

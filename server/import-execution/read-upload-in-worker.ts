// Reads one uploaded file in a worker thread with a time and memory budget. The promise settles
// with what the reader built, or rejects with ImportFailed (the reader's refusal, or the budget
// with its reason); cancel() stops the thread at once.
import { budgetedThread, type ThreadBudget } from '../budgeted-thread';
import type { ImportFailure } from '../../shared/api/road-import';
import type { ReadMessage, ReadRequest } from './read-upload-worker';

export class ImportFailed extends Error {
  constructor(
    readonly failure: ImportFailure | null,
    message: string,
    readonly kind: 'refused' | 'budget' | 'cancelled' | 'crash',
  ) {
    super(message);
  }
}

export type ReadBudget = ThreadBudget;

export function readUploadInWorker(request: ReadRequest, budget: ReadBudget): { done: Promise<unknown>; cancel: () => void } {
  const { done, cancel } = budgetedThread<unknown, ReadMessage>({
    entry: new URL('./read-upload-worker-entry.mjs', import.meta.url),
    workerData: request,
    budget,
    words: {
      tooLong: `Reading the file took longer than its budget of ${budget.timeSeconds} s and was stopped.`,
      tooBig: `Reading the file needed more than its memory budget of ${budget.memoryMegabytes} MB and was stopped.`,
      failed: (message) => `The file could not be read: ${message}`,
      noAnswer: 'The reader stopped without an answer.',
    },
    // A reading is never interrupted (only cancelled), so 'interrupted' cannot arise here.
    fail: (kind, message) => new ImportFailed(null, message, kind === 'interrupted' ? 'cancelled' : kind),
    onMessage: (m, settle) => {
      if (m.type === 'done') settle.resolve(m.value);
      else if (m.type === 'refused') settle.reject(new ImportFailed(m.failure, m.failure.message, 'refused'));
      else settle.reject(new ImportFailed(null, `The file could not be read: ${m.message}`, 'crash'));
    },
  });
  return { done, cancel };
}

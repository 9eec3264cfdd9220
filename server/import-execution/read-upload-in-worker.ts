// Reads one uploaded file in a worker thread with a time and memory budget. The promise settles
// with what the reader built, or rejects with ImportFailed (the reader's refusal, or the budget
// with its reason); cancel() stops the thread at once.
import { Worker } from 'node:worker_threads';
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

export type ReadBudget = { timeSeconds: number; memoryMegabytes: number };

export function readUploadInWorker(request: ReadRequest, budget: ReadBudget): { done: Promise<unknown>; cancel: () => void } {
  const worker = new Worker(new URL('./read-upload-worker-entry.mjs', import.meta.url), {
    workerData: request,
    resourceLimits: { maxOldGenerationSizeMb: budget.memoryMegabytes },
  });
  let stopReason: ImportFailed | null = null;
  let settled = false;
  const done = new Promise<unknown>((resolve, reject) => {
    const timer = setTimeout(() => {
      stopReason = new ImportFailed(null, `Reading the file took longer than its budget of ${budget.timeSeconds} s and was stopped.`, 'budget');
      void worker.terminate();
    }, budget.timeSeconds * 1000);
    const finish = (fn: () => void) => {
      if (settled) return;
      settled = true;
      clearTimeout(timer);
      fn();
    };
    worker.on('message', (m: ReadMessage) => {
      if (m.type === 'done') finish(() => resolve(m.value));
      else if (m.type === 'refused') finish(() => reject(new ImportFailed(m.failure, m.failure.message, 'refused')));
      else finish(() => reject(new ImportFailed(null, `The file could not be read: ${m.message}`, 'crash')));
    });
    worker.on('error', (err: Error & { code?: string }) => {
      const oom = err.code === 'ERR_WORKER_OUT_OF_MEMORY';
      const message = oom ? `Reading the file needed more than its memory budget of ${budget.memoryMegabytes} MB and was stopped.` : `The file could not be read: ${err.message}`;
      finish(() => reject(new ImportFailed(null, message, oom ? 'budget' : 'crash')));
    });
    worker.on('exit', () => finish(() => reject(stopReason ?? new ImportFailed(null, 'The reader stopped without an answer.', 'crash'))));
  });
  return {
    done,
    cancel: () => {
      stopReason = new ImportFailed(null, 'Cancelled.', 'cancelled');
      void worker.terminate();
    },
  };
}

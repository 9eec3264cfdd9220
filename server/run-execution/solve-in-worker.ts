// Starts one solve in a worker thread with a time and memory budget; the promise settles with
// the result, or rejects with a reason a planner can read. cancel() stops it at once.
import { Worker } from 'node:worker_threads';
import type { SolveMessage, SolveRequest } from './solve-worker';

export class SolveFailure extends Error {
  constructor(
    message: string,
    readonly kind: 'input' | 'budget' | 'cancelled' | 'interrupted' | 'crash',
  ) {
    super(message);
  }
}

export type SolveBudget = { timeSeconds: number; memoryMegabytes: number };
type Done = Extract<SolveMessage, { type: 'done' }>;

function overBudget(budget: SolveBudget, usedBytes?: number): string {
  const used = usedBytes === undefined ? '' : ` (${Math.round(usedBytes / (1024 * 1024))} MB in use, road graphs included)`;
  return `The analysis needed more than its memory budget of ${budget.memoryMegabytes} MB${used} and was stopped. Shorten the horizon, lengthen the time step or use a smaller study area.`;
}

export function solveInWorker(
  request: SolveRequest,
  budget: SolveBudget,
  onProgress: (phase: string, fraction: number) => void,
): { done: Promise<Done>; cancel: () => void; interrupt: () => void } {
  const worker = new Worker(new URL('./solve-worker-entry.mjs', import.meta.url), {
    workerData: { ...request, memoryMegabytes: budget.memoryMegabytes },
    resourceLimits: { maxOldGenerationSizeMb: budget.memoryMegabytes },
  });
  let settled = false;
  let cancelReason: SolveFailure | null = null;
  const done = new Promise<Done>((resolve, reject) => {
    const timer = setTimeout(() => {
      cancelReason = new SolveFailure(`The analysis took longer than its budget of ${budget.timeSeconds} s and was stopped.`, 'budget');
      void worker.terminate();
    }, budget.timeSeconds * 1000);
    const finish = (fn: () => void) => {
      if (settled) return;
      settled = true;
      clearTimeout(timer);
      fn();
    };
    worker.on('message', (m: SolveMessage) => {
      if (m.type === 'progress') onProgress(m.phase, m.fraction);
      else if (m.type === 'done') finish(() => resolve(m));
      else if (m.memoryBytes !== undefined) finish(() => reject(new SolveFailure(overBudget(budget, m.memoryBytes), 'budget')));
      else finish(() => reject(new SolveFailure(m.message, m.input ? 'input' : 'crash')));
    });
    worker.on('error', (err: Error & { code?: string }) => {
      const message = err.code === 'ERR_WORKER_OUT_OF_MEMORY' ? overBudget(budget) : `The solver failed: ${err.message}`;
      finish(() => reject(new SolveFailure(message, err.code === 'ERR_WORKER_OUT_OF_MEMORY' ? 'budget' : 'crash')));
    });
    worker.on('exit', () => {
      finish(() => reject(cancelReason ?? new SolveFailure('The solver stopped without an answer.', 'crash')));
    });
  });
  return {
    done,
    cancel: () => {
      cancelReason = new SolveFailure('Cancelled.', 'cancelled');
      void worker.terminate();
    },
    // The process is stopping: the run is not over, another worker will solve it again.
    interrupt: () => {
      cancelReason = new SolveFailure('Interrupted: the worker is stopping.', 'interrupted');
      void worker.terminate();
    },
  };
}

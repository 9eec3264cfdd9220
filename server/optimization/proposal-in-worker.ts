// Starts one proposal in a worker thread with the runs' time and memory budget; cancel() and
// interrupt() stop it at once (the same contract as server/runs/solve-in-worker.ts).
import { Worker } from 'node:worker_threads';
import type { ProposalResult } from '../../shared/api/proposals';
import { SolveFailure, type SolveBudget } from '../run-execution/solve-in-worker';
import type { ProposalInput } from './proposal-input';
import type { ProposalMessage } from './proposal-worker';

export function proposalInWorker(
  input: ProposalInput,
  budget: SolveBudget,
  onProgress: (fraction: number) => void,
): { done: Promise<ProposalResult>; cancel: () => void; interrupt: () => void } {
  const worker = new Worker(new URL('./proposal-worker-entry.mjs', import.meta.url), {
    workerData: input,
    resourceLimits: { maxOldGenerationSizeMb: budget.memoryMegabytes },
  });
  let settled = false;
  let stopReason: SolveFailure | null = null;
  const done = new Promise<ProposalResult>((resolve, reject) => {
    const timer = setTimeout(() => {
      stopReason = new SolveFailure(`The search took longer than its budget of ${budget.timeSeconds} s and was stopped.`, 'budget');
      void worker.terminate();
    }, budget.timeSeconds * 1000);
    const finish = (fn: () => void) => {
      if (settled) return;
      settled = true;
      clearTimeout(timer);
      fn();
    };
    worker.on('message', (m: ProposalMessage) => {
      if (m.type === 'progress') onProgress(m.fraction);
      else if (m.type === 'done') finish(() => resolve(m.result));
      else finish(() => reject(new SolveFailure(m.message, m.input ? 'input' : 'crash')));
    });
    worker.on('error', (err: Error & { code?: string }) => {
      const out = err.code === 'ERR_WORKER_OUT_OF_MEMORY';
      finish(() => reject(new SolveFailure(out ? `The search needed more than its memory budget of ${budget.memoryMegabytes} MB and was stopped.` : `The search failed: ${err.message}`, out ? 'budget' : 'crash')));
    });
    worker.on('exit', () => finish(() => reject(stopReason ?? new SolveFailure('The search stopped without an answer.', 'crash'))));
  });
  return {
    done,
    cancel: () => {
      stopReason = new SolveFailure('Cancelled.', 'cancelled');
      void worker.terminate();
    },
    interrupt: () => {
      stopReason = new SolveFailure('Interrupted: the worker is stopping.', 'interrupted');
      void worker.terminate();
    },
  };
}

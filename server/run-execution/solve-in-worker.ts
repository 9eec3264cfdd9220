// Starts one solve in a worker thread with a time and memory budget; the promise settles with
// the result, or rejects with a reason a planner can read. cancel() stops it at once.
import { budgetedThread, type ThreadBudget, type ThreadStop } from '../budgeted-thread';
import type { SolveMessage, SolveRequest } from './solve-worker';

export class SolveFailure extends Error {
  constructor(
    message: string,
    readonly kind: 'input' | ThreadStop,
  ) {
    super(message);
  }
}

export type SolveBudget = ThreadBudget;
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
  return budgetedThread<Done, SolveMessage>({
    entry: new URL('./solve-worker-entry.mjs', import.meta.url),
    workerData: { ...request, memoryMegabytes: budget.memoryMegabytes },
    budget,
    words: {
      tooLong: `The analysis took longer than its budget of ${budget.timeSeconds} s and was stopped.`,
      tooBig: overBudget(budget),
      failed: (message) => `The solver failed: ${message}`,
      noAnswer: 'The solver stopped without an answer.',
    },
    fail: (kind, message) => new SolveFailure(message, kind),
    onMessage: (m, settle) => {
      if (m.type === 'progress') onProgress(m.phase, m.fraction);
      else if (m.type === 'done') settle.resolve(m);
      else if (m.memoryBytes !== undefined) settle.reject(new SolveFailure(overBudget(budget, m.memoryBytes), 'budget'));
      else settle.reject(new SolveFailure(m.message, m.input ? 'input' : 'crash'));
    },
  });
}

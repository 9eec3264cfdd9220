// Starts one proposal in a worker thread with the runs' time and memory budget; cancel() and
// interrupt() stop it at once (the same contract as a run's solve).
import type { ProposalResult } from '../../shared/api/proposals';
import { searchBudgetReason } from '../../shared/format/search-limits';
import { budgetedThread } from '../budgeted-thread';
import { SolveFailure, type SolveBudget } from '../run-execution/solve-in-worker';
import type { ProposalInput } from './proposal-input';
import type { ProposalMessage } from './proposal-worker';

export function proposalInWorker(
  input: ProposalInput,
  budget: SolveBudget,
  onProgress: (fraction: number) => void,
): { done: Promise<ProposalResult>; cancel: () => void; interrupt: () => void } {
  return budgetedThread<ProposalResult, ProposalMessage>({
    entry: new URL('./proposal-worker-entry.mjs', import.meta.url),
    workerData: input,
    budget,
    words: {
      tooLong: searchBudgetReason('time', budget),
      tooBig: searchBudgetReason('memory', budget),
      failed: (message) => `The search failed: ${message}`,
      noAnswer: 'The search stopped without an answer.',
    },
    fail: (kind, message) => new SolveFailure(message, kind),
    onMessage: (m, settle) => {
      if (m.type === 'progress') onProgress(m.fraction);
      else if (m.type === 'done') settle.resolve(m.result);
      else settle.reject(new SolveFailure(m.message, m.input ? 'input' : 'crash'));
    },
  });
}

// Runs in a worker thread: one proposal input in, progress messages and the answer out.
import { parentPort, workerData } from 'node:worker_threads';
import { FlowInputError } from '../../shared/flow';
import type { ProposalResult } from '../../shared/api/proposals';
import { loadGlpkSolver } from './glpk-solver';
import type { ProposalInput } from './proposal-input';
import { solveProposal } from './solve-proposal';

export type ProposalMessage =
  | { type: 'progress'; fraction: number }
  | { type: 'done'; result: ProposalResult }
  | { type: 'error'; message: string; input: boolean };

const input = workerData as ProposalInput;
const post = (m: ProposalMessage) => parentPort!.postMessage(m);
let lastProgressAt = 0;

try {
  const solver = input.request.kind === 'lanes' ? await loadGlpkSolver() : undefined;
  const result = solveProposal(input, solver, {
    onProgress: (fraction) => {
      const now = performance.now();
      if (now - lastProgressAt > 100 || fraction >= 1) {
        lastProgressAt = now;
        post({ type: 'progress', fraction });
      }
    },
  });
  post({ type: 'done', result });
} catch (e) {
  post({ type: 'error', message: e instanceof Error ? e.message : String(e), input: e instanceof FlowInputError });
}

// Runs in a worker thread: one evacuation problem in, progress messages and the engine's result
// out. Keeping the solver off the main thread keeps the server answering while it works.
import { parentPort, workerData } from 'node:worker_threads';
import { FlowInputError, solveEvacuation, type EvacuationProblem, type EvacuationResult, type SolveEvacuationOptions } from '../../shared/flow';
import { createMemoryGuard, MemoryBudgetExceeded } from './memory-guard';

// memoryMegabytes: the run's budget for heap and typed arrays together (memory-guard.ts).
export type SolveRequest = { problem: EvacuationProblem; options: Pick<SolveEvacuationOptions, 'algorithm'>; memoryMegabytes?: number };
export type SolveMessage =
  | { type: 'progress'; phase: string; fraction: number }
  | { type: 'done'; result: EvacuationResult; solveMs: number; peakMemoryBytes: number }
  | { type: 'error'; message: string; input: boolean; memoryBytes?: number };

const { problem, options, memoryMegabytes } = workerData as SolveRequest;
const guard = memoryMegabytes ? createMemoryGuard(memoryMegabytes) : null;
const post = (m: SolveMessage) => parentPort!.postMessage(m);
let lastProgressAt = 0;
let peak = process.memoryUsage().rss;

try {
  const started = performance.now();
  const result = solveEvacuation(problem, {
    ...options,
    // Every result is checked (capacity bounds, conservation, cut = flow) before it is stored.
    verify: true,
    now: () => performance.now(),
    // Past the memory budget the engine stops at its next step (FlowAbortedError, told apart below).
    shouldAbort: () => guard?.exceeded() ?? false,
    onProgress: (phase: string, fraction: number) => {
      guard?.check();
      peak = Math.max(peak, process.memoryUsage().rss);
      const now = performance.now();
      // At most ten messages a second: the main thread writes each one to the database.
      if (now - lastProgressAt > 100 || fraction >= 1) {
        lastProgressAt = now;
        post({ type: 'progress', phase, fraction });
      }
    },
  });
  // The last step's allocations count too (the guard reads memory at most every 10 ms).
  guard?.check();
  peak = Math.max(peak, process.memoryUsage().rss);
  post({ type: 'done', result, solveMs: performance.now() - started, peakMemoryBytes: peak });
} catch (e) {
  if (guard?.exceeded()) {
    const over = e instanceof MemoryBudgetExceeded ? e.usedBytes : guard.peakBytes();
    post({ type: 'error', message: 'memory budget', input: false, memoryBytes: over });
  } else {
    const input = e instanceof FlowInputError;
    post({ type: 'error', message: e instanceof Error ? e.message : String(e), input });
  }
}

// One piece of untrusted or heavy work in a worker thread with a time and memory budget: a run's
// solve, a search, the reading of an uploaded file, an export. (Work the API answers while the
// request waits, which cannot pay a thread's start-up each time, runs on warm threads under the
// same budgets: budgeted-pool.ts.) The promise settles once, with what the
// caller's message handler accepts or the reason the thread stopped, worded by the caller so a
// planner can read it. cancel() and interrupt() stop the thread at once.
import { Worker } from 'node:worker_threads';

export type ThreadBudget = { timeSeconds: number; memoryMegabytes: number };
export type ThreadStop = 'budget' | 'cancelled' | 'interrupted' | 'crash';

export type ThreadWords = {
  /** The time budget ran out. */
  tooLong: string;
  /** The heap budget ran out (the thread's resource limit). */
  tooBig: string;
  /** The thread threw outside the caller's own error messages. */
  failed: (message: string) => string;
  /** The thread ended without settling. */
  noAnswer: string;
};

export type Settle<T> = { resolve: (value: T) => void; reject: (error: Error) => void };

/** The error a worker thread ends with when it outgrows its heap limit (resourceLimits). */
export const isOutOfMemory = (err: unknown): boolean => (err as { code?: string } | null)?.code === 'ERR_WORKER_OUT_OF_MEMORY';

export function budgetedThread<T, M>(spec: {
  entry: URL;
  workerData: unknown;
  budget: ThreadBudget;
  words: ThreadWords;
  fail: (kind: ThreadStop, message: string) => Error;
  onMessage: (message: M, settle: Settle<T>) => void;
}): { done: Promise<T>; cancel: () => void; interrupt: () => void } {
  const worker = new Worker(spec.entry, {
    workerData: spec.workerData,
    resourceLimits: { maxOldGenerationSizeMb: spec.budget.memoryMegabytes },
  });
  let stopReason: Error | null = null;
  const stop = (reason: Error) => {
    stopReason = reason;
    void worker.terminate();
  };
  const done = new Promise<T>((resolve, reject) => {
    let settled = false;
    const timer = setTimeout(() => stop(spec.fail('budget', spec.words.tooLong)), spec.budget.timeSeconds * 1000);
    const finish = (fn: () => void) => {
      if (settled) return;
      settled = true;
      clearTimeout(timer);
      fn();
    };
    const settle: Settle<T> = { resolve: (value) => finish(() => resolve(value)), reject: (error) => finish(() => reject(error)) };
    worker.on('message', (m: M) => spec.onMessage(m, settle));
    worker.on('error', (err: Error & { code?: string }) => {
      settle.reject(isOutOfMemory(err) ? spec.fail('budget', spec.words.tooBig) : spec.fail('crash', spec.words.failed(err.message)));
    });
    worker.on('exit', () => settle.reject(stopReason ?? spec.fail('crash', spec.words.noAnswer)));
  });
  return {
    done,
    cancel: () => stop(spec.fail('cancelled', 'Cancelled.')),
    // The process is stopping: the work is not over, another worker will take it again.
    interrupt: () => stop(spec.fail('interrupted', 'Interrupted: the worker is stopping.')),
  };
}

// Runs the signature check of an uploaded PDF in a worker thread (warm threads of a budgeted
// pool per process, server/budgeted-pool.ts), so that no file, however it is built, holds the
// API's event loop: the check gets a time budget that starts when the thread begins it (a cold
// thread's start-up is not counted) and a heap budget; a check that exceeds either is stopped and
// its thread replaced. The pool is small and its queue short, since anyone may ask: beyond it the
// caller is told to come back.
import { budgetedPool, PoolTaskFailed, type BudgetedPool } from '../../../budgeted-pool';
import { HttpError } from '../../../errors';
import type { PdfVerification } from './verify-pdf';
import type { VerifyTask } from './verify-worker';

export type VerifierBudget = {
  /** Time the check itself may take, from the moment its thread starts it. */
  timeMilliseconds: number;
  /** Heap of the verifier's thread (V8 old generation). */
  memoryMegabytes: number;
  /** Threads per process, and checks that may wait for one. */
  threads: number;
  queue: number;
};

const pools = new Map<string, BudgetedPool<VerifyTask, PdfVerification>>();

const verifierTask = new URL('./verify-worker.ts', import.meta.url);

function poolFor(budget: VerifierBudget, taskFile: URL): BudgetedPool<VerifyTask, PdfVerification> {
  const key = `${taskFile.href} ${budget.memoryMegabytes}/${budget.threads}/${budget.queue}`;
  let pool = pools.get(key);
  if (!pool) {
    pool = budgetedPool<VerifyTask, PdfVerification>({
      task: taskFile,
      threads: budget.threads,
      queue: budget.queue,
      // A thread kept for a minute after its last check, so a burst of checks starts it once.
      idleMilliseconds: 60_000,
      // A cold thread loads the TypeScript loader and node-forge first: allowed this long on top.
      startUpMilliseconds: 15_000,
      memoryMegabytes: budget.memoryMegabytes,
      youngMegabytes: Math.min(32, budget.memoryMegabytes / 4),
    });
    pools.set(key, pool);
  }
  return pool;
}

export class VerifierRefusal extends HttpError {}

/** `taskFile` is for tests of the budget (a task that never ends); the verifier otherwise. */
export async function verifyInWorker(pdf: Buffer, certificates: string[], budget: VerifierBudget, taskFile = verifierTask): Promise<PdfVerification> {
  // A copy of exactly these bytes (an upload's Buffer may share a larger pooled ArrayBuffer),
  // moved to the thread rather than cloned.
  const bytes = new Uint8Array(pdf);
  try {
    return await poolFor(budget, taskFile).run({ pdf: bytes, certificates }, budget.timeMilliseconds, [bytes.buffer as ArrayBuffer]);
  } catch (err) {
    if (!(err instanceof PoolTaskFailed)) throw err;
    if (err.stop === 'time') throw new VerifierRefusal(422, 'invalid_request', 'This file took longer to check than allowed, so it is not a briefing this check can confirm.');
    if (err.stop === 'memory') throw new VerifierRefusal(422, 'invalid_request', 'This file needed more memory to check than allowed, so it is not a briefing this check can confirm.');
    if (err.stop === 'busy') throw new VerifierRefusal(503, 'busy', 'Many signature checks are under way. Try again in a moment.');
    throw new Error(`The signature check failed: ${err.message}`);
  }
}

/** Ends the threads (tests, shutdown). */
export async function closeVerifierPools(): Promise<void> {
  const all = [...pools.values()];
  pools.clear();
  await Promise.all(all.map((p) => p.close()));
}

// Runs the signature check of an uploaded PDF in a worker thread (a piscina pool per process),
// so that no file, however it is built, holds the API's event loop: the check gets a time
// budget that starts when the thread begins it (a cold thread's start-up is not counted) and a
// heap budget; a check that exceeds either is stopped and its thread replaced. The pool is
// small and its queue short, since anyone may ask: beyond it the caller is told to come back.
import { MessageChannel } from 'node:worker_threads';
import { Piscina } from 'piscina';
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

/** A cold thread loads the TypeScript loader and node-forge first: allowed this long on top. */
const START_UP_MILLISECONDS = 15_000;

const pools = new Map<string, Piscina<VerifyTask, PdfVerification>>();

const verifierTask = new URL('./verify-worker-entry.mjs', import.meta.url);

function poolFor(budget: VerifierBudget, taskFile: URL): Piscina<VerifyTask, PdfVerification> {
  const key = `${taskFile.href} ${budget.memoryMegabytes}/${budget.threads}/${budget.queue}`;
  let pool = pools.get(key);
  if (!pool) {
    pool = new Piscina<VerifyTask, PdfVerification>({
      filename: taskFile.href,
      minThreads: 0,
      maxThreads: budget.threads,
      maxQueue: budget.queue,
      // A thread kept for a minute after its last check, so a burst of checks starts it once.
      idleTimeout: 60_000,
      resourceLimits: { maxOldGenerationSizeMb: budget.memoryMegabytes, maxYoungGenerationSizeMb: Math.min(32, budget.memoryMegabytes / 4) },
    });
    pools.set(key, pool);
  }
  return pool;
}

export class VerifierRefusal extends HttpError {}

/** `taskFile` is for tests of the budget (a task that never ends); the verifier otherwise. */
export async function verifyInWorker(pdf: Buffer, certificates: string[], budget: VerifierBudget, taskFile = verifierTask): Promise<PdfVerification> {
  const pool = poolFor(budget, taskFile);
  // A copy of exactly these bytes (an upload's Buffer may share a larger pooled ArrayBuffer),
  // moved to the thread rather than cloned.
  const bytes = new Uint8Array(pdf);
  const { port1: started, port2: startedInWorker } = new MessageChannel();
  const controller = new AbortController();
  let reason: 'time' | null = null;
  const stop = () => {
    reason = 'time';
    controller.abort();
  };
  let timer = setTimeout(stop, budget.timeMilliseconds + START_UP_MILLISECONDS);
  started.once('message', () => {
    clearTimeout(timer);
    timer = setTimeout(stop, budget.timeMilliseconds);
  });
  try {
    return await pool.run(
      { pdf: bytes, certificates, started: startedInWorker },
      { signal: controller.signal, transferList: [bytes.buffer as ArrayBuffer, startedInWorker] },
    );
  } catch (err) {
    if (reason === 'time') {
      throw new VerifierRefusal(422, 'invalid_request', 'This file took longer to check than allowed, so it is not a briefing this check can confirm.');
    }
    const code = (err as { code?: string }).code;
    if (code === 'ERR_WORKER_OUT_OF_MEMORY') {
      throw new VerifierRefusal(422, 'invalid_request', 'This file needed more memory to check than allowed, so it is not a briefing this check can confirm.');
    }
    if (/task queue|workers are busy/i.test((err as Error).message)) {
      throw new VerifierRefusal(503, 'busy', 'Many signature checks are under way. Try again in a moment.');
    }
    throw err;
  } finally {
    clearTimeout(timer);
    started.close();
  }
}

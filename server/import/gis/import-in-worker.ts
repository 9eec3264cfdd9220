// Reads one uploaded file in a pooled worker thread (piscina) with a time and memory budget:
// the API's event loop never parses untrusted bytes. Threads stay warm between uploads
// (starting one loads the TypeScript readers: seconds on a busy machine). Refusals come back
// as the RoadImportError the readers threw; a file that needs more than the budget is refused
// the same way, with the reason, and its thread is replaced.
import { availableParallelism } from 'node:os';
import { Piscina } from 'piscina';
import { RoadImportError } from '../../../shared/geo/road-import-error';
import type { ImportResults, ImportTask, ImportWorkerMessage } from './import-task';

export interface ImportBudget {
  timeSeconds: number;
  memoryMegabytes: number;
}

export const DEFAULT_IMPORT_BUDGET: ImportBudget = { timeSeconds: 300, memoryMegabytes: 4096 };

const pools = new Map<number, Piscina>();

function poolFor(memoryMegabytes: number): Piscina {
  let pool = pools.get(memoryMegabytes);
  if (!pool) {
    pool = new Piscina({
      filename: new URL('./import-worker-entry.mjs', import.meta.url).href,
      minThreads: 0,
      maxThreads: Math.max(1, Math.min(4, availableParallelism())),
      idleTimeout: 60_000,
      resourceLimits: { maxOldGenerationSizeMb: memoryMegabytes },
    });
    pools.set(memoryMegabytes, pool);
  }
  return pool;
}

export async function readInWorker<K extends ImportTask['kind']>(task: Extract<ImportTask, { kind: K }>, budget: ImportBudget = DEFAULT_IMPORT_BUDGET): Promise<ImportResults[K]> {
  const signal = AbortSignal.timeout(budget.timeSeconds * 1000);
  let answer: ImportWorkerMessage;
  try {
    answer = (await poolFor(budget.memoryMegabytes).run(task, { signal })) as ImportWorkerMessage;
  } catch (error) {
    const e = error as Error & { code?: string; name?: string };
    if (signal.aborted) throw new RoadImportError('unreadableFile', `${task.fileName}: reading the file took longer than ${budget.timeSeconds} s and was stopped; split the area into smaller files`);
    if (e.code === 'ERR_WORKER_OUT_OF_MEMORY') throw new RoadImportError('unreadableFile', `${task.fileName}: reading the file needed more than ${budget.memoryMegabytes} MB and was stopped; split the area into smaller files`);
    throw error;
  }
  if (answer.type === 'refused') throw new RoadImportError(answer.failure.code, answer.failure.message, answer.failure.badFeatures);
  if (answer.type === 'error') throw new Error(`reading ${task.fileName} failed: ${answer.message}`);
  return answer.result as ImportResults[K];
}

/** Stops the pools' threads (graceful shutdown, tests). */
export async function closeImportWorkers(): Promise<void> {
  const all = [...pools.values()];
  pools.clear();
  await Promise.all(all.map((p) => p.destroy()));
}

// Reads what an uploaded file holds, for the field-mapping step, in a warm worker thread with a
// time and memory budget (server/budgeted-pool.ts): the API's event loop never parses untrusted
// bytes. Refusals come back as the RoadImportError the readers threw; a file that needs more than
// the budget is refused the same way, with the reason, and its thread is replaced.
import { availableParallelism } from 'node:os';
import type { FileSchema, SourceReadOptions } from '../../../shared/api/road-import';
import { RoadImportError } from '../../../shared/geo/road-import-error';
import { budgetedPool, PoolTaskFailed, type BudgetedPool } from '../../budgeted-pool';
import type { SchemaAnswer, SchemaTask } from './read-schema-task';

export type SchemaBudget = { timeSeconds: number; memoryMegabytes: number };
export const DEFAULT_SCHEMA_BUDGET: SchemaBudget = { timeSeconds: 300, memoryMegabytes: 4096 };

const pools = new Map<number, BudgetedPool<SchemaTask, SchemaAnswer>>();
function poolFor(memoryMegabytes: number): BudgetedPool<SchemaTask, SchemaAnswer> {
  let pool = pools.get(memoryMegabytes);
  if (!pool) {
    pool = budgetedPool<SchemaTask, SchemaAnswer>({
      task: new URL('./read-schema-task.ts', import.meta.url),
      threads: Math.max(1, Math.min(4, availableParallelism())),
      // Uploads are bounded per process already (UPLOADS_AT_ONCE): they wait rather than fail.
      queue: 1_000,
      memoryMegabytes,
    });
    pools.set(memoryMegabytes, pool);
  }
  return pool;
}

export async function readSchemaInWorker(bytes: Uint8Array, options: SourceReadOptions, fileName: string, budget: SchemaBudget = DEFAULT_SCHEMA_BUDGET): Promise<FileSchema> {
  let answer: SchemaAnswer;
  try {
    answer = await poolFor(budget.memoryMegabytes).run({ bytes, options, fileName }, budget.timeSeconds * 1000);
  } catch (e) {
    if (!(e instanceof PoolTaskFailed)) throw e;
    if (e.stop === 'time') throw new RoadImportError('unreadableFile', `${fileName}: reading the file took longer than ${budget.timeSeconds} s and was stopped; split the area into smaller files`);
    if (e.stop === 'memory') throw new RoadImportError('unreadableFile', `${fileName}: reading the file needed more than ${budget.memoryMegabytes} MB and was stopped; split the area into smaller files`);
    throw new Error(`reading ${fileName} failed: ${e.message}`);
  }
  if (answer.type === 'refused') throw new RoadImportError(answer.failure.code, answer.failure.message, answer.failure.badFeatures);
  return answer.schema;
}

/** Stops the pools' threads (graceful shutdown, tests). */
export async function closeSchemaReaders(): Promise<void> {
  const all = [...pools.values()];
  pools.clear();
  await Promise.all(all.map((p) => p.close()));
}

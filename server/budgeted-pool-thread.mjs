// One thread of a budgeted pool (budgeted-pool.ts). Worker threads do not inherit the main
// thread's TypeScript loader: register tsx here, load the pool's task module, then do one task
// per message, saying when each starts (the time budget counts from there) and how it ended.
import { parentPort, workerData } from 'node:worker_threads';
import { register } from 'tsx/esm/api';

register();
const { default: task } = await import(workerData.task);

parentPort.on('message', async ({ id, task: input }) => {
  parentPort.postMessage({ id, type: 'started' });
  try {
    const value = await task(input);
    // Bytes are moved, not copied (a copy first: a Buffer may share a larger pooled ArrayBuffer).
    if (value instanceof Uint8Array) {
      const own = new Uint8Array(value);
      parentPort.postMessage({ id, type: 'done', value: own }, [own.buffer]);
    } else parentPort.postMessage({ id, type: 'done', value });
  } catch (e) {
    parentPort.postMessage({ id, type: 'error', message: e instanceof Error ? e.message : String(e) });
  }
});

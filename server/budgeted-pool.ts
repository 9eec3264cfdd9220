// Warm worker threads for work the API does while a request waits (the briefing's PDF layout,
// the check of an uploaded PDF, a file's schema for the mapping step), under the budgets of
// budgeted-thread.ts: each task has a time budget and each thread a heap budget
// (resourceLimits); a task past either has its thread stopped (a new one is started for the
// next task) and fails with the reason. Threads stay warm between tasks, since starting one
// loads the TypeScript loader and the task's modules (seconds on a busy machine), and a cold
// thread's start-up is allowed on top of the time budget, which counts from when the thread
// starts the task. At most `threads` run at once and `queue` wait; beyond, a task is refused at
// once. The task module's default export takes one task and returns (or resolves to) its answer.
import { Worker, type Transferable } from 'node:worker_threads';
import { isOutOfMemory } from './budgeted-thread';

export type PoolSpec = {
  /** The task module (TypeScript or JavaScript) whose default export does one task. */
  task: URL;
  threads: number;
  /** Tasks that may wait for a thread. */
  queue: number;
  /** Heap of each thread (V8 old generation). */
  memoryMegabytes: number;
  youngMegabytes?: number;
  /** Threads kept however long they are idle (a pool that must answer its first task quickly). */
  keepWarm?: number;
  /** How long an idle thread above `keepWarm` is kept. */
  idleMilliseconds?: number;
  /** Allowed on top of a task's time budget before its thread starts it (a cold thread loading its modules). */
  startUpMilliseconds?: number;
};

/** Why a task failed: its time or heap budget, a full pool, the task threw, or the pool was closed. */
export type PoolStop = 'time' | 'memory' | 'busy' | 'error' | 'closed';

export class PoolTaskFailed extends Error {
  constructor(
    readonly stop: PoolStop,
    message: string,
  ) {
    super(message);
  }
}

type Job = {
  id: number;
  task: unknown;
  transferList: Transferable[];
  timeMilliseconds: number;
  resolve: (value: unknown) => void;
  reject: (error: Error) => void;
  timer: NodeJS.Timeout | null;
  stop: PoolStop | null;
};
type Slot = { worker: Worker; job: Job | null; idleTimer: NodeJS.Timeout | null; error: unknown };
type HostMessage = { id: number; type: 'started' } | { id: number; type: 'done'; value: unknown } | { id: number; type: 'error'; message: string };

const host = new URL('./budgeted-pool-thread.mjs', import.meta.url);

export type BudgetedPool<T, A> = {
  /** Runs one task within `timeMilliseconds` (from when a thread starts it); rejects with PoolTaskFailed. */
  run(task: T, timeMilliseconds: number, transferList?: Transferable[]): Promise<A>;
  /** Starts the threads kept warm now, so the first task does not wait for one. */
  warm(): void;
  /** Stops every thread; tasks waiting or running fail. */
  close(): Promise<void>;
};

export function budgetedPool<T, A>(spec: PoolSpec): BudgetedPool<T, A> {
  const slots: Slot[] = [];
  const waiting: Job[] = [];
  const keepWarm = spec.keepWarm ?? 0;
  const idleMilliseconds = spec.idleMilliseconds ?? 60_000;
  const startUpMilliseconds = spec.startUpMilliseconds ?? 15_000;
  let nextId = 1;
  let closed = false;

  function open(): Slot {
    const worker = new Worker(host, {
      workerData: { task: spec.task.href },
      resourceLimits: { maxOldGenerationSizeMb: spec.memoryMegabytes, ...(spec.youngMegabytes ? { maxYoungGenerationSizeMb: spec.youngMegabytes } : {}) },
    });
    const slot: Slot = { worker, job: null, idleTimer: null, error: null };
    worker.on('message', (m: HostMessage) => heard(slot, m));
    worker.on('error', (err) => (slot.error = err));
    worker.on('exit', () => ended(slot));
    slots.push(slot);
    return slot;
  }

  function start(slot: Slot, job: Job): void {
    if (slot.idleTimer) clearTimeout(slot.idleTimer);
    slot.idleTimer = null;
    slot.job = job;
    slot.worker.ref();
    job.timer = setTimeout(() => stop(slot, 'time'), job.timeMilliseconds + startUpMilliseconds);
    slot.worker.postMessage({ id: job.id, task: job.task }, job.transferList);
  }

  function stop(slot: Slot, why: PoolStop): void {
    if (slot.job) slot.job.stop = why;
    void slot.worker.terminate();
  }

  function idle(slot: Slot): void {
    slot.job = null;
    const next = waiting.shift();
    if (next) return start(slot, next);
    // An idle thread never keeps the process alive.
    slot.worker.unref();
    if (slots.indexOf(slot) >= keepWarm) slot.idleTimer = setTimeout(() => void slot.worker.terminate(), idleMilliseconds);
  }

  function heard(slot: Slot, m: HostMessage): void {
    const job = slot.job;
    if (!job || m.id !== job.id) return;
    if (m.type === 'started') {
      // The budget counts from here: the thread has loaded its modules and begun the task.
      clearTimeout(job.timer!);
      job.timer = setTimeout(() => stop(slot, 'time'), job.timeMilliseconds);
      return;
    }
    clearTimeout(job.timer!);
    if (m.type === 'done') job.resolve(m.value);
    else job.reject(new PoolTaskFailed('error', m.message));
    idle(slot);
  }

  function ended(slot: Slot): void {
    if (slot.idleTimer) clearTimeout(slot.idleTimer);
    slots.splice(slots.indexOf(slot), 1);
    const job = slot.job;
    if (job) {
      clearTimeout(job.timer!);
      const why: PoolStop = job.stop ?? (isOutOfMemory(slot.error) ? 'memory' : closed ? 'closed' : 'error');
      const said = slot.error instanceof Error ? slot.error.message : 'the thread stopped';
      job.reject(new PoolTaskFailed(why, why === 'time' ? 'The task outlasted its time budget.' : why === 'memory' ? 'The task outgrew its memory budget.' : said));
    }
    // The waiting go on, on a new thread.
    while (!closed && waiting.length > 0 && slots.length < spec.threads) start(open(), waiting.shift()!);
  }

  return {
    run(task, timeMilliseconds, transferList = []) {
      return new Promise<A>((resolve, reject) => {
        if (closed) return reject(new PoolTaskFailed('closed', 'The pool is closed.'));
        const job: Job = { id: nextId++, task, transferList, timeMilliseconds, resolve: resolve as (v: unknown) => void, reject, timer: null, stop: null };
        const free = slots.find((s) => s.job === null);
        if (free) return start(free, job);
        if (slots.length < spec.threads) return start(open(), job);
        if (waiting.length < spec.queue) return void waiting.push(job);
        reject(new PoolTaskFailed('busy', 'Every thread is busy and the queue is full.'));
      });
    },
    warm() {
      while (!closed && slots.length < keepWarm) idle(open());
    },
    async close() {
      closed = true;
      for (const job of waiting.splice(0)) job.reject(new PoolTaskFailed('closed', 'The pool is closed.'));
      await Promise.all(slots.map((s) => s.worker.terminate()));
    },
  };
}

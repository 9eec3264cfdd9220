// The warm threads behind the briefing renderer, the PDF check and the file-schema read
// (server/budgeted-pool.ts): threads are reused between tasks; a task past its time or heap
// budget fails with that reason, its thread is replaced and the next task is answered; at most
// `threads` run and `queue` wait, beyond which a task is refused at once; the event loop stays
// free while a thread spins.
import { afterEach, describe, expect, it } from 'vitest';
import { budgetedPool, PoolTaskFailed, type BudgetedPool } from '../../server/budgeted-pool';

type Task = { value?: number; spin?: number; grow?: boolean; fail?: string; bytes?: number[] };
type Answer = { threadId: number; asked: number } | Uint8Array;
const task = new URL('./support/pool-tasks/echo-task.mjs', import.meta.url);

let pool: BudgetedPool<Task, Answer> | null = null;
const make = (threads: number, queue: number, memoryMegabytes = 64) => (pool = budgetedPool<Task, Answer>({ task, threads, queue, memoryMegabytes }));
afterEach(async () => {
  await pool?.close();
  pool = null;
});

const failure = async (p: Promise<unknown>) => p.then(() => null, (e: unknown) => e as PoolTaskFailed);

describe('a budgeted pool', () => {
  it('answers on a warm thread: the same thread serves task after task', async () => {
    const p = make(1, 4);
    const first = (await p.run({ value: 1 }, 5_000)) as { threadId: number; asked: number };
    const second = (await p.run({ value: 2 }, 5_000)) as { threadId: number; asked: number };
    expect(first.asked).toBe(1);
    expect(second.asked).toBe(2);
    expect(second.threadId).toBe(first.threadId);
  }, 60_000);

  it('moves bytes back whole', async () => {
    const bytes = (await make(1, 0).run({ bytes: [37, 80, 68, 70] }, 5_000)) as Uint8Array;
    expect([...bytes]).toEqual([37, 80, 68, 70]);
  }, 60_000);

  it('stops a task past its time budget, keeps the event loop free meanwhile, and answers the next on a new thread', async () => {
    const p = make(1, 4);
    const warm = (await p.run({ value: 0 }, 5_000)) as { threadId: number };
    const ticks: number[] = [];
    const ticker = setInterval(() => ticks.push(performance.now()), 20);
    const started = performance.now();
    const err = await failure(p.run({ spin: 60_000 }, 300));
    clearInterval(ticker);
    expect(err).toBeInstanceOf(PoolTaskFailed);
    expect(err!.stop).toBe('time');
    expect(performance.now() - started).toBeLessThan(30_000);
    // The main thread kept ticking while the task spun in its thread.
    expect(ticks.length).toBeGreaterThanOrEqual(5);
    const next = (await p.run({ value: 3 }, 20_000)) as { threadId: number; asked: number };
    expect(next.asked).toBe(3);
    expect(next.threadId).not.toBe(warm.threadId);
  }, 90_000);

  it('stops a task past its heap budget with that reason, and answers the next', async () => {
    const p = make(1, 4, 32);
    const err = await failure(p.run({ grow: true }, 60_000));
    expect(err?.stop).toBe('memory');
    expect(((await p.run({ value: 4 }, 20_000)) as { asked: number }).asked).toBe(4);
  }, 90_000);

  it('says what a task threw, and the thread goes on', async () => {
    const p = make(1, 4);
    const err = await failure(p.run({ fail: 'the file ended early' }, 5_000));
    expect(err?.stop).toBe('error');
    expect(err?.message).toBe('the file ended early');
    expect(((await p.run({ value: 5 }, 20_000)) as { asked: number }).asked).toBe(5);
  }, 60_000);

  it('runs at most `threads` at once, lets `queue` wait, and refuses beyond at once', async () => {
    const p = make(1, 1);
    const running = p.run({ spin: 1_500, value: 6 }, 30_000);
    const waiting = p.run({ value: 7 }, 30_000);
    const refused = await failure(p.run({ value: 8 }, 30_000));
    expect(refused?.stop).toBe('busy');
    expect(((await running) as { asked: number }).asked).toBe(6);
    expect(((await waiting) as { asked: number }).asked).toBe(7);
  }, 60_000);
});

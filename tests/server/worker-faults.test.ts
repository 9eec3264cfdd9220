// Real worker processes sharing the queue on the real database: a worker killed mid-run
// (SIGKILL), or while it prepares the run, leaves the run to another, which finishes it once; a worker stopped with SIGTERM
// puts the run in hand back in the queue after its grace period and exits cleanly, and another
// worker finishes it; two workers never take the same run twice.
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startRunQueue, type RunQueue } from '../../server/queue/run-queue';
import { createApp } from '../../server/app';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './support/test-app';
import { defaultRunParameters, runWithResultSchema, type RunWithResult } from '../../shared/api/runs';

const root = path.resolve(import.meta.dirname, '../..');
const workerEnv = { RUN_TIME_BUDGET_SECONDS: '60', RUN_EXPIRY_SLACK_SECONDS: '2', QUEUE_MAINTENANCE_SECONDS: '1', WORKER_SHUTDOWN_GRACE_SECONDS: '1' };

type Worker = { proc: ChildProcess; took: string[]; finished: string[]; returned: string[]; exited: Promise<number | null> };
const workers: Worker[] = [];

function startWorker(databaseUrl: string): Promise<Worker> {
  const proc = spawn(process.execPath, ['--import', 'tsx', 'server/worker.ts'], {
    cwd: root,
    env: { ...process.env, ...workerEnv, DATABASE_URL: databaseUrl, NODE_ENV: 'test' },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  const exited = new Promise<number | null>((resolve) => proc.on('exit', (code) => resolve(code)));
  const w: Worker = { proc, took: [], finished: [], returned: [], exited };
  workers.push(w);
  return new Promise((resolve, reject) => {
    proc.stdout!.on('data', (chunk: Buffer) => {
      for (const line of chunk.toString().split('\n')) {
        const took = /took run (\S+)/.exec(line);
        const done = /finished run (\S+)/.exec(line);
        const returned = /returned run (\S+) to the queue/.exec(line);
        if (returned) w.returned.push(returned[1]!);
        if (took) w.took.push(took[1]!);
        if (done) w.finished.push(done[1]!);
        if (/taking runs from the queue/.test(line)) resolve(w);
      }
    });
    proc.on('exit', (code) => reject(new Error(`worker exited early (${code})`)));
  });
}

let ctx: TestContext;
let queue: RunQueue;
let app: ReturnType<typeof createApp>;
let planner: SignedInAgent;
let planId: string;

async function until<T>(what: string, timeoutMs: number, probe: () => Promise<T | undefined>): Promise<T> {
  const end = Date.now() + timeoutMs;
  for (;;) {
    const v = await probe();
    if (v !== undefined) return v;
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

async function getRun(id: string): Promise<RunWithResult> {
  return runWithResultSchema.parse((await planner.agent.get(`/api/plans/${planId}/runs/${id}`).expect(200)).body);
}

// Past its first phase (preparation, prepare-runs.ts): the solver is at work.
const solving = (r: RunWithResult) => r.status === 'running' && !/^(preparing|prepared|starting)/.test(r.phase);

async function startRun(parameters: object): Promise<string> {
  return (await planner.agent.post(`/api/plans/${planId}/runs`).set('x-csrf-token', planner.csrf).send({ parameters }).expect(202)).body.id;
}

beforeAll(async () => {
  ctx = await createTestContext(workerEnv);
  queue = await startRunQueue(ctx.config);
  app = createApp({ config: ctx.config, db: ctx.db, pool: ctx.pool, clientDir: '/nonexistent', runQueue: queue, log: (e) => ctx.errors.push(e) });
  planner = await signInAs(app, 'planner');
  planId = (await planner.agent.get('/api/plans').expect(200)).body.plans[0].id;
  await Promise.all([startWorker(ctx.url), startWorker(ctx.url)]);
}, 60_000);

afterAll(async () => {
  for (const w of workers) w.proc.kill('SIGKILL');
  await queue?.stop();
  await ctx?.drop();
});

describe('worker faults', () => {
  it('a run whose worker is killed mid-run finishes on the other worker, stored once', async () => {
    // Long enough to be caught mid-solve: 4 hours in 10-second steps at half capacity.
    const id = await startRun({ ...defaultRunParameters, horizonMinutes: 4 * 60, timeStepSeconds: 10, capacityFactor: 0.5 });
    const victim = await until('a worker to take the run', 20_000, async () => workers.find((w) => w.took.includes(id)));
    await until('the solve to be under way', 30_000, async () => (solving(await getRun(id)) ? true : undefined));
    victim.proc.kill('SIGKILL');
    const survivor = workers.find((w) => w !== victim)!;
    // The retry waits out the killed job's expiry (budget + slack) before the survivor takes it.
    const done = await until('the run to finish elsewhere', 150_000, async () => {
      const r = await getRun(id);
      return r.status === 'succeeded' || r.status === 'failed' ? r : undefined;
    });
    expect(done.status, done.failureReason ?? '').toBe('succeeded');
    expect(survivor.finished).toContain(id);
    expect(victim.finished).not.toContain(id);
    const stored = await ctx.pool.query("SELECT count(*)::int AS n FROM runs WHERE id = $1 AND status = 'succeeded' AND result IS NOT NULL", [id]);
    expect(stored.rows[0].n).toBe(1);
  }, 240_000);

  it('a run whose worker is killed while preparing it is prepared and finished once by the other worker', async () => {
    await startWorker(ctx.url);
    const id = await startRun({ ...defaultRunParameters, horizonMinutes: 120, timeStepSeconds: 60, capacityFactor: 0.8 });
    // Hold the worker inside its first phase: reading the zones waits for this lock.
    const blocker = await ctx.pool.connect();
    try {
      await blocker.query('BEGIN');
      await blocker.query('LOCK TABLE zones IN ACCESS EXCLUSIVE MODE');
      const victim = await until('a worker to take the run', 20_000, async () => workers.find((w) => w.took.includes(id) && w.proc.exitCode === null));
      await until('the run to be in preparation', 20_000, async () => {
        const r = await getRun(id);
        return r.status === 'running' && r.phase.startsWith('preparing') ? true : undefined;
      });
      victim.proc.kill('SIGKILL');
      await victim.exited;
      await blocker.query('COMMIT');
      // The retry waits out the killed job's expiry (budget + slack) before the survivor takes it.
      const done = await until('the run to finish elsewhere', 150_000, async () => {
        const r = await getRun(id);
        return r.status === 'succeeded' || r.status === 'failed' ? r : undefined;
      });
      expect(done.status, done.failureReason ?? '').toBe('succeeded');
      expect(victim.finished).not.toContain(id);
      expect(workers.filter((w) => w !== victim).flatMap((w) => w.finished.filter((f) => f === id))).toEqual([id]);
      const stored = await ctx.pool.query("SELECT (SELECT count(*)::int FROM run_inputs WHERE run_id = $1) AS inputs, (SELECT count(*)::int FROM runs WHERE id = $1 AND result IS NOT NULL) AS results", [id]);
      expect(stored.rows[0]).toEqual({ inputs: 1, results: 1 });
    } finally {
      await blocker.query('ROLLBACK').catch(() => undefined);
      blocker.release();
    }
  }, 240_000);

  it('several runs shared by the workers are each taken once', async () => {
    await startWorker(ctx.url);
    const ids: string[] = [];
    for (const step of [60, 90, 120, 180]) ids.push(await startRun({ ...defaultRunParameters, horizonMinutes: 180, timeStepSeconds: step }));
    await until('all runs to finish', 90_000, async () => {
      const runs = await Promise.all(ids.map(getRun));
      return runs.every((r) => r.status === 'succeeded') ? true : undefined;
    });
    const alive = workers.filter((w) => w.proc.exitCode === null && w.proc.signalCode === null);
    for (const id of ids) {
      const takers = alive.flatMap((w) => w.took.filter((t) => t === id));
      expect(takers).toHaveLength(1);
    }
  }, 120_000);

  it('a worker stopped with SIGTERM mid-run returns the run to the queue, exits cleanly, and another finishes it', async () => {
    const id = await startRun({ ...defaultRunParameters, horizonMinutes: 4 * 60, timeStepSeconds: 10, capacityFactor: 0.45 });
    const taker = await until('a worker to take the run', 20_000, async () => workers.find((w) => w.took.includes(id) && w.proc.exitCode === null));
    await until('the solve to be under way', 30_000, async () => (solving(await getRun(id)) ? true : undefined));
    taker.proc.kill('SIGTERM');
    // Grace of 1 s, then the run goes back: the process ends well before the job would expire (62 s).
    expect(await taker.exited).toBe(0);
    expect(taker.returned).toEqual([id]);
    expect(taker.finished).not.toContain(id);
    const done = await until('the run to finish', 90_000, async () => {
      const r = await getRun(id);
      return r.status === 'succeeded' || r.status === 'failed' ? r : undefined;
    });
    expect(done.status, done.failureReason ?? '').toBe('succeeded');
    expect(done.result!.headline.steadyStateVehiclesPerHour).toBeGreaterThan(0);
    expect(workers.filter((w) => w !== taker).some((w) => w.finished.includes(id))).toBe(true);
  }, 150_000);
});

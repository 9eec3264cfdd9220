// Starting a run records it and queues its job in one transaction: a failed enqueue leaves no
// run behind, and a job never outlives a start that rolled back. Runs that lost their job are
// found by the reconciler, so they stop counting against the organization's in-flight limit.
// No worker runs here: the queue is real (pg-boss on the test database) but nothing takes jobs.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { startRunQueue, type RunQueue } from '../../server/queue/run-queue';
import type { RunEnqueuer } from '../../server/queue/run-enqueuer';
import { reconcileRuns } from '../../server/queue/run-reconciler';
import { createTestContext, countRows, signInAs, type SignedInAgent, type TestContext } from './support/test-app';
import { defaultRunParameters } from '../../shared/api/runs';

let ctx: TestContext;
let queue: RunQueue;
let planId: string;
const parameters = { ...defaultRunParameters, horizonMinutes: 60, timeStepSeconds: 300 };
let variant = 0;
const nextParameters = () => ({ ...parameters, capacityFactor: 1 - ++variant / 100 });

async function appWith(runQueue: RunEnqueuer): Promise<SignedInAgent> {
  const app = createApp({ config: ctx.config, db: ctx.db, pool: ctx.pool, clientDir: '/nonexistent', log: (e) => ctx.errors.push(e), runQueue });
  return signInAs(app, 'planner');
}

async function jobsFor(key: 'runId' | 'sweepId', id: string): Promise<string[]> {
  const { rows } = await ctx.pool.query<{ state: string }>("SELECT state FROM pgboss.job WHERE name = 'runs' AND data->>$1 = $2", [key, id]);
  return rows.map((r) => r.state);
}

beforeAll(async () => {
  ctx = await createTestContext({ RUNS_IN_FLIGHT_PER_ORGANIZATION: '50' });
  queue = await startRunQueue(ctx.config);
  const planner = await appWith(queue);
  planId = (await planner.agent.get('/api/plans').expect(200)).body.plans[0].id;
});
afterAll(async () => {
  await queue?.stop();
  await ctx?.drop();
});

describe('starting a run', () => {
  it('answers with a queued run whose job was committed with it', async () => {
    const planner = await appWith(queue);
    const res = await planner.agent.post(`/api/plans/${planId}/runs`).set('x-csrf-token', planner.csrf).send({ parameters: nextParameters() }).expect(202);
    expect(res.body.status).toBe('queued');
    expect(await jobsFor('runId', res.body.id)).toEqual(['created']);
    // Prepared by the worker, not by the request: no input yet.
    expect((await ctx.pool.query('SELECT input_hash FROM runs WHERE id = $1', [res.body.id])).rows[0].input_hash).toBeNull();
  });

  it('a failed enqueue leaves no run, no sweep and no audit row behind', async () => {
    const planner = await appWith({
      enqueue: async () => {
        throw new Error('queue unavailable');
      },
    });
    const before = await Promise.all(['runs', 'batches', 'audit_events'].map((t) => countRows(ctx, t)));
    await planner.agent.post(`/api/plans/${planId}/runs`).set('x-csrf-token', planner.csrf).send({ parameters: nextParameters() }).expect(500);
    await planner.agent
      .post(`/api/plans/${planId}/sweeps`)
      .set('x-csrf-token', planner.csrf)
      .send({ name: 'Sweep', parameters, sweep: { parameter: 'capacityFactor', values: [0.5, 0.75] } })
      .expect(500);
    expect(await Promise.all(['runs', 'batches', 'audit_events'].map((t) => countRows(ctx, t)))).toEqual(before);
    ctx.errors.length = 0;
  });

  it('a job queued in a start that then fails is rolled back with it', async () => {
    let queuedId = '';
    const planner = await appWith({
      enqueue: async (job, within) => {
        await queue.enqueue(job, within);
        queuedId = 'runId' in job ? job.runId : job.sweepId;
        throw new Error('failed after the job was written');
      },
    });
    const before = await countRows(ctx, 'runs');
    await planner.agent.post(`/api/plans/${planId}/runs`).set('x-csrf-token', planner.csrf).send({ parameters: nextParameters() }).expect(500);
    expect(queuedId).not.toBe('');
    expect(await jobsFor('runId', queuedId)).toEqual([]);
    expect(await countRows(ctx, 'runs')).toBe(before);
    ctx.errors.length = 0;
  });

  it('a sweep is one job that prepares all its runs', async () => {
    const planner = await appWith(queue);
    const res = await planner.agent
      .post(`/api/plans/${planId}/sweeps`)
      .set('x-csrf-token', planner.csrf)
      .send({ name: 'Sweep', parameters, sweep: { parameter: 'capacityFactor', values: [0.5, 0.75, 1] } })
      .expect(202);
    expect(res.body.runs.map((r: { status: string }) => r.status)).toEqual(['queued', 'queued', 'queued']);
    expect(await jobsFor('sweepId', res.body.id)).toEqual(['created']);
    for (const r of res.body.runs) expect(await jobsFor('runId', r.id)).toEqual([]);
  });
});

describe('the reconciler', () => {
  async function inFlight(): Promise<number> {
    const { rows } = await ctx.pool.query("SELECT count(*)::int AS n FROM runs WHERE status IN ('queued', 'running')");
    return rows[0].n;
  }

  it('fails a run whose job ran out of retries, and frees its place', async () => {
    const planner = await appWith(queue);
    const id = (await planner.agent.post(`/api/plans/${planId}/runs`).set('x-csrf-token', planner.csrf).send({ parameters: nextParameters() }).expect(202)).body.id;
    const live = (await planner.agent.post(`/api/plans/${planId}/runs`).set('x-csrf-token', planner.csrf).send({ parameters: nextParameters() }).expect(202)).body.id;
    await ctx.pool.query("UPDATE runs SET status = 'running' WHERE id = $1", [id]);
    await ctx.pool.query("UPDATE pgboss.job SET state = 'failed' WHERE name = 'runs' AND data->>'runId' = $1", [id]);
    const before = await inFlight();
    const r = await reconcileRuns(ctx.db, queue, { requeueAfterSeconds: 60 });
    expect(r.failed).toEqual([id]);
    expect(r.requeued).toEqual([]);
    const { rows } = await ctx.pool.query('SELECT status, failure_reason FROM runs WHERE id = $1', [id]);
    expect(rows[0].status).toBe('failed');
    expect(rows[0].failure_reason).toMatch(/No worker could finish this analysis/);
    expect(await inFlight()).toBe(before - 1);
    // The run with a live job is left alone.
    expect((await ctx.pool.query('SELECT status FROM runs WHERE id = $1', [live])).rows[0].status).toBe('queued');
  });

  it('fails a sweep run whose sweep job is over without having queued it', async () => {
    const planner = await appWith(queue);
    const res = await planner.agent
      .post(`/api/plans/${planId}/sweeps`)
      .set('x-csrf-token', planner.csrf)
      .send({ name: 'Lost sweep', parameters, sweep: { parameter: 'capacityFactor', values: [0.6, 0.7] } })
      .expect(202);
    expect((await reconcileRuns(ctx.db, queue, { requeueAfterSeconds: 60 })).failed).toEqual([]);
    await ctx.pool.query("UPDATE pgboss.job SET state = 'completed' WHERE name = 'runs' AND data->>'sweepId' = $1", [res.body.id]);
    const r = await reconcileRuns(ctx.db, queue, { requeueAfterSeconds: 60 });
    expect(r.failed.sort()).toEqual(res.body.runs.map((x: { id: string }) => x.id).sort());
  });

  it('queues again a run that never had a job, once, after the grace period', async () => {
    const planner = await appWith(queue);
    const id = (await planner.agent.post(`/api/plans/${planId}/runs`).set('x-csrf-token', planner.csrf).send({ parameters: nextParameters() }).expect(202)).body.id;
    // As a run started before runs and jobs shared a transaction could be: its job never written.
    await ctx.pool.query("DELETE FROM pgboss.job WHERE name = 'runs' AND data->>'runId' = $1", [id]);
    expect((await reconcileRuns(ctx.db, queue, { requeueAfterSeconds: 60 })).requeued).toEqual([]);
    await ctx.pool.query("UPDATE runs SET created_at = created_at - interval '2 minutes' WHERE id = $1", [id]);
    const [a, b] = await Promise.all([reconcileRuns(ctx.db, queue, { requeueAfterSeconds: 60 }), reconcileRuns(ctx.db, queue, { requeueAfterSeconds: 60 })]);
    expect([...a!.requeued, ...b!.requeued]).toEqual([id]);
    expect(await jobsFor('runId', id)).toEqual(['created']);
    expect((await ctx.pool.query('SELECT status FROM runs WHERE id = $1', [id])).rows[0].status).toBe('queued');
  });
});

// Limits on starting runs: per person per minute, and per organization in flight (waiting or
// running). Refused starts answer 429 with the reason and write nothing. Runs here are queued
// into a recording queue that never solves them, so they stay in flight.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { createTestContext, countRows, signIn, signInAs, otherAccounts, type SignedInAgent, type TestContext } from './support/test-app';
import { defaultRunParameters } from '../../shared/api/runs';

let ctx: TestContext;
let app: ReturnType<typeof createApp>;
const queued: string[] = [];
let planner: SignedInAgent;
let admin: SignedInAgent;
let planId: string;

const parameters = { ...defaultRunParameters, horizonMinutes: 60, timeStepSeconds: 300 };
let variant = 0;
// Each start a little different, so no earlier identical run could be reused.
const start = (who: SignedInAgent, plan = planId) =>
  who.agent.post(`/api/plans/${plan}/runs`).set('x-csrf-token', who.csrf).send({ parameters: { ...parameters, capacityFactor: 1 - ++variant / 100 } });

beforeAll(async () => {
  ctx = await createTestContext({ RUN_STARTS_PER_MINUTE: '3', RUNS_IN_FLIGHT_PER_ORGANIZATION: '5' });
  app = createApp({ config: ctx.config, db: ctx.db, pool: ctx.pool, clientDir: '/nonexistent', log: (e) => ctx.errors.push(e), runQueue: { enqueue: async (job) => void queued.push('runId' in job ? job.runId : job.sweepId) } });
  planner = await signInAs(app, 'planner');
  admin = await signInAs(app, 'admin');
  planId = (await planner.agent.get('/api/plans').expect(200)).body.plans[0].id;
});
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

describe('starting runs', () => {
  it('allows three starts a minute to one person, then refuses the fourth with the reason', async () => {
    for (let i = 0; i < 3; i++) await start(planner).expect(202);
    const before = await countRows(ctx, 'runs');
    const refused = await start(planner).expect(429);
    expect(refused.body.error.code).toBe('rate_limited');
    expect(refused.body.error.message).toBe('You have started 3 analyses in the last minute; at most 3 a minute are allowed. Wait a minute and try again.');
    expect(await countRows(ctx, 'runs')).toBe(before);
    expect(queued).toHaveLength(3);
  });

  it('caps what one organization has in flight, whoever starts it', async () => {
    await start(admin).expect(202);
    await start(admin).expect(202);
    const refused = await start(admin).expect(429);
    expect(refused.body.error.message).toMatch(/^Your organization has 5 analyses waiting or running; at most 5 are allowed at once\./);
  });

  it('counts a sweep as all of its runs and writes no sweep when refused', async () => {
    // A minute later for the planner: the per-person limit no longer applies, the organization's still does.
    await ctx.pool.query("UPDATE runs SET created_at = created_at - interval '2 minutes'");
    const before = await countRows(ctx, 'batches');
    const refused = await planner.agent
      .post(`/api/plans/${planId}/sweeps`)
      .set('x-csrf-token', planner.csrf)
      .send({ name: 'Sweep', parameters, sweep: { parameter: 'capacityFactor', values: [0.5, 0.75] } })
      .expect(429);
    expect(refused.body.error.message).toMatch(/this sweep adds 2/);
    expect(await countRows(ctx, 'batches')).toBe(before);
  });

  it('frees a place when a run is cancelled', async () => {
    const [{ id }] = (await ctx.pool.query("SELECT id FROM runs WHERE status = 'queued' LIMIT 1")).rows;
    await planner.agent.post(`/api/plans/${planId}/runs/${id}/cancel`).set('x-csrf-token', planner.csrf).expect(200);
    await start(planner).expect(202);
    await start(planner).expect(429);
  });

  it('does not count one organization’s runs against another', async () => {
    const other = await signIn(app, otherAccounts[1]!.email, otherAccounts[1]!.password);
    const otherPlan = (await other.agent.post('/api/plans').set('x-csrf-token', other.csrf).send({ name: 'Other plan' }).expect(201)).body.id;
    // Refused for another reason (an empty plan has no road layer), not for the demo organization's queue.
    const res = await start(other, otherPlan);
    expect(res.status).not.toBe(429);
    expect(res.status).toBeGreaterThanOrEqual(400);
  });
});

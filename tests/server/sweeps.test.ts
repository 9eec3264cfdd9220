// Sweeps: a sweep queued as many runs that the worker shares, summarised per value.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, signInAs, countRows, type SignedInAgent, type TestContext } from './support/test-app';
import { sweepSchema, type Sweep } from '../../shared/api/sweeps';
import { defaultRunParameters } from '../../shared/api/runs';

let ctx: TestContext;
let planner: SignedInAgent;
let planId: string;
const parameters = { ...defaultRunParameters, horizonMinutes: 120, timeStepSeconds: 120 };

async function finished(sweepId: string): Promise<Sweep> {
  for (let i = 0; i < 300; i++) {
    const b = sweepSchema.parse((await planner.agent.get(`/api/plans/${planId}/sweeps/${sweepId}`).expect(200)).body);
    if (b.runs.every((r) => r.status === 'succeeded' || r.status === 'failed')) return b;
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error('sweep did not finish');
}

beforeAll(async () => {
  ctx = await createTestContext({}, { withRunWorker: true });
  planner = await signInAs(ctx.app, 'planner');
  planId = (await planner.agent.get('/api/plans').expect(200)).body.plans[0].id;
});
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

describe('sweeps', () => {
  it('sweeps the capacity factor: the steady state scales with it (max flow is linear in the capacities)', async () => {
    const res = await planner.agent
      .post(`/api/plans/${planId}/sweeps`)
      .set('x-csrf-token', planner.csrf)
      .send({ name: 'Weather', parameters, sweep: { parameter: 'capacityFactor', values: [0.5, 0.75, 1] } })
      .expect(202);
    const b = await finished(res.body.id);
    expect(b.runs.map((r) => r.sweepValue)).toEqual([0.5, 0.75, 1]);
    const steady = b.runs.map((r) => r.headline!.steadyStateVehiclesPerHour);
    // Capacities are whole vehicles, rounded down per road: at most 1 veh/h lost on each of the
    // four bridges of the cut.
    expect(Math.abs(steady[0]! - 0.5 * steady[2]!)).toBeLessThanOrEqual(4);
    expect(Math.abs(steady[1]! - 0.75 * steady[2]!)).toBeLessThanOrEqual(4);
  });

  it('sweeps participation: more people leaving means more vehicles to move', async () => {
    const res = await planner.agent
      .post(`/api/plans/${planId}/sweeps`)
      .set('x-csrf-token', planner.csrf)
      .send({ name: 'Participation', parameters, sweep: { parameter: 'participationRate', values: [0.5, 1] } })
      .expect(202);
    const b = await finished(res.body.id);
    const demand = b.runs.map((r) => r.headline!.demandPersons);
    // Persons evacuating = population × participation (shared/model/vehicles.ts); rounding per zone.
    expect(Math.abs(demand[1]! - 2 * demand[0]!)).toBeLessThanOrEqual(6);
  });

  it('refuses an out-of-range value and writes nothing', async () => {
    const before = await Promise.all(['batches', 'runs'].map((t) => countRows(ctx, t)));
    const res = await planner.agent
      .post(`/api/plans/${planId}/sweeps`)
      .set('x-csrf-token', planner.csrf)
      .send({ name: 'Bad', parameters, sweep: { parameter: 'participationRate', values: [0.5, 1.5] } })
      .expect(400);
    expect(res.body.error.fields[0].path).toBe('sweep.values.1');
    expect(await Promise.all(['batches', 'runs'].map((t) => countRows(ctx, t)))).toEqual(before);
  });
});

// List routes are capped and paged with ?limit=&offset=; x-next-offset says where the next
// page starts and is absent on the last. Out-of-range paging is a 400 with the reason.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './support/test-app';
import { listCaps } from '../../shared/api/pagination';

let ctx: TestContext;
let planner: SignedInAgent;
let planId: string;

beforeAll(async () => {
  ctx = await createTestContext();
  planner = await signInAs(ctx.app, 'planner');
  planId = (await planner.agent.get('/api/plans').expect(200)).body.plans[0].id;
  for (let i = 1; i <= 5; i++) {
    await planner.agent.post(`/api/plans/${planId}/scenarios`).set('x-csrf-token', planner.csrf).send({ name: `Paging ${i}` }).expect(201);
  }
});
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

describe('paging a list', () => {
  it('walks every item once, two at a time', async () => {
    const all = (await planner.agent.get(`/api/plans/${planId}/scenarios`).expect(200)).body.scenarios as { id: string }[];
    expect(all.length).toBeGreaterThanOrEqual(5);
    const seen: string[] = [];
    let offset: string | undefined = '0';
    let pages = 0;
    while (offset !== undefined) {
      const res: { body: { scenarios: { id: string }[] }; headers: Record<string, string | undefined> } = await planner.agent.get(`/api/plans/${planId}/scenarios?limit=2&offset=${offset}`).expect(200);
      expect(res.body.scenarios.length).toBeLessThanOrEqual(2);
      seen.push(...res.body.scenarios.map((s: { id: string }) => s.id));
      offset = res.headers['x-next-offset'];
      pages++;
    }
    expect(pages).toBe(Math.ceil(all.length / 2));
    expect(seen).toEqual(all.map((s) => s.id));
  });

  it('has no next page on the last one', async () => {
    const res = await planner.agent.get(`/api/plans/${planId}/scenarios?limit=${listCaps.scenarios}`).expect(200);
    expect(res.headers['x-next-offset']).toBeUndefined();
  });

  it.each([
    ['limit above the cap', `limit=${listCaps.plans + 1}`, `At most ${listCaps.plans} at a time.`],
    ['zero limit', 'limit=0', undefined],
    ['negative offset', 'offset=-1', undefined],
    ['fractional limit', 'limit=2.5', 'A whole number.'],
    ['limit that is a word', 'limit=many', undefined],
  ])('refuses a %s with a 400 naming the field', async (_name, query, message) => {
    const res = await planner.agent.get(`/api/plans?${query}`).expect(400);
    expect(res.body.error.code).toBe('invalid_request');
    const field = res.body.error.fields[0];
    expect(['limit', 'offset']).toContain(field.path);
    if (message) expect(field.message).toBe(message);
  });

  it.each(['/api/plans', '/api/members', '/api/briefings', '/api/briefings/outbox', '/api/briefings/officials'])('caps %s too', async (path) => {
    const admin = await signInAs(ctx.app, 'admin');
    await admin.agent.get(`${path}?limit=100000`).expect(400);
  });
});

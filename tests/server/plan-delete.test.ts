// Deleting a plan that has briefings: briefings are part of the record and keep their plan (no
// cascade), so the delete is refused with 409 and the reason, and nothing changes. Before, the
// foreign key refused it and the caller got a 500.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, countRows, signInAs, type SignedInAgent, type TestContext } from './support/test-app';
import { demoPlanId, insertDemoRun } from './support/demo-run';

let ctx: TestContext;
let planner: SignedInAgent;
beforeAll(async () => {
  ctx = await createTestContext();
  planner = await signInAs(ctx.app, 'planner');
});
afterAll(async () => {
  await ctx.drop();
});

describe('DELETE /api/plans/:planId', () => {
  it('refuses a plan with a briefing with 409 and the reason, changing nothing', async () => {
    const planId = await demoPlanId(ctx.db, ctx.demoOrganizationId);
    const { runId } = await insertDemoRun(ctx.db, planId, ctx.userIds['planner@cutline.example']!);
    const draft = await planner.agent.post('/api/briefings').set('x-csrf-token', planner.csrf).send({ runId, title: 'Kept on record', recipients: [] });
    expect(draft.status, JSON.stringify(draft.body)).toBe(201);
    const before = { plans: await countRows(ctx, 'plans'), runs: await countRows(ctx, 'runs'), audit: await countRows(ctx, 'audit_events') };

    const res = await planner.agent.delete(`/api/plans/${planId}`).set('x-csrf-token', planner.csrf);
    expect(res.status).toBe(409);
    expect(res.body.error).toEqual({
      code: 'conflict',
      message: 'This plan has 1 briefing, which is part of the record, so it cannot be deleted. Keep it, or rename it to mark it as no longer in use.',
    });
    expect({ plans: await countRows(ctx, 'plans'), runs: await countRows(ctx, 'runs'), audit: await countRows(ctx, 'audit_events') }).toEqual(before);
    expect(ctx.errors).toEqual([]);
  }, 120_000);

  it('still deletes a plan without briefings, and answers 404 for another organization’s', async () => {
    const created = await planner.agent.post('/api/plans').set('x-csrf-token', planner.csrf).send({ name: 'Scratch plan' }).expect(201);
    await planner.agent.delete(`/api/plans/${created.body.id}`).set('x-csrf-token', planner.csrf).expect(204);
    const other = await signInAs(ctx.app, 'planner');
    const { rows } = await ctx.pool.query<{ id: string }>(`INSERT INTO plans (organization_id, name) VALUES ($1, 'Theirs') RETURNING id`, [ctx.otherOrganizationId]);
    expect((await other.agent.delete(`/api/plans/${rows[0]!.id}`).set('x-csrf-token', other.csrf)).status).toBe(404);
  });
});

// Bad input gets a clear 400 naming the field, and nothing is written.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, signInAs, countRows, type SignedInAgent, type TestContext } from './support/test-app';

let ctx: TestContext;
let admin: SignedInAgent;
let planner: SignedInAgent;
beforeAll(async () => {
  ctx = await createTestContext();
  admin = await signInAs(ctx.app, 'admin');
  planner = await signInAs(ctx.app, 'planner');
});
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

async function unchanged(tables: string[], action: () => Promise<void>) {
  const before = await Promise.all(tables.map((t) => countRows(ctx, t)));
  await action();
  expect(await Promise.all(tables.map((t) => countRows(ctx, t)))).toEqual(before);
}

describe('plans', () => {
  it('a plan without a name is refused with the field named', async () => {
    await unchanged(['plans', 'audit_events'], async () => {
      const res = await planner.agent.post('/api/plans').set('x-csrf-token', planner.csrf).send({ description: 'no name' }).expect(400);
      expect(res.body.error.fields).toEqual([{ path: 'name', message: expect.any(String) }]);
    });
  });

  it('a malformed plan id is a 400, not a database error', async () => {
    const res = await planner.agent.get('/api/plans/not-a-uuid').expect(400);
    expect(res.body.error.fields[0].path).toBe('id');
  });

  it('an empty edit is refused', async () => {
    const plan = (await planner.agent.post('/api/plans').set('x-csrf-token', planner.csrf).send({ name: 'P' }).expect(201)).body;
    await unchanged(['audit_events'], async () => {
      await planner.agent.patch(`/api/plans/${plan.id}`).set('x-csrf-token', planner.csrf).send({}).expect(400);
    });
  });

  it('records who created a plan in the audit trail', async () => {
    const plan = (await planner.agent.post('/api/plans').set('x-csrf-token', planner.csrf).send({ name: 'Audited' }).expect(201)).body;
    const events = (await admin.agent.get('/api/audit').expect(200)).body.events;
    expect(events[0]).toMatchObject({ action: 'plan.create', entityId: plan.id, actorName: 'Tomas Everly' });
  });
});

describe('members', () => {
  const valid = { email: 'new.person@cutline.example', displayName: 'New Person', role: 'viewer', password: 'long-enough-pass-1' };

  it('an unknown role is refused and no user is created', async () => {
    await unchanged(['users', 'memberships', 'audit_events'], async () => {
      const res = await admin.agent.post('/api/members').set('x-csrf-token', admin.csrf).send({ ...valid, role: 'superuser' }).expect(400);
      expect(res.body.error.fields[0].path).toBe('role');
    });
  });

  it('a short password is refused with the rule', async () => {
    await unchanged(['users'], async () => {
      const res = await admin.agent.post('/api/members').set('x-csrf-token', admin.csrf).send({ ...valid, password: 'short' }).expect(400);
      expect(res.body.error.fields[0]).toEqual({ path: 'password', message: 'Use at least 12 characters.' });
    });
  });

  it('a duplicate address is a 409 and writes nothing', async () => {
    await unchanged(['users', 'memberships'], async () => {
      await admin.agent.post('/api/members').set('x-csrf-token', admin.csrf).send({ ...valid, email: 'planner@cutline.example' }).expect(409);
    });
  });

  it('the last administrator cannot be demoted', async () => {
    const adminId = ctx.userIds['admin@cutline.example'];
    const res = await admin.agent.patch(`/api/members/${adminId}`).set('x-csrf-token', admin.csrf).send({ role: 'viewer' }).expect(409);
    expect(res.body.error.message).toMatch(/at least one administrator/);
  });

  it('a new member can sign in with the role given', async () => {
    await admin.agent.post('/api/members').set('x-csrf-token', admin.csrf).send(valid).expect(201);
    const { agent } = await import('./support/test-app').then((m) => m.signIn(ctx.app, valid.email, valid.password));
    expect((await agent.get('/api/auth/session')).body.user.role).toBe('viewer');
  });
});

// Accounts after they exist: a removed member can be added again, anyone changes their own
// password (the current one required), an administrator sets a new one for a member. Each is
// audited and ends the sessions the old password opened.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestContext, signIn, signInAs, type SignedInAgent, type TestContext } from './support/test-app';

let ctx: TestContext;
let admin: SignedInAgent;
beforeAll(async () => {
  // No per-process cache of sessions and users: an ended session is refused at its next request.
  ctx = await createTestContext({ AUTH_CACHE_MILLISECONDS: '0', SIGN_IN_LOCKOUT_FAILURES: '3', SIGN_IN_ATTEMPTS_PER_WINDOW: '100' });
  admin = await signInAs(ctx.app, 'admin');
});
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

let next = 0;
async function addMember(password: string, email = `member-${++next}@cutline.example`) {
  const res = await admin.agent.post('/api/members').set('x-csrf-token', admin.csrf).send({ email, displayName: `Member ${next}`, role: 'planner', password });
  return { res, email, userId: res.body.userId as string };
}

async function canSignIn(email: string, password: string): Promise<number> {
  const agent = request.agent(ctx.app);
  const csrf = (await agent.get('/api/auth/session')).body.csrfToken;
  return (await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({ email, password })).status;
}

const auditOf = async (action: string, userId: string) =>
  (await ctx.pool.query('SELECT actor_user_id, organization_id, details FROM audit_events WHERE action = $1 AND entity_id = $2 ORDER BY id', [action, userId])).rows;

describe('adding a removed member again', () => {
  it('takes the old account back with the new name and password, and ends its old sessions', async () => {
    const first = await addMember('first-password-2026');
    expect(first.res.status).toBe(201);
    const old = await signIn(ctx.app, first.email, 'first-password-2026');
    await admin.agent.delete(`/api/members/${first.userId}`).set('x-csrf-token', admin.csrf).expect(204);

    const again = await admin.agent
      .post('/api/members')
      .set('x-csrf-token', admin.csrf)
      .send({ email: first.email.toUpperCase(), displayName: 'Returning Member', role: 'viewer', password: 'second-password-2026' });
    expect(again.status, JSON.stringify(again.body)).toBe(201);
    expect(again.body).toMatchObject({ userId: first.userId, email: first.email, displayName: 'Returning Member', role: 'viewer', lockedUntil: null });

    expect((await old.agent.get('/api/plans')).status).toBe(401);
    expect(await canSignIn(first.email, 'first-password-2026')).toBe(401);
    expect(await canSignIn(first.email, 'second-password-2026')).toBe(200);
    const audit = await auditOf('member.create', first.userId);
    expect(audit).toHaveLength(2);
    expect(audit[1]).toMatchObject({ actor_user_id: ctx.userIds['admin@cutline.example'], details: { returning: true, role: 'viewer' } });
  });

  it('refuses an address already in this organization, and one that belongs to another organization, changing nothing', async () => {
    const inHere = await admin.agent
      .post('/api/members')
      .set('x-csrf-token', admin.csrf)
      .send({ email: 'viewer@cutline.example', displayName: 'Someone', role: 'viewer', password: 'a-long-password-1' });
    expect(inHere.status).toBe(409);
    expect(inHere.body.error.message).toBe('That person is already a member of this organization.');

    const elsewhere = await admin.agent
      .post('/api/members')
      .set('x-csrf-token', admin.csrf)
      .send({ email: 'planner@other.example', displayName: 'Someone', role: 'viewer', password: 'a-long-password-1' });
    expect(elsewhere.status).toBe(409);
    expect(await canSignIn('planner@other.example', 'other-planner-2026')).toBe(200);
    expect(await canSignIn('planner@other.example', 'a-long-password-1')).toBe(401);
  });
});

describe('changing one’s own password', () => {
  it('needs the current password, keeps this session, ends the others, and is audited', async () => {
    const { email, userId } = await addMember('own-password-2026');
    const here = await signIn(ctx.app, email, 'own-password-2026');
    const elsewhere = await signIn(ctx.app, email, 'own-password-2026');

    const wrong = await here.agent.post('/api/auth/password').set('x-csrf-token', here.csrf).send({ currentPassword: 'not-it-2026-x', newPassword: 'changed-password-2026' });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.fields).toEqual([{ path: 'currentPassword', message: 'That is not your current password.' }]);
    expect(await canSignIn(email, 'changed-password-2026')).toBe(401);

    const weak = await here.agent.post('/api/auth/password').set('x-csrf-token', here.csrf).send({ currentPassword: 'own-password-2026', newPassword: 'short' });
    expect(weak.status).toBe(400);

    await here.agent.post('/api/auth/password').set('x-csrf-token', here.csrf).send({ currentPassword: 'own-password-2026', newPassword: 'changed-password-2026' }).expect(204);
    expect((await here.agent.get('/api/plans')).status).toBe(200);
    expect((await elsewhere.agent.get('/api/plans')).status).toBe(401);
    expect(await canSignIn(email, 'own-password-2026')).toBe(401);
    expect(await canSignIn(email, 'changed-password-2026')).toBe(200);
    const audit = await auditOf('account.password-change', userId);
    expect(audit).toEqual([{ actor_user_id: userId, organization_id: ctx.demoOrganizationId, details: { otherSessionsEnded: 1 } }]);
  });

  it('answers 401 without a session', async () => {
    const agent = request.agent(ctx.app);
    const csrf = (await agent.get('/api/auth/session')).body.csrfToken;
    const res = await agent.post('/api/auth/password').set('x-csrf-token', csrf).send({ currentPassword: 'x', newPassword: 'changed-password-2026' });
    expect(res.status).toBe(401);
  });
});

describe('an administrator setting a member’s password', () => {
  it('sets it, lifts a lock, ends the member’s sessions, and is audited', async () => {
    const { email, userId } = await addMember('forgotten-password-2026');
    const theirs = await signIn(ctx.app, email, 'forgotten-password-2026');
    for (let i = 0; i < 3; i++) await canSignIn(email, `wrong-guess-${i}-2026`);
    expect(await canSignIn(email, 'forgotten-password-2026')).toBe(423);

    const reset = await admin.agent.post(`/api/members/${userId}/password`).set('x-csrf-token', admin.csrf).send({ password: 'fresh-password-2026' });
    expect(reset.status, JSON.stringify(reset.body)).toBe(200);
    expect(reset.body).toMatchObject({ userId, lockedUntil: null });
    expect((await theirs.agent.get('/api/plans')).status).toBe(401);
    expect(await canSignIn(email, 'fresh-password-2026')).toBe(200);
    const audit = await auditOf('member.password-reset', userId);
    expect(audit).toEqual([{ actor_user_id: ctx.userIds['admin@cutline.example'], organization_id: ctx.demoOrganizationId, details: { sessionsEnded: 1 } }]);
  });

  it('refuses the administrator’s own account, another organization’s member, a shared account, and other roles', async () => {
    const self = await admin.agent.post(`/api/members/${ctx.userIds['admin@cutline.example']}/password`).set('x-csrf-token', admin.csrf).send({ password: 'fresh-password-2026' });
    expect(self.status).toBe(409);

    const foreign = await admin.agent.post(`/api/members/${ctx.userIds['planner@other.example']}/password`).set('x-csrf-token', admin.csrf).send({ password: 'fresh-password-2026' });
    expect(foreign.status).toBe(404);

    // A member of both organizations: Other County relies on that account too.
    const { email, userId } = await addMember('shared-password-2026');
    await ctx.pool.query("INSERT INTO memberships (user_id, organization_id, role) VALUES ($1, $2, 'viewer')", [userId, ctx.otherOrganizationId]);
    const shared = await admin.agent.post(`/api/members/${userId}/password`).set('x-csrf-token', admin.csrf).send({ password: 'fresh-password-2026' });
    expect(shared.status).toBe(409);
    expect(await canSignIn(email, 'shared-password-2026')).toBe(200);

    const planner = await signInAs(ctx.app, 'planner');
    const byPlanner = await planner.agent.post(`/api/members/${userId}/password`).set('x-csrf-token', planner.csrf).send({ password: 'fresh-password-2026' });
    expect(byPlanner.status).toBe(403);
    expect(await auditOf('member.password-reset', userId)).toEqual([]);
  });
});

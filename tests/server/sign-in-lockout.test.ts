// Account lockout: failed sign-ins in a row lock the account whatever address they come from
// (the per-address rate limit cannot see that), a success clears the count, an administrator
// can unlock, and a lock runs out.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestContext, csrfFor, signInAs, accountFor, type TestContext } from './support/test-app';

let ctx: TestContext;
beforeAll(async () => {
  // The first wait as long as the longest: these tests are about the lock itself (sign-in-backoff.test.ts doubles it).
  ctx = await createTestContext({ SIGN_IN_LOCKOUT_FAILURES: '3', SIGN_IN_BACKOFF_SECONDS: '900', SIGN_IN_LOCKOUT_MINUTES: '15', SIGN_IN_ATTEMPTS_PER_WINDOW: '100' });
});
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

let address = 0;
// Each attempt from another client address (the app trusts X-Forwarded-For from loopback only).
async function attempt(email: string, password: string) {
  const agent = request.agent(ctx.app);
  const from = `198.51.100.${++address}`;
  const csrf = (await agent.get('/api/auth/session').set('x-forwarded-for', from)).body.csrfToken;
  return agent.post('/api/auth/sign-in').set('x-forwarded-for', from).set('x-csrf-token', csrf).send({ email, password });
}

const viewer = accountFor('viewer');
const official = accountFor('official');

describe('sign-in lockout', () => {
  it('locks an account after three failures from three addresses, even against the right password', async () => {
    expect((await attempt(viewer.email, 'wrong-1')).status).toBe(401);
    expect((await attempt(viewer.email, 'wrong-2')).status).toBe(401);
    const third = await attempt(viewer.email, 'wrong-3');
    expect(third.status).toBe(423);
    expect(third.body.error.code).toBe('account_locked');
    expect(third.body.error.message).toMatch(/locked after repeated failed sign-ins\. Try again in 15 minutes/);
    const right = await attempt(viewer.email, viewer.password);
    expect(right.status).toBe(423);

    const audit = await ctx.pool.query("SELECT actor_user_id, entity_id FROM audit_events WHERE action = 'session.locked'");
    expect(audit.rows).toEqual([{ actor_user_id: null, entity_id: ctx.userIds[viewer.email] }]);
  });

  it('shows the lock to administrators, who can lift it', async () => {
    const admin = await signInAs(ctx.app, 'admin');
    const members = (await admin.agent.get('/api/members').expect(200)).body.members as { email: string; lockedUntil: string | null }[];
    const locked = members.find((m) => m.email === viewer.email)!;
    expect(Date.parse(locked.lockedUntil!)).toBeGreaterThan(Date.now() + 14 * 60_000);
    expect(members.filter((m) => m.lockedUntil !== null)).toHaveLength(1);

    const unlocked = await admin.agent.post(`/api/members/${ctx.userIds[viewer.email]}/unlock`).set('x-csrf-token', admin.csrf).expect(200);
    expect(unlocked.body).toMatchObject({ email: viewer.email, lockedUntil: null });
    expect((await attempt(viewer.email, viewer.password)).status).toBe(200);
    const audit = await ctx.pool.query("SELECT count(*)::int AS n FROM audit_events WHERE action = 'member.unlock'");
    expect(audit.rows[0].n).toBe(1);
  });

  it('does not let an administrator unlock another organization’s account', async () => {
    const admin = await signInAs(ctx.app, 'admin');
    const res = await admin.agent.post(`/api/members/${ctx.userIds['planner@other.example']}/unlock`).set('x-csrf-token', admin.csrf);
    expect(res.status).toBe(404);
  });

  it('counts failures in a row only: a success in between clears the count', async () => {
    for (let i = 0; i < 2; i++) expect((await attempt(official.email, 'nope')).status).toBe(401);
    expect((await attempt(official.email, official.password)).status).toBe(200);
    for (let i = 0; i < 2; i++) expect((await attempt(official.email, 'nope')).status).toBe(401);
    expect((await attempt(official.email, official.password)).status).toBe(200);
  });

  it('lets a lock run out', async () => {
    const planner = accountFor('planner');
    for (let i = 0; i < 3; i++) await attempt(planner.email, 'nope');
    expect((await attempt(planner.email, planner.password)).status).toBe(423);
    await ctx.pool.query("UPDATE users SET locked_until = now() - interval '1 second' WHERE email = $1", [planner.email]);
    expect((await attempt(planner.email, planner.password)).status).toBe(200);
  });

  it('says nothing different for an unknown address, however often it is tried', async () => {
    for (let i = 0; i < 5; i++) {
      const res = await attempt('nobody@cutline.example', 'nope');
      expect(res.status).toBe(401);
      expect(res.body.error.message).toBe('Wrong e-mail address or password.');
    }
  });
});

// Sign-in, session persistence, sign-out, rate limiting and CSRF, against the real PostgreSQL.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestContext, csrfFor, signIn, signInAs, countRows, type TestContext } from './support/test-app';

let ctx: TestContext;
beforeAll(async () => {
  ctx = await createTestContext({ SIGN_IN_ATTEMPTS_PER_WINDOW: '3' });
});
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

describe('sign-in', () => {
  it('accepts the demo planner, sets an httpOnly SameSite cookie and reports the role', async () => {
    const agent = request.agent(ctx.app);
    const csrf = await csrfFor(agent);
    const res = await agent
      .post('/api/auth/sign-in')
      .set('x-csrf-token', csrf)
      .send({ email: 'PLANNER@cutline.example', password: 'planner-demo-2026' })
      .expect(200);
    expect(res.body.user).toMatchObject({ email: 'planner@cutline.example', role: 'planner', organizationId: ctx.demoOrganizationId });
    const cookie = String(res.headers['set-cookie']);
    expect(cookie).toMatch(/cutline\.sid=/);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    // The session was regenerated: the token handed out before sign-in no longer works.
    expect(res.body.csrfToken).not.toBe(csrf);
  });

  it('refuses a wrong password with 401 and a plain message, and creates no session', async () => {
    const signedInSessions = "SELECT count(*)::int AS n FROM sessions WHERE sess::text LIKE '%passport%'";
    const before = (await ctx.pool.query(signedInSessions)).rows[0].n;
    const agent = request.agent(ctx.app);
    const csrf = await csrfFor(agent);
    const res = await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({ email: 'viewer@cutline.example', password: 'wrong' }).expect(401);
    expect(res.body.error).toEqual({ code: 'unauthenticated', message: 'Wrong e-mail address or password.' });
    expect((await agent.get('/api/auth/session').expect(200)).body.user).toBeNull();
    // The CSRF token lives in a session row, but no signed-in session appears.
    expect((await ctx.pool.query(signedInSessions)).rows[0].n).toBe(before);
  });

  it('answers an unknown address exactly like a wrong password', async () => {
    const agent = request.agent(ctx.app);
    const csrf = await csrfFor(agent);
    const res = await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({ email: 'nobody@cutline.example', password: 'x' }).expect(401);
    expect(res.body.error.message).toBe('Wrong e-mail address or password.');
  });

  it('names each missing field', async () => {
    const agent = request.agent(ctx.app);
    const csrf = await csrfFor(agent);
    const res = await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({}).expect(400);
    expect(res.body.error.code).toBe('invalid_request');
    expect(res.body.error.fields.map((f: { path: string }) => f.path).sort()).toEqual(['email', 'password']);
  });

  it('rejects malformed JSON with 400', async () => {
    const agent = request.agent(ctx.app);
    const csrf = await csrfFor(agent);
    const res = await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).set('content-type', 'application/json').send('{"email": ').expect(400);
    expect(res.body.error).toEqual({ code: 'invalid_request', message: 'The request body is not valid JSON.' });
  });

  it('limits repeated failures for one account, then answers 429', async () => {
    const agent = request.agent(ctx.app);
    const csrf = await csrfFor(agent);
    const attempt = () => agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({ email: 'someone@cutline.example', password: 'guess' });
    for (let i = 0; i < 3; i++) expect((await attempt()).status).toBe(401);
    const limited = await attempt();
    expect(limited.status).toBe(429);
    expect(limited.body.error.code).toBe('rate_limited');
    // Another account from the same address is not locked out.
    await signInAs(ctx.app, 'viewer');
  });
});

describe('session', () => {
  it('persists across requests and survives in PostgreSQL', async () => {
    const { agent } = await signInAs(ctx.app, 'official');
    const first = await agent.get('/api/auth/session').expect(200);
    expect(first.body.user.role).toBe('official');
    const stored = await ctx.pool.query("SELECT count(*)::int AS n FROM sessions WHERE sess::text LIKE '%passport%'");
    expect(stored.rows[0].n).toBeGreaterThan(0);
    const plans = await agent.get('/api/plans').expect(200);
    expect(plans.body.plans.length).toBeGreaterThan(0);
  });

  it('ends at sign-out', async () => {
    const { agent, csrf } = await signInAs(ctx.app, 'viewer');
    const res = await agent.post('/api/auth/sign-out').set('x-csrf-token', csrf).expect(200);
    expect(res.body.user).toBeNull();
    await agent.get('/api/plans').expect(401);
  });

  it('switches only to organizations the user belongs to', async () => {
    const { agent, csrf } = await signInAs(ctx.app, 'planner');
    const res = await agent.post('/api/auth/organization').set('x-csrf-token', csrf).send({ organizationId: ctx.otherOrganizationId }).expect(403);
    expect(res.body.error.code).toBe('forbidden');
  });
});

describe('CSRF protection', () => {
  it('refuses a state-changing request without the token and writes nothing', async () => {
    const { agent } = await signInAs(ctx.app, 'planner');
    const before = await countRows(ctx, 'plans');
    const res = await agent.post('/api/plans').send({ name: 'Sneaky' }).expect(403);
    expect(res.body.error.code).toBe('csrf');
    expect(await countRows(ctx, 'plans')).toBe(before);
  });

  it('refuses a token from another session', async () => {
    const planner = await signInAs(ctx.app, 'planner');
    const admin = await signInAs(ctx.app, 'admin');
    await planner.agent.post('/api/plans').set('x-csrf-token', admin.csrf).send({ name: 'Cross' }).expect(403);
    await planner.agent.post('/api/plans').set('x-csrf-token', planner.csrf).send({ name: 'Fine' }).expect(201);
  });

  it('protects sign-in itself', async () => {
    const res = await request(ctx.app).post('/api/auth/sign-in').send({ email: 'planner@cutline.example', password: 'planner-demo-2026' });
    expect(res.status).toBe(403);
  });
});

describe('unknown routes', () => {
  it('answers JSON 404 without a stack trace', async () => {
    const { agent } = await signIn(ctx.app, 'admin@cutline.example', 'admin-demo-2026');
    const res = await agent.get('/api/no-such-thing').expect(404);
    expect(res.body.error.code).toBe('not_found');
    expect(JSON.stringify(res.body)).not.toMatch(/at .*\.ts/);
  });
});

// Anonymous callers write no session rows: GET /api/auth/session (every visit, probe or script
// without a cookie jar) used to store a session only to hold its CSRF token. Signed out, the
// token now lives in a signed cookie; sign-in still needs it, a token from another browser or a
// forged cookie is refused, and signing out leaves no row behind.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { accountFor, countRows, createTestContext, type TestContext } from './support/test-app';

let ctx: TestContext;
beforeAll(async () => {
  ctx = await createTestContext();
});
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

const planner = accountFor('planner');

describe('anonymous requests and the session table', () => {
  it('leaves the table unchanged after 30 anonymous session reads, with or without a cookie jar', async () => {
    const before = await countRows(ctx, 'sessions');
    for (let i = 0; i < 20; i++) {
      const res = await request(ctx.app).get('/api/auth/session').expect(200);
      expect(res.body.user).toBeNull();
      expect(res.body.csrfToken).toMatch(/^[0-9a-f]{64}$/);
    }
    const agent = request.agent(ctx.app);
    const first = (await agent.get('/api/auth/session')).body.csrfToken;
    for (let i = 0; i < 9; i++) expect((await agent.get('/api/auth/session')).body.csrfToken).toBe(first);
    expect(await countRows(ctx, 'sessions')).toBe(before);
  });

  it('signs in with the cookie-held token, stores one session, and signing out removes it', async () => {
    const before = await countRows(ctx, 'sessions');
    const agent = request.agent(ctx.app);
    const csrf = (await agent.get('/api/auth/session')).body.csrfToken;
    const signedIn = await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({ email: planner.email, password: planner.password }).expect(200);
    expect(signedIn.body.csrfToken).not.toBe(csrf);
    expect(await countRows(ctx, 'sessions')).toBe(before + 1);
    const out = await agent.post('/api/auth/sign-out').set('x-csrf-token', signedIn.body.csrfToken).expect(200);
    expect(await countRows(ctx, 'sessions')).toBe(before);
    // Signed out again, the next token is cookie-held and works for the next sign-in.
    await agent.post('/api/auth/sign-in').set('x-csrf-token', out.body.csrfToken).send({ email: planner.email, password: planner.password }).expect(200);
  });

  it('refuses a token without its cookie, another browser’s token, and a forged cookie', async () => {
    const mine = request.agent(ctx.app);
    const theirs = request.agent(ctx.app);
    await mine.get('/api/auth/session');
    const theirToken = (await theirs.get('/api/auth/session')).body.csrfToken;
    const body = { email: planner.email, password: planner.password };

    expect((await request(ctx.app).post('/api/auth/sign-in').set('x-csrf-token', theirToken).send(body)).status).toBe(403);
    expect((await mine.post('/api/auth/sign-in').set('x-csrf-token', theirToken).send(body)).status).toBe(403);
    const forged = 'a'.repeat(64);
    const res = await request(ctx.app).post('/api/auth/sign-in').set('cookie', `cutline.csrf=${forged}.${'b'.repeat(43)}`).set('x-csrf-token', forged).send(body);
    expect(res.status).toBe(403);
  });

  it('sets the cookie httpOnly, SameSite=Strict, for the whole site', async () => {
    const res = await request(ctx.app).get('/api/auth/session');
    const cookie = (res.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith('cutline.csrf='));
    expect(cookie).toMatch(/HttpOnly/);
    expect(cookie).toMatch(/SameSite=Strict/);
    expect(cookie).toMatch(/Path=\//);
  });
});

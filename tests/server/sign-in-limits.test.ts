// Sign-in limits that hold against password spraying and do not hand a stranger a way to keep
// a person out: failed attempts are limited per address whatever the e-mail (before, rotating
// e-mails from one address was never limited), and the account lockout does not hold a browser
// the account has signed in from before (device cookies, OWASP "Slow Down Online Guessing
// Attacks with Device Cookies"), while it still holds everywhere else.
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEVICE_COOKIE } from '../../server/auth/device-cookie';
import { accountFor, createTestContext, type TestContext } from './support/test-app';

let ctx: TestContext;
beforeAll(async () => {
  ctx = await createTestContext({ SIGN_IN_ATTEMPTS_PER_ADDRESS: '5', SIGN_IN_ATTEMPTS_PER_WINDOW: '3', SIGN_IN_LOCKOUT_FAILURES: '3', SIGN_IN_LOCKOUT_MINUTES: '15' });
});
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

type Agent = ReturnType<typeof request.agent>;
async function attempt(agent: Agent, from: string, email: string, password: string) {
  const csrf = (await agent.get('/api/auth/session').set('x-forwarded-for', from)).body.csrfToken;
  return agent.post('/api/auth/sign-in').set('x-forwarded-for', from).set('x-csrf-token', csrf).send({ email, password });
}

describe('the sign-in limit per address', () => {
  it('stops rotating e-mails from one address, and no other address', async () => {
    const statuses: number[] = [];
    for (let i = 0; i < 6; i++) statuses.push((await attempt(request.agent(ctx.app), '203.0.113.50', `spray-${i}@nowhere.example`, 'Summer2026!x')).status);
    expect(statuses.slice(0, 5)).toEqual([401, 401, 401, 401, 401]);
    expect(statuses[5]).toBe(429);
    const refused = await attempt(request.agent(ctx.app), '203.0.113.50', 'spray-new@nowhere.example', 'Summer2026!x');
    expect(refused.body.error.message).toMatch(/Too many failed sign-in attempts from this address/);
    expect((await attempt(request.agent(ctx.app), '203.0.113.51', 'spray-0@nowhere.example', 'Summer2026!x')).status).toBe(401);
  });
});

describe('the account lockout', () => {
  const viewer = accountFor('viewer');
  const official = accountFor('official');
  let address = 0;
  const stranger = () => `198.51.100.${++address}`;

  it("does not keep a person out of a browser they signed in from, however a stranger renews the lock", async () => {
    // The person signs in from their own browser once, then signs out.
    const own = request.agent(ctx.app);
    const first = await attempt(own, '192.0.2.10', viewer.email, viewer.password);
    expect(first.status).toBe(200);
    const cookie = ((first.headers['set-cookie'] as unknown as string[]) ?? []).find((c) => c.startsWith(`${DEVICE_COOKIE}=`));
    expect(cookie).toMatch(/HttpOnly/);
    expect(cookie).toMatch(/SameSite=Lax/);
    await own.post('/api/auth/sign-out').set('x-csrf-token', first.body.csrfToken).expect(200);

    // A stranger locks the account from three addresses, twice over.
    for (let round = 0; round < 2; round++) {
      for (let i = 0; i < 3; i++) await attempt(request.agent(ctx.app), stranger(), viewer.email, `guess-${round}-${i}-2026`);
      // Elsewhere the lock holds, even against the right password.
      expect((await attempt(request.agent(ctx.app), stranger(), viewer.email, viewer.password)).status).toBe(423);
      // From the person's own browser, the right password signs in.
      const back = await attempt(own, '192.0.2.10', viewer.email, viewer.password);
      expect(back.status).toBe(200);
      await own.post('/api/auth/sign-out').set('x-csrf-token', back.body.csrfToken).expect(200);
    }
  });

  it("ignores a device cookie that is forged, altered or another account's", async () => {
    for (let i = 0; i < 3; i++) await attempt(request.agent(ctx.app), stranger(), official.email, `guess-${i}-official-2026`);
    const viewerBrowser = request.agent(ctx.app);
    const signedIn = await attempt(viewerBrowser, '192.0.2.20', viewer.email, viewer.password);
    expect(signedIn.status).toBe(200);
    const value = ((signedIn.headers['set-cookie'] as unknown as string[]) ?? []).find((c) => c.startsWith(`${DEVICE_COOKIE}=`))!.split(';')[0]!.slice(DEVICE_COOKIE.length + 1);
    const [payload, mac] = value.split('.');
    const forgedPayload = Buffer.from(JSON.stringify({ u: ctx.userIds[official.email], t: Date.now(), n: 'x' })).toString('base64url');
    for (const cookie of [value, `${forgedPayload}.${mac}`, `${payload}.${mac!.slice(0, -2)}AA`, 'garbage', `${forgedPayload}.`]) {
      // A CSRF token of its own (held in a cookie while signed out), plus the device cookie under test.
      const session = await request(ctx.app).get('/api/auth/session');
      const sid = ((session.headers['set-cookie'] as unknown as string[]) ?? []).find((c) => c.startsWith('cutline.csrf='))!.split(';')[0]!;
      const res = await request(ctx.app)
        .post('/api/auth/sign-in')
        .set('x-forwarded-for', stranger())
        .set('x-csrf-token', session.body.csrfToken)
        .set('cookie', `${sid}; ${DEVICE_COOKIE}=${cookie}`)
        .send({ email: official.email, password: official.password });
      expect(res.status, cookie).toBe(423);
    }
  });
});

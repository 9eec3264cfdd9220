// Response headers and cookie flags a city's security review checks: helmet's headers, a strict
// Content-Security-Policy, Secure cookies behind HTTPS when configured, and the rate limit of
// the public signature check. Header names and values per the OWASP Secure Headers Project
// recommendations (common practice).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestContext, accountFor, type TestContext } from './support/test-app';

let plain: TestContext;
let secure: TestContext;
beforeAll(async () => {
  plain = await createTestContext({ VERIFY_PER_MINUTE: '3' });
  secure = await createTestContext({ COOKIE_SECURE: 'true' });
});
afterAll(async () => {
  await plain.drop();
  await secure.drop();
});

const directives = (csp: string) => new Map(csp.split(';').map((d) => d.trim().split(/\s+/)).map(([name, ...values]) => [name!, values]));

describe('response headers', () => {
  it('carry a strict Content-Security-Policy', async () => {
    const res = await request(plain.app).get('/api/auth/session').expect(200);
    const csp = directives(res.headers['content-security-policy']!);
    expect(csp.get('default-src')).toEqual(["'self'"]);
    expect(csp.get('script-src')).toEqual(["'self'"]);
    expect(csp.get('object-src')).toEqual(["'none'"]);
    expect(csp.get('frame-ancestors')).toEqual(["'self'"]);
    expect(csp.get('base-uri')).toEqual(["'self'"]);
    // No tile server configured here: images from the app itself only.
    expect(csp.get('img-src')).toEqual(["'self'", 'data:', 'blob:', "'self'"]);
  });

  it('forbid sniffing and framing and do not name the server software', async () => {
    const res = await request(plain.app).get('/healthz');
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['x-frame-options']).toBe('SAMEORIGIN');
    expect(res.headers['x-powered-by']).toBeUndefined();
    expect(res.headers['strict-transport-security']).toMatch(/max-age=\d+/);
  });
});

describe('the session cookie', () => {
  async function signInCookie(ctx: TestContext) {
    const agent = request.agent(ctx.app);
    const csrf = (await agent.get('/api/auth/session')).body.csrfToken;
    const account = accountFor('viewer');
    const res = await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({ email: account.email, password: account.password }).expect(200);
    return { cookie: ((res.headers['set-cookie'] as unknown as string[] | undefined) ?? []).find((c) => c.startsWith('cutline.sid=')) };
  }

  it('is httpOnly and SameSite, without Secure on plain loopback HTTP by default', async () => {
    const { cookie } = await signInCookie(plain);
    expect(cookie).toMatch(/HttpOnly/);
    expect(cookie).toMatch(/SameSite=Lax/);
    expect(cookie).not.toMatch(/Secure/);
  });

  it('is Secure behind an HTTPS proxy when COOKIE_SECURE=true', async () => {
    // Signed out, the only cookie is the CSRF token's, under the __Host- prefix.
    const agent = request.agent(secure.app);
    const res = await agent.get('/api/auth/session').set('x-forwarded-proto', 'https').expect(200);
    const csrfCookie = (res.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith('__Host-cutline.csrf='));
    expect(csrfCookie).toMatch(/; Secure/);
    expect(csrfCookie).toMatch(/HttpOnly/);
    expect(csrfCookie).toMatch(/Path=\/;/);
    const account = accountFor('viewer');
    const signedIn = await agent
      .post('/api/auth/sign-in')
      .set('x-forwarded-proto', 'https')
      .set('cookie', csrfCookie!.split(';')[0]!)
      .set('x-csrf-token', res.body.csrfToken)
      .send({ email: account.email, password: account.password })
      .expect(200);
    const cookie = (signedIn.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith('cutline.sid='));
    expect(cookie).toMatch(/; Secure/);
    expect(cookie).toMatch(/HttpOnly/);
    // Over plain HTTP a Secure cookie is not sent at all.
    const plainHttp = await request(secure.app).get('/api/auth/session').expect(200);
    expect(plainHttp.headers['set-cookie']).toBeUndefined();
  });
});

describe('the public signature check', () => {
  it('is rate-limited per address', async () => {
    const check = async (from: string) => {
      const agent = request.agent(plain.app);
      const csrf = (await agent.get('/api/auth/session').set('x-forwarded-for', from)).body.csrfToken;
      return agent.post('/api/briefings/verify').set('x-forwarded-for', from).set('x-csrf-token', csrf).attach('file', Buffer.from('%PDF-1.4 not a briefing'), 'x.pdf');
    };
    const statuses: number[] = [];
    for (let i = 0; i < 4; i++) statuses.push((await check('203.0.113.9')).status);
    expect(statuses.slice(0, 3)).not.toContain(429);
    expect(statuses[3]).toBe(429);
    expect((await check('203.0.113.9')).body.error.message).toMatch(/Too many signature checks from this address/);
    expect((await check('203.0.113.10')).status).not.toBe(429);
  });
});

// The JSON log (pino) carries a request id on every line and none of the secrets that pass
// through a request: passwords, session cookies, CSRF tokens, the configured secrets.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createApp } from '../../server/app';
import { createTestContext, accountFor, type TestContext } from './support/test-app';

let ctx: TestContext;
let app: ReturnType<typeof createApp>;
const lines: string[] = [];
const secrets = { SESSION_SECRET: 'log-test-session-secret-0f9e8d7c', SIGNING_KEY_PASSPHRASE: 'log-test-signing-passphrase-1a2b' };

beforeAll(async () => {
  ctx = await createTestContext({ ...secrets, LOG_LEVEL: 'debug' });
  app = createApp({
    config: ctx.config,
    db: ctx.db,
    pool: ctx.pool,
    clientDir: '/nonexistent',
    runQueue: { enqueue: async () => undefined },
    logDestination: { write: (line: string) => void lines.push(line) },
  });
});
afterAll(async () => {
  await ctx.drop();
});

describe('the log', () => {
  it('holds no password, cookie, CSRF token or configured secret', async () => {
    const seen: string[] = [...Object.values(secrets)];
    const admin = accountFor('admin');
    seen.push(admin.password, 'a-wrong-password-typed-7');

    const agent = request.agent(app);
    const first = await agent.get('/api/auth/session').expect(200);
    seen.push(first.body.csrfToken);
    // Signed out, the token is held in a signed cookie: neither may be logged.
    const csrfCookie = /cutline\.csrf=([^;]+)/.exec((first.headers['set-cookie'] as unknown as string[]).join(';'))![1]!;
    seen.push(csrfCookie, decodeURIComponent(csrfCookie));
    await agent.post('/api/auth/sign-in').set('x-csrf-token', first.body.csrfToken).send({ email: admin.email, password: 'a-wrong-password-typed-7' }).expect(401);
    const signedIn = await agent.post('/api/auth/sign-in').set('x-csrf-token', first.body.csrfToken).send({ email: admin.email, password: admin.password }).expect(200);
    const csrf = signedIn.body.csrfToken as string;
    const setCookie = signedIn.headers['set-cookie'] as unknown as string[];
    const cookie = /cutline\.sid=([^;]+)/.exec(setCookie.join(';'))![1]!;
    seen.push(csrf, cookie, decodeURIComponent(cookie));

    const newPassword = 'member-initial-password-42';
    seen.push(newPassword);
    await agent
      .post('/api/members')
      .set('x-csrf-token', csrf)
      .send({ email: 'logged@cutline.example', displayName: 'Log Test', role: 'viewer', password: newPassword })
      .expect(201);
    await agent.get('/api/members').set('authorization', 'Bearer not-a-real-token-99').expect(200);
    seen.push('not-a-real-token-99');
    const changedPassword = 'admin-changed-password-43';
    seen.push(changedPassword);
    await agent.post('/api/auth/password').set('x-csrf-token', csrf).send({ currentPassword: admin.password, newPassword: changedPassword }).expect(204);
    await agent.post('/api/auth/sign-out').set('x-csrf-token', csrf).expect(200);

    const log = lines.join('');
    expect(lines.length).toBeGreaterThanOrEqual(6);
    for (const secret of seen) expect(log, `the log holds ${secret}`).not.toContain(secret);
  });

  it('gives every request line a request id, echoed to the client', async () => {
    const requestLines = lines.map((l) => JSON.parse(l) as { req?: { id?: string }; msg?: string }).filter((l) => l.req);
    expect(requestLines.length).toBeGreaterThan(0);
    for (const line of requestLines) expect(line.req!.id).toMatch(/^[0-9a-f-]{36}$/);
    const res = await request(app).get('/api/auth/session').set('x-request-id', 'probe-1234');
    expect(res.headers['x-request-id']).toBe('probe-1234');
    expect(lines.at(-1)).toContain('"id":"probe-1234"');
  });
});

// Account back-off: after three failures in a row the account waits a minute, and each further
// failure doubles the wait up to eight minutes. Attempts during a wait are refused and not
// counted, so a guesser gets one try per wait; a quiet spell of a whole longest wait after the
// last one ended starts the count again. Time passing is simulated by moving the wait's end.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestContext, accountFor, type TestContext } from './support/test-app';
import { backoffMilliseconds } from '../../server/services/sign-in-lockout';

let ctx: TestContext;
beforeAll(async () => {
  ctx = await createTestContext({ SIGN_IN_LOCKOUT_FAILURES: '3', SIGN_IN_BACKOFF_SECONDS: '60', SIGN_IN_LOCKOUT_MINUTES: '8', SIGN_IN_ATTEMPTS_PER_WINDOW: '1000', SIGN_IN_ATTEMPTS_PER_ADDRESS: '1000' });
});
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

let address = 0;
async function attempt(email: string, password: string) {
  const agent = request.agent(ctx.app);
  const from = `198.51.100.${++address % 250}`;
  const csrf = (await agent.get('/api/auth/session').set('x-forwarded-for', from)).body.csrfToken;
  return agent.post('/api/auth/sign-in').set('x-forwarded-for', from).set('x-csrf-token', csrf).send({ email, password });
}

async function waitSeconds(email: string): Promise<number | null> {
  const { rows } = await ctx.pool.query<{ s: number | null }>('SELECT extract(epoch FROM locked_until - now())::float AS s FROM users WHERE email = $1', [email]);
  return rows[0]!.s;
}
/** The current wait ends now, as if it had run its course. */
const letWaitEnd = (email: string, agoSeconds = 1) => ctx.pool.query("UPDATE users SET locked_until = now() - make_interval(secs => $2) WHERE email = $1", [email, agoSeconds]);

describe('the back-off rule', () => {
  it('waits nothing below the threshold, then doubles from the first wait up to the longest (arithmetic, common practice)', () => {
    const config = { SIGN_IN_LOCKOUT_FAILURES: 3, SIGN_IN_BACKOFF_SECONDS: 60, SIGN_IN_LOCKOUT_MINUTES: 8 };
    expect([1, 2, 3, 4, 5, 6, 7, 1000].map((f) => backoffMilliseconds(f, config) / 1000)).toEqual([0, 0, 60, 120, 240, 480, 480, 480]);
  });
});

describe('sign-in back-off on an account', () => {
  const viewer = accountFor('viewer');

  it('doubles the wait after each failure past the threshold, up to the longest, counting none during a wait', async () => {
    expect((await attempt(viewer.email, 'guess-1-2026')).status).toBe(401);
    expect((await attempt(viewer.email, 'guess-2-2026')).status).toBe(401);
    const third = await attempt(viewer.email, 'guess-3-2026');
    expect(third.status).toBe(423);
    expect(third.body.error.message).toMatch(/Try again in (59 seconds|1 minute)/);
    expect(await waitSeconds(viewer.email)).toBeCloseTo(60, -1);

    // During the wait, even the right password is refused, and nothing is counted.
    for (let i = 0; i < 5; i++) expect((await attempt(viewer.email, `during-${i}-2026`)).status).toBe(423);
    expect((await attempt(viewer.email, viewer.password)).status).toBe(423);
    expect(await waitSeconds(viewer.email)).toBeCloseTo(60, -1);

    for (const expected of [120, 240, 480, 480]) {
      await letWaitEnd(viewer.email);
      const res = await attempt(viewer.email, `after-wait-${expected}-2026`);
      expect(res.status).toBe(423);
      expect(await waitSeconds(viewer.email)).toBeCloseTo(expected, -1);
    }
    const audit = await ctx.pool.query("SELECT details->>'waitSeconds' AS wait FROM audit_events WHERE action = 'session.locked' AND entity_id = $1 ORDER BY id", [ctx.userIds[viewer.email]]);
    expect(audit.rows.map((r) => Number(r.wait))).toEqual([60, 120, 240, 480, 480]);

    // The wait over, the right password signs in and clears the count.
    await letWaitEnd(viewer.email);
    expect((await attempt(viewer.email, viewer.password)).status).toBe(200);
    expect((await attempt(viewer.email, 'typo-2026')).status).toBe(401);
  });

  it('starts counting again after a quiet spell of a whole longest wait', async () => {
    const official = accountFor('official');
    for (let i = 0; i < 3; i++) await attempt(official.email, `guess-${i}-2026`);
    await letWaitEnd(official.email);
    await attempt(official.email, 'guess-3-2026');
    expect(await waitSeconds(official.email)).toBeCloseTo(120, -1);
    // The last wait ended nine minutes ago (the longest is eight): the next failure is the first again.
    await letWaitEnd(official.email, 9 * 60);
    expect((await attempt(official.email, 'guess-again-2026')).status).toBe(401);
    // Ended only a minute ago: the count goes on, and the next failure waits twice as long.
    await ctx.pool.query("UPDATE users SET failed_sign_ins = 4 WHERE email = $1", [official.email]);
    await letWaitEnd(official.email, 60);
    expect((await attempt(official.email, 'guess-more-2026')).status).toBe(423);
    expect(await waitSeconds(official.email)).toBeCloseTo(240, -1);
  });
});

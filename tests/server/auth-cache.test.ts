// Sessions and signed-in users are kept for AUTH_CACHE_MILLISECONDS by each process. What this
// process changes (a role, a removed member, a sign-out) takes effect at the next request; what
// only the database learned (another process's change) shows within that time, and at once
// with the cache off.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createApp } from '../../server/app';
import { createTestContext, signInAs, accountFor, type TestContext } from './support/test-app';

let ctx: TestContext;
beforeAll(async () => {
  ctx = await createTestContext({ AUTH_CACHE_MILLISECONDS: '2000' });
});
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

const viewerId = () => ctx.userIds[accountFor('viewer').email]!;
const setRoleInDatabase = (role: string) =>
  ctx.pool.query('UPDATE memberships SET role = $1 WHERE user_id = $2 AND organization_id = $3', [role, viewerId(), ctx.demoOrganizationId]);
const roleSeenBy = async (agent: ReturnType<typeof request.agent>) => (await agent.get('/api/auth/session').expect(200)).body.user?.role as string | undefined;

describe('the session and user cache', () => {
  it('applies a role change made here at the next request', async () => {
    const admin = await signInAs(ctx.app, 'admin');
    const viewer = await signInAs(ctx.app, 'viewer');
    expect(await roleSeenBy(viewer.agent)).toBe('viewer');
    await admin.agent.patch(`/api/members/${viewerId()}`).set('x-csrf-token', admin.csrf).send({ role: 'planner' }).expect(200);
    expect(await roleSeenBy(viewer.agent)).toBe('planner');
    await viewer.agent.post('/api/plans').set('x-csrf-token', viewer.csrf).send({ name: 'Made right after the change' }).expect(201);
    await admin.agent.patch(`/api/members/${viewerId()}`).set('x-csrf-token', admin.csrf).send({ role: 'viewer' }).expect(200);
    await viewer.agent.post('/api/plans').set('x-csrf-token', viewer.csrf).send({ name: 'Refused' }).expect(403);
  });

  it('refuses a signed-out session at once', async () => {
    const planner = await signInAs(ctx.app, 'planner');
    const cookie = (await planner.agent.get('/api/plans').expect(200)).request.cookies as unknown as string;
    await planner.agent.post('/api/auth/sign-out').set('x-csrf-token', planner.csrf).expect(200);
    await request(ctx.app).get('/api/plans').set('cookie', cookie).expect(401);
  });

  it('shows a change only the database knows within the cache time', async () => {
    const viewer = await signInAs(ctx.app, 'viewer');
    expect(await roleSeenBy(viewer.agent)).toBe('viewer');
    await setRoleInDatabase('official');
    // Still the kept copy: this process did not make the change.
    expect(await roleSeenBy(viewer.agent)).toBe('viewer');
    await new Promise((r) => setTimeout(r, 2100));
    expect(await roleSeenBy(viewer.agent)).toBe('official');
    await setRoleInDatabase('viewer');
  });

  it('reads every request from the database when turned off', async () => {
    const app = createApp({ config: { ...ctx.config, AUTH_CACHE_MILLISECONDS: 0 }, db: ctx.db, pool: ctx.pool, clientDir: '/nonexistent', runQueue: { enqueue: async () => undefined }, log: (e) => ctx.errors.push(e) });
    const viewer = await signInAs(app, 'viewer');
    expect(await roleSeenBy(viewer.agent)).toBe('viewer');
    await setRoleInDatabase('official');
    expect(await roleSeenBy(viewer.agent)).toBe('official');
    await setRoleInDatabase('viewer');
    // Back to the shared setting for the other files of this process.
    createApp({ config: ctx.config, db: ctx.db, pool: ctx.pool, clientDir: '/nonexistent', runQueue: { enqueue: async () => undefined } });
  });
});

// Every role against every route: 401 signed out, 403 for a role the route does not allow,
// 404 for another organization's record. A table, so a new route is one more row.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import type { Role } from '../../shared/api/roles';
import { createTestContext, signIn, signInAs, otherAccounts, type SignedInAgent, type TestContext } from './support/test-app';

type Who = Role | 'signed-out';
type Route = {
  name: string;
  method: 'get' | 'post' | 'patch' | 'delete';
  path: (ids: Ids) => string;
  body?: (ids: Ids) => object;
  expect: Record<Who, number>;
};
type Ids = { ownPlan: string; otherPlan: string; viewerId: string; otherUserId: string; freshPlan: () => Promise<string> };

const all = (status: number, signedOut = 401): Record<Who, number> => ({
  'signed-out': signedOut,
  admin: status,
  planner: status,
  official: status,
  viewer: status,
});
const writers = (ok: number): Record<Who, number> => ({ 'signed-out': 401, admin: ok, planner: ok, official: 403, viewer: 403 });
const adminsOnly = (ok: number): Record<Who, number> => ({ 'signed-out': 401, admin: ok, planner: 403, official: 403, viewer: 403 });

const routes: Route[] = [
  { name: 'list plans', method: 'get', path: () => '/api/plans', expect: all(200) },
  { name: 'read own plan', method: 'get', path: (i) => `/api/plans/${i.ownPlan}`, expect: all(200) },
  { name: "read another organization's plan", method: 'get', path: (i) => `/api/plans/${i.otherPlan}`, expect: all(404) },
  { name: 'create plan', method: 'post', path: () => '/api/plans', body: () => ({ name: 'Matrix plan' }), expect: writers(201) },
  { name: 'edit own plan', method: 'patch', path: (i) => `/api/plans/${i.ownPlan}`, body: () => ({ description: 'edited' }), expect: writers(200) },
  {
    name: "edit another organization's plan",
    method: 'patch',
    path: (i) => `/api/plans/${i.otherPlan}`,
    body: () => ({ description: 'x' }),
    expect: { 'signed-out': 401, admin: 404, planner: 404, official: 403, viewer: 403 },
  },
  {
    name: "delete another organization's plan",
    method: 'delete',
    path: (i) => `/api/plans/${i.otherPlan}`,
    expect: { 'signed-out': 401, admin: 404, planner: 404, official: 403, viewer: 403 },
  },
  { name: 'list members', method: 'get', path: () => '/api/members', expect: adminsOnly(200) },
  {
    name: 'add member',
    method: 'post',
    path: () => '/api/members',
    body: () => ({ email: `m${Math.random().toString(36).slice(2)}@cutline.example`, displayName: 'New', role: 'viewer', password: 'a-long-password-1' }),
    expect: adminsOnly(201),
  },
  { name: 'change a member role', method: 'patch', path: (i) => `/api/members/${i.viewerId}`, body: () => ({ role: 'viewer' }), expect: adminsOnly(200) },
  {
    name: "change another organization's member",
    method: 'patch',
    path: (i) => `/api/members/${i.otherUserId}`,
    body: () => ({ role: 'viewer' }),
    expect: adminsOnly(404),
  },
  { name: 'read the audit trail', method: 'get', path: () => '/api/audit', expect: adminsOnly(200) },
  { name: 'read the session', method: 'get', path: () => '/api/auth/session', expect: all(200, 200) },
];

let ctx: TestContext;
let ids: Ids;
const agents = new Map<Who, SignedInAgent>();

beforeAll(async () => {
  ctx = await createTestContext();
  const other = await signIn(ctx.app, otherAccounts[1]!.email, otherAccounts[1]!.password);
  const otherPlan = (await other.agent.post('/api/plans').set('x-csrf-token', other.csrf).send({ name: 'Other plan' }).expect(201)).body.id;
  const planner = await signInAs(ctx.app, 'planner');
  const freshPlan = async () =>
    (await planner.agent.post('/api/plans').set('x-csrf-token', planner.csrf).send({ name: 'Fresh' }).expect(201)).body.id as string;
  ids = {
    ownPlan: await freshPlan(),
    otherPlan,
    viewerId: ctx.userIds['viewer@cutline.example']!,
    otherUserId: ctx.userIds['planner@other.example']!,
    freshPlan,
  };
  for (const role of ['admin', 'planner', 'official', 'viewer'] as const) agents.set(role, await signInAs(ctx.app, role));
  const anonymous = request.agent(ctx.app);
  const csrf = (await anonymous.get('/api/auth/session')).body.csrfToken;
  agents.set('signed-out', { agent: anonymous, csrf });
});
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

describe.each(routes)('$name', (route) => {
  it.each(Object.entries(route.expect) as [Who, number][])('as %s → %i', async (who, status) => {
    const { agent, csrf } = agents.get(who)!;
    let req = agent[route.method](route.path(ids));
    if (route.method !== 'get') req = req.set('x-csrf-token', csrf);
    const res = await (route.body ? req.send(route.body(ids)) : req);
    expect(res.status, JSON.stringify(res.body)).toBe(status);
    if (status >= 400) expect(res.body.error).toBeDefined();
  });
});

describe('deleting plans', () => {
  it('is allowed to planners and admins, refused to officials and viewers', async () => {
    for (const [who, status] of [['official', 403], ['viewer', 403], ['planner', 204], ['admin', 204]] as const) {
      const plan = await ids.freshPlan();
      const { agent, csrf } = agents.get(who)!;
      expect((await agent.delete(`/api/plans/${plan}`).set('x-csrf-token', csrf)).status).toBe(status);
    }
  });
});

// Every route that takes a request body (POST, PUT, PATCH, read from the router itself) gets
// generated hostile bodies, sent by an account allowed to call it, at records that exist. A
// malformed body must be a 4xx with a readable message, never a 5xx, and write nothing: every
// table of the public schema but `sessions` is counted around each request, and its contents
// compared around each route's run. A route with a body and no row here fails the suite, as
// does a row for a route that is gone. Routes without a body get hostile bodies too: those
// must never be a 5xx, and write nothing when they refuse.
import fc from 'fast-check';
import request from 'supertest';
import { z } from 'zod';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { signInRequestSchema, switchOrganizationRequestSchema } from '../../shared/api/auth';
import { sweepCreateSchema } from '../../shared/api/sweeps';
import { proposalRequestSchema, saveProposalSchema } from '../../shared/api/proposals';
import {
  briefingCreateSchema,
  briefingReturnSchema,
  briefingUpdateSchema,
  briefingVersionCreateSchema,
  signOffRequestSchema,
} from '../../shared/api/briefings';
import { capacityTableSchema } from '../../shared/api/capacity-table';
import { segmentAttributesPatchSchema } from '../../shared/api/road-attributes';
import { planCreateSchema, planUpdateSchema } from '../../shared/api/plans';
import { segmentBulkUpdateSchema } from '../../shared/api/road-layers';
import { defaultRunParameters, runParametersSchema } from '../../shared/api/runs';
import { scenarioCreateSchema, scenarioUpdateSchema } from '../../shared/api/scenarios';
import { mapSettingsSchema, organizationSettingsInputSchema } from '../../shared/api/settings';
import { mappingPresetCreateSchema } from '../../shared/api/mapping-presets';
import { memberCreateSchema, memberPasswordSchema, memberUpdateSchema } from '../../shared/api/users';
import { shelterCreateSchema, shelterUpdateSchema, zoneCreateSchema, zoneUpdateSchema } from '../../shared/api/zones-shelters';
import { defaultCapacityTable } from '../../shared/model/capacity-defaults';
import { createTestContext, csrfFor, signInAs, type SignedInAgent, type TestContext } from './support/test-app';
import { enumerateRoutes, routeKey } from './support/enumerate-routes';
import { demoPlanId, insertDemoRun } from './support/demo-run';
import { hostileBodies, UNREADABLE, type HostileBody } from './support/hostile-bodies';
import { expectReadableRefusal } from './support/readable-refusal';

type Who = 'planner' | 'admin' | 'official' | 'signed-out';
type Fixtures = {
  organizationId: string;
  planId: string;
  segmentId: number;
  zoneId: number;
  shelterId: number;
  scenarioId: string;
  runId: string;
  briefingId: string;
  viewerId: string;
  officialId: string;
};
type Body =
  /** A JSON body: a valid sample to break, and the route's own parsing, true when it refuses. */
  | { json: (f: Fixtures) => Record<string, unknown>; refuses: (body: unknown, f: Fixtures) => boolean }
  /** The route reads no body. */
  | 'none'
  /** The route reads a multipart upload, so any JSON body lacks the file. */
  | 'upload';
type Row = { who: Who; path: (f: Fixtures) => string; body: Body };

const refusedBy = (schema: z.ZodType) => (body: unknown) => !schema.safeParse(body).success;
// As server/routes/runs.ts parses a run's start.
const startRunSchema = z.object({ parameters: runParametersSchema, scenarioId: z.string().uuid().nullable().default(null) });
const square = (lon: number, lat: number, d: number) => ({ type: 'Polygon', coordinates: [[[lon, lat], [lon + d, lat], [lon + d, lat + d], [lon, lat + d], [lon, lat]]] });

const rows: Record<string, Row> = {
  'POST /api/auth/sign-in': {
    who: 'signed-out',
    path: () => '/api/auth/sign-in',
    // An address no account has, so no failure counts towards a lockout.
    body: { json: () => ({ email: 'nobody@nowhere.example', password: 'not-a-password-1' }), refuses: refusedBy(signInRequestSchema) },
  },
  'POST /api/auth/sign-out': { who: 'signed-out', path: () => '/api/auth/sign-out', body: 'none' },
  'POST /api/auth/organization': {
    who: 'planner',
    path: () => '/api/auth/organization',
    body: { json: (f) => ({ organizationId: f.organizationId }), refuses: refusedBy(switchOrganizationRequestSchema) },
  },
  'POST /api/auth/password': {
    who: 'planner',
    path: () => '/api/auth/password',
    // Never the planner's current password, so every body is refused and the password stays.
    body: { json: () => ({ currentPassword: 'not-the-current-one-1', newPassword: 'a-new-long-password-1' }), refuses: () => true },
  },
  'POST /api/plans': { who: 'planner', path: () => '/api/plans', body: { json: () => ({ name: 'Hostile plan', description: 'made by a test' }), refuses: refusedBy(planCreateSchema) } },
  'PATCH /api/plans/:id': { who: 'planner', path: (f) => `/api/plans/${f.planId}`, body: { json: () => ({ name: 'Renamed', description: 'edited' }), refuses: refusedBy(planUpdateSchema) } },
  'PATCH /api/plans/:planId/segments/:segmentId': {
    who: 'planner',
    path: (f) => `/api/plans/${f.planId}/segments/${f.segmentId}`,
    body: {
      json: () => ({ lanesForward: 2, speedKmh: 40, name: 'Quay Road', closed: false }),
      // The route merges the patch into a one-segment bulk update, which refuses an empty one.
      refuses: (b, f) => {
        const patch = segmentAttributesPatchSchema.safeParse(b);
        return !patch.success || !segmentBulkUpdateSchema.safeParse({ ids: [f.segmentId], patch: patch.data }).success;
      },
    },
  },
  'PATCH /api/plans/:planId/segments': {
    who: 'planner',
    path: (f) => `/api/plans/${f.planId}/segments`,
    body: { json: (f) => ({ ids: [f.segmentId], patch: { closed: true, capacityOverrideVehPerHourPerLane: 1200 } }), refuses: refusedBy(segmentBulkUpdateSchema) },
  },
  'POST /api/plans/:planId/zones': {
    who: 'planner',
    path: (f) => `/api/plans/${f.planId}/zones`,
    body: {
      json: () => ({ name: 'Drawn', population: 1200, participationRate: 0.9, personsPerVehicle: 2.2, departureCurve: { kind: 'uniform', durationHours: 2 }, geometry: square(-38.5, 44.2, 0.01) }),
      refuses: refusedBy(zoneCreateSchema),
    },
  },
  'PATCH /api/plans/:planId/zones/:zoneId': {
    who: 'planner',
    path: (f) => `/api/plans/${f.planId}/zones/${f.zoneId}`,
    body: { json: () => ({ population: 1500, departureCurve: { kind: 'rayleigh', sigmaHours: 1.5 } }), refuses: refusedBy(zoneUpdateSchema) },
  },
  'POST /api/plans/:planId/shelters': {
    who: 'planner',
    path: (f) => `/api/plans/${f.planId}/shelters`,
    body: { json: () => ({ name: 'Hall', capacityPersons: 300, lon: -38.5, lat: 44.2 }), refuses: refusedBy(shelterCreateSchema) },
  },
  'POST /api/plans/:planId/imports/:kind': { who: 'planner', path: (f) => `/api/plans/${f.planId}/imports/road-layer`, body: 'upload' },
  // No import exists under this id: whatever the body, the answer is a readable 404.
  'POST /api/plans/:planId/imports/:importId/cancel': {
    who: 'planner',
    path: (f) => `/api/plans/${f.planId}/imports/00000000-0000-4000-8000-000000000000/cancel`,
    body: 'none',
  },
  'POST /api/plans/:planId/file-schema': { who: 'planner', path: (f) => `/api/plans/${f.planId}/file-schema`, body: 'upload' },
  'PATCH /api/plans/:planId/shelters/:shelterId': {
    who: 'planner',
    path: (f) => `/api/plans/${f.planId}/shelters/${f.shelterId}`,
    body: { json: () => ({ capacityPersons: 250, lat: 44.21 }), refuses: refusedBy(shelterUpdateSchema) },
  },
  'PUT /api/plans/:planId/capacity-table': {
    who: 'planner',
    path: (f) => `/api/plans/${f.planId}/capacity-table`,
    body: { json: () => defaultCapacityTable() as unknown as Record<string, unknown>, refuses: refusedBy(capacityTableSchema) },
  },
  'POST /api/plans/:planId/scenarios': {
    who: 'planner',
    path: (f) => `/api/plans/${f.planId}/scenarios`,
    body: {
      json: (f) => ({ name: 'Flooded quay', description: '', overlay: { closures: [{ segmentId: f.segmentId, fromMinutes: 30, untilMinutes: null }], classFactors: [{ roadClass: 'primary', factor: 0.8 }] } }),
      refuses: refusedBy(scenarioCreateSchema),
    },
  },
  'PATCH /api/plans/:planId/scenarios/:scenarioId': {
    who: 'planner',
    path: (f) => `/api/plans/${f.planId}/scenarios/${f.scenarioId}`,
    body: { json: () => ({ name: 'Renamed scenario', overlay: { departureDelays: [{ zoneId: 1, delayMinutes: 15 }] } }), refuses: refusedBy(scenarioUpdateSchema) },
  },
  'POST /api/plans/:planId/runs': {
    who: 'planner',
    path: (f) => `/api/plans/${f.planId}/runs`,
    body: { json: (f) => ({ parameters: defaultRunParameters, scenarioId: f.scenarioId }), refuses: refusedBy(startRunSchema) },
  },
  'POST /api/plans/:planId/runs/:runId/cancel': { who: 'planner', path: (f) => `/api/plans/${f.planId}/runs/${f.runId}/cancel`, body: 'none' },
  'POST /api/plans/:planId/sweeps': {
    who: 'planner',
    path: (f) => `/api/plans/${f.planId}/sweeps`,
    body: { json: () => ({ name: 'Rain sweep', scenarioId: null, parameters: defaultRunParameters, sweep: { parameter: 'capacityFactor', values: [0.8, 1] } }), refuses: refusedBy(sweepCreateSchema) },
  },
  'POST /api/plans/:planId/proposals': {
    who: 'planner',
    path: (f) => `/api/plans/${f.planId}/proposals`,
    body: { json: () => ({ kind: 'lanes', parameters: defaultRunParameters, budgetLanes: 2 }), refuses: refusedBy(proposalRequestSchema) },
  },
  // No search exists under this id: whatever the body, the answer is a readable 404.
  'POST /api/plans/:planId/proposals/:proposalId/cancel': {
    who: 'planner',
    path: (f) => `/api/plans/${f.planId}/proposals/00000000-0000-4000-8000-000000000000/cancel`,
    body: 'none',
  },
  'POST /api/plans/:planId/proposals/:proposalId/scenario': {
    who: 'planner',
    path: (f) => `/api/plans/${f.planId}/proposals/00000000-0000-4000-8000-000000000000/scenario`,
    body: { json: () => ({ name: 'Searched change' }), refuses: refusedBy(saveProposalSchema) },
  },
  'POST /api/members': {
    who: 'admin',
    path: () => '/api/members',
    body: { json: () => ({ email: 'new.member@cutline.example', displayName: 'New Member', role: 'viewer', password: 'long-enough-pass-1' }), refuses: refusedBy(memberCreateSchema) },
  },
  'PATCH /api/members/:userId': { who: 'admin', path: (f) => `/api/members/${f.viewerId}`, body: { json: () => ({ role: 'viewer' }), refuses: refusedBy(memberUpdateSchema) } },
  'POST /api/members/:userId/password': {
    who: 'admin',
    path: (f) => `/api/members/${f.viewerId}/password`,
    body: { json: () => ({ password: 'long-enough-pass-1' }), refuses: refusedBy(memberPasswordSchema) },
  },
  'POST /api/members/:userId/unlock': { who: 'admin', path: (f) => `/api/members/${f.viewerId}/unlock`, body: 'none' },
  'POST /api/mapping-presets': {
    who: 'planner',
    path: () => '/api/mapping-presets',
    body: {
      json: () => ({ name: 'County centrelines', kind: 'roads', fieldNames: ['RD_CLASS', 'SPD'], mapping: { roads: { roadClass: 'RD_CLASS', speed: 'SPD', speedUnit: 'mph', classValues: { A: 'primary' }, onewayValues: { F: 'forward' } }, source: { crs: 'EPSG:2227' } } }),
      refuses: refusedBy(mappingPresetCreateSchema),
    },
  },
  'PUT /api/settings/map': {
    who: 'admin',
    path: () => '/api/settings/map',
    body: { json: () => ({ tileUrl: 'https://tiles.veltmoor.example/{z}/{x}/{y}.png', attribution: 'Veltmoor tiles' }), refuses: refusedBy(mapSettingsSchema) },
  },
  'PUT /api/settings/organization': {
    who: 'admin',
    path: () => '/api/settings/organization',
    body: { json: () => ({ unitSystem: 'us-customary', timeZone: 'America/Chicago' }), refuses: refusedBy(organizationSettingsInputSchema) },
  },
  'POST /api/briefings/verify': { who: 'signed-out', path: () => '/api/briefings/verify', body: 'upload' },
  'POST /api/briefings': {
    who: 'planner',
    path: () => '/api/briefings',
    body: { json: (f) => ({ runId: f.runId, title: 'Evening order', recipients: [{ name: 'Ada Fenwick', email: 'ada.fenwick@veltmoor.example' }] }), refuses: refusedBy(briefingCreateSchema) },
  },
  'PATCH /api/briefings/:id': {
    who: 'planner',
    path: (f) => `/api/briefings/${f.briefingId}`,
    body: { json: () => ({ title: 'Retitled', recipients: [{ name: 'Boris Lantern', email: 'boris.lantern@veltmoor.example' }] }), refuses: refusedBy(briefingUpdateSchema) },
  },
  'POST /api/briefings/:id/versions': {
    who: 'planner',
    path: (f) => `/api/briefings/${f.briefingId}/versions`,
    // The route reads a missing body as {} (same run, same title).
    body: { json: (f) => ({ runId: f.runId, title: 'Second version' }), refuses: (b) => !briefingVersionCreateSchema.safeParse(b ?? {}).success },
  },
  'POST /api/briefings/:id/sign-off-requests': {
    who: 'planner',
    path: (f) => `/api/briefings/${f.briefingId}/sign-off-requests`,
    body: { json: (f) => ({ reviewerIds: [f.officialId], note: 'Please sign by Friday.' }), refuses: refusedBy(signOffRequestSchema) },
  },
  'POST /api/briefings/:id/withdraw': { who: 'planner', path: (f) => `/api/briefings/${f.briefingId}/withdraw`, body: 'none' },
  'POST /api/briefings/:id/sign': { who: 'official', path: (f) => `/api/briefings/${f.briefingId}/sign`, body: 'none' },
  'POST /api/briefings/:id/return': {
    who: 'official',
    path: (f) => `/api/briefings/${f.briefingId}/return`,
    body: { json: () => ({ comment: 'The bridge closures need a source.' }), refuses: refusedBy(briefingReturnSchema) },
  },
  'POST /api/briefings/:id/distribute': { who: 'planner', path: (f) => `/api/briefings/${f.briefingId}/distribute`, body: 'none' },
};

let ctx: TestContext;
let f: Fixtures;
const agents = new Map<Who, SignedInAgent>();
let tables: string[];
const sent = { malformed: 0, toRoutesWithoutBody: 0 };

beforeAll(async () => {
  // Sign-in is fuzzed with an unknown address; the per-address limit would otherwise answer
  // 429 before the body is read.
  ctx = await createTestContext({ SIGN_IN_ATTEMPTS_PER_WINDOW: '1000000', SIGN_IN_ATTEMPTS_PER_ADDRESS: '1000000' });
  for (const role of ['planner', 'admin', 'official'] as const) agents.set(role, await signInAs(ctx.app, role));
  const anonymous = request.agent(ctx.app);
  agents.set('signed-out', { agent: anonymous, csrf: await csrfFor(anonymous) });
  const planner = agents.get('planner')!;
  const planId = await demoPlanId(ctx.db, ctx.demoOrganizationId);
  const get = async (path: string) => (await planner.agent.get(path).expect(200)).body;
  const runId = (await insertDemoRun(ctx.db, planId, ctx.userIds['planner@cutline.example']!)).runId;
  const post = async (path: string, body: object) => {
    const res = await planner.agent.post(path).set('x-csrf-token', planner.csrf).send(body);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    return res.body;
  };
  f = {
    organizationId: ctx.demoOrganizationId,
    planId,
    segmentId: (await get(`/api/plans/${planId}/segments?pageSize=1`)).items[0].id,
    zoneId: (await get(`/api/plans/${planId}/zones`)).zones[0].id,
    shelterId: (await get(`/api/plans/${planId}/shelters`)).shelters[0].id,
    scenarioId: (await post(`/api/plans/${planId}/scenarios`, { name: 'Fixture scenario' })).id,
    runId,
    briefingId: (await post('/api/briefings', { runId, title: 'Fixture briefing' })).briefing.id,
    viewerId: ctx.userIds['viewer@cutline.example']!,
    officialId: ctx.userIds['official@cutline.example']!,
  };
  const { rows: found } = await ctx.pool.query<{ tablename: string }>("SELECT tablename FROM pg_tables WHERE schemaname = 'public' AND tablename <> 'sessions' ORDER BY tablename");
  tables = found.map((r) => r.tablename);
}, 120_000);
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

async function counts(): Promise<Record<string, number>> {
  const { rows: [row] } = await ctx.pool.query(`SELECT ${tables.map((t) => `(SELECT count(*) FROM "${t}")::int AS "${t}"`).join(', ')}`);
  return row;
}

/** Each table's rows, hashed: catches an edit in place, which counts do not. */
async function contents(): Promise<Record<string, string>> {
  const { rows: [row] } = await ctx.pool.query(
    `SELECT ${tables.map((t) => `(SELECT md5(coalesce(string_agg(t::text, '|' ORDER BY t::text), '')) FROM "${t}" t) AS "${t}"`).join(', ')}`,
  );
  return row;
}

async function send(row: Row, b: HostileBody) {
  const caller = agents.get(row.who)!;
  const method = routeKeyOf(row).split(' ')[0]!.toLowerCase() as 'post' | 'put' | 'patch';
  let req = caller.agent[method](row.path(f)).set('x-csrf-token', caller.csrf).set('content-type', b.contentType);
  if (b.contentEncoding) req = req.set('content-encoding', b.contentEncoding);
  const res = await req.send(b.text);
  // Signing out starts a new session, with a new token.
  if (typeof res.body?.csrfToken === 'string') caller.csrf = res.body.csrfToken;
  return res;
}
const routeKeyOf = (row: Row) => Object.entries(rows).find(([, r]) => r === row)![0];

const hasNul = (v: unknown): boolean => JSON.stringify(v ?? null).includes('\\u0000');
/** What the client meant cannot be taken: unreadable, refused by the route's own parsing, or text with NUL. */
function malformed(row: Row, b: HostileBody): boolean {
  if (typeof row.body !== 'object') return true;
  return b.intended === UNREADABLE || row.body.refuses(b.intended, f) || hasNul(b.intended);
}

const sample = (row: Row) => (typeof row.body === 'object' ? row.body.json(f) : {});
const isPolluted = () => ['polluted', 'isAdmin', 'role'].some((k) => k in ({} as Record<string, unknown>));

describe('the table of routes with a body', () => {
  it('names every POST, PUT and PATCH route of the router, and only those', () => {
    const fromRouter = enumerateRoutes(ctx.app)
      .filter((r) => r.method === 'post' || r.method === 'put' || r.method === 'patch')
      .map(routeKey)
      .sort();
    expect(Object.keys(rows).sort()).toEqual(fromRouter);
  });
});

describe.each(Object.keys(rows))('%s', (key) => {
  const row = rows[key]!;
  const numRuns = row.body === 'none' ? 25 : row.body === 'upload' ? 20 : 45;

  it(`${row.body === 'none' ? 'ignores or refuses' : 'refuses'} hostile bodies, readably, writing nothing`, { timeout: 120_000 }, async () => {
    const before = row.body === 'none' ? null : await contents();
    let actedOn = false;
    await fc.assert(
      fc.asyncProperty(
        hostileBodies(sample(row)).filter((b) => malformed(row, b)),
        async (b) => {
          const counted = await counts();
          const logged = ctx.errors.length;
          const res = await send(row, b);
          const context = `${key} as ${row.who}: ${b.kind}`;
          expect(ctx.errors.slice(logged), `${context} logged an error`).toEqual([]);
          expect(isPolluted(), `${context} polluted Object.prototype`).toBe(false);
          if (row.body === 'none') {
            sent.toRoutesWithoutBody += 1;
            expect(res.status, `${context} → ${res.status} ${JSON.stringify(res.body)}`).toBeLessThan(500);
            if (res.status < 400) {
              actedOn = true;
              return;
            }
          } else sent.malformed += 1;
          const error = expectReadableRefusal(res, context);
          // Refused for the body, not for who asked or a stale token: else the body went unread.
          if (row.body !== 'none') expect(['csrf', 'unauthenticated', 'forbidden'], context).not.toContain(error.code);
          expect(await counts(), `${context} wrote rows`).toEqual(counted);
        },
      ),
      { numRuns },
    );
    if (before && !actedOn) expect(await contents(), `${key}: a refused body changed a stored row`).toEqual(before);
  });
});

describe('the generated bodies', () => {
  it('were over a thousand malformed ones', () => {
    console.info(`hostile bodies sent: ${JSON.stringify(sent)}`);
    expect(sent.malformed).toBeGreaterThanOrEqual(1_000);
  });
});

// The demo organization's records the authorization table points at, made through the API as
// its members would make them: a finished run (solved by the real worker), a sweep, scenarios,
// briefings in each state with their mail in the outbox, members. The seeded demo plan is only
// read, so a briefing can still be drafted from its run at any point (an edit to the plan would
// make the run stale); edits that succeed go to a drill plan, and deletions and state changes
// that succeed get a record of their own from `fresh`. Every id, name and address of the demo
// organization is remembered in `tokens`, for the check that none reaches Far County.
import { expect } from 'vitest';
import request from 'supertest';
import { demoOrganization } from '../../../server/seed/demo-accounts';
import { defaultRunParameters, type RunParameters } from '../../../shared/api/runs';
import type { Caller } from './callers';
import { demoPlanId } from './demo-run';
import { importedRoadLayer } from './import-jobs';
import type { SignedInAgent, TestContext } from './test-app';

type Method = 'get' | 'post' | 'patch' | 'put' | 'delete';

export type Fixtures = {
  organizationId: string;
  /** The seeded demo plan: roads, zones, shelters, a scenario, the finished run, the sweep, a finished search, the briefings. */
  plan: { id: string; segmentId: number; bbox: string; scenarioId: string; runId: string; queuedRunId: string; sweepId: string; queuedImportId: string; proposalId: string; zoneRoutesProposalId: string; queuedProposalId: string };
  /** A demo plan whose roads, zones, shelters, scenario and capacity table take the edits that succeed. */
  drill: { id: string; segmentIds: number[]; zoneId: number; shelterId: number; scenarioId: string };
  /** A demo plan kept for the deletions that are refused. */
  keptPlanId: string;
  briefings: { draft: string; awaiting: string; signed: string };
  signedPdf: Buffer;
  outbox: { messageId: number };
  members: { viewerId: string; officialId: string; roleChangeId: string; lockedId: string };
  parameters: RunParameters;
  far: { organizationId: string; planId: string; officialId: string };
  tokens: Set<string>;
  remember(...values: (string | null | undefined)[]): void;
  /** Records of the demo organization made for one call that succeeds and uses them up. */
  fresh: {
    plan(): Promise<string>;
    zone(): Promise<number>;
    shelter(): Promise<number>;
    scenario(): Promise<string>;
    queuedRun(): Promise<string>;
    queuedImport(): Promise<string>;
    queuedProposal(): Promise<string>;
    draft(): Promise<string>;
    awaitingSignOff(): Promise<string>;
    member(): Promise<string>;
  };
  /** Puts a shared record back in the state a route acts on, before each call. */
  arrange: {
    /** The signed briefing, with its recipient's delivery failed, so distributing it would send again. */
    undelivered(): Promise<string>;
    locked(): Promise<string>;
    /** The role-change member, back to viewer. */
    viewerAgain(): Promise<string>;
  };
  /** A number never used before in this file, for unique names and values that really change something. */
  next(): number;
};

export const recipient = { name: 'Corin Ashdown', email: 'corin.ashdown@veltmoor.example' };
export const drillParameters: RunParameters = { ...defaultRunParameters, horizonMinutes: 120, timeStepSeconds: 120 };

const road = (coordinates: [number, number][], properties: Record<string, unknown>) => ({ type: 'Feature', properties, geometry: { type: 'LineString', coordinates } });

/** Two roads crossing and a bridge: a road layer of five segments, small enough to upload often. */
export function smallRoadFile(names: [string, string, string], lon = 10, lat = 50): Buffer {
  return Buffer.from(
    JSON.stringify({
      type: 'FeatureCollection',
      features: [
        road([[lon, lat], [lon + 0.01, lat]], { highway: 'primary', name: names[0] }),
        road([[lon + 0.005, lat - 0.005], [lon + 0.005, lat + 0.005]], { highway: 'residential', name: names[1] }),
        road([[lon + 0.008, lat - 0.005], [lon + 0.008, lat + 0.005]], { highway: 'secondary', bridge: 'yes', layer: '1', name: names[2] }),
      ],
    }),
  );
}

export const square = (lon: number, lat: number, d: number) => ({
  type: 'Polygon' as const,
  coordinates: [[[lon, lat], [lon + d, lat], [lon + d, lat + d], [lon, lat + d], [lon, lat]]],
});

export const zoneBody = (name: string) => ({
  name,
  population: 1200,
  participationRate: 0.9,
  personsPerVehicle: 2.2,
  departureCurve: { kind: 'uniform', durationHours: 2 },
  geometry: square(10.001, 50.001, 0.002),
});
export const shelterBody = (name: string) => ({ name, capacityPersons: 400, lon: 10.009, lat: 50.001 });

// supertest's parser type names superagent's Response; on Node it is the response stream.
export function binary(res: request.Response, done: (err: Error | null, body: Buffer) => void) {
  const stream = res as unknown as NodeJS.ReadableStream;
  const chunks: Buffer[] = [];
  stream.on('data', (c: Buffer) => chunks.push(c));
  stream.on('end', () => done(null, Buffer.concat(chunks)));
}

/** One API call that must succeed; its parsed JSON body (or the bytes, for files). */
async function api(a: SignedInAgent, method: Method, path: string, body?: object, file?: { bytes: Buffer; name: string }) {
  let req = a.agent[method](path);
  if (method !== 'get') req = req.set('x-csrf-token', a.csrf);
  const res = await (file ? req.attach('file', file.bytes, file.name) : body ? req.send(body) : req);
  if (res.status >= 300) throw new Error(`${method.toUpperCase()} ${path}: ${res.status} ${res.text}`);
  return res.body;
}

async function waitFor<T>(what: string, read: () => Promise<T>, done: (v: T) => boolean): Promise<T> {
  for (let i = 0; i < 600; i++) {
    const v = await read();
    if (done(v)) return v;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`${what} did not happen within a minute`);
}

export async function createFixtures(ctx: TestContext, as: (c: Caller) => SignedInAgent, far: Fixtures['far']): Promise<Fixtures> {
  const planner = as('planner');
  const admin = as('admin');
  const official = as('official');
  const tokens = new Set<string>();
  const remember = (...values: (string | null | undefined)[]) => values.forEach((v) => v && tokens.add(v));
  let counter = 0;
  const next = () => ++counter;

  remember(ctx.demoOrganizationId, demoOrganization.name, recipient.name, recipient.email);
  const { rows: people } = await ctx.pool.query<{ id: string; email: string; display_name: string }>(
    'SELECT u.id, u.email, u.display_name FROM users u JOIN memberships m ON m.user_id = u.id WHERE m.organization_id = $1',
    [ctx.demoOrganizationId],
  );
  for (const p of people) remember(p.id, p.email, p.display_name);

  // The seeded plan, read as its viewers see it.
  const planId = await demoPlanId(ctx.db, ctx.demoOrganizationId);
  const plan = await api(planner, 'get', `/api/plans/${planId}`);
  remember(plan.id, plan.name, plan.description);
  const { layer } = await api(planner, 'get', `/api/plans/${planId}/road-layer`);
  remember(layer.name);
  const bbox = (layer.bbox as number[]).join(',');
  const segmentId = (await api(planner, 'get', `/api/plans/${planId}/segments?pageSize=1`)).items[0].id as number;
  for (const z of (await api(planner, 'get', `/api/plans/${planId}/zones`)).zones) remember(z.name);
  for (const s of (await api(planner, 'get', `/api/plans/${planId}/shelters`)).shelters) remember(s.name);
  const scenario = await api(planner, 'post', `/api/plans/${planId}/scenarios`, { name: 'Quay Bridge closed at dusk', description: 'Quay Bridge shut from hour 2' });
  remember(scenario.id, scenario.name, scenario.description);

  // A run solved by the worker, and a sweep whose 1.0 value is that same run's input.
  const started = await api(planner, 'post', `/api/plans/${planId}/runs`, { parameters: drillParameters });
  const run = await waitFor('the run', () => api(planner, 'get', `/api/plans/${planId}/runs/${started.id}`), (r) => !['queued', 'running'].includes(r.status));
  expect(run.status, run.failureReason ?? '').toBe('succeeded');
  remember(run.id);
  const sweepName = 'Veltmoor rain sweep';
  const sweepStarted = await api(planner, 'post', `/api/plans/${planId}/sweeps`, { name: sweepName, parameters: drillParameters, sweep: { parameter: 'capacityFactor', values: [0.5, 1] } });
  const sweep = await waitFor(
    'the sweep',
    () => api(planner, 'get', `/api/plans/${planId}/sweeps/${sweepStarted.id}`),
    (b) => b.runs.every((r: { status: string }) => !['queued', 'running'].includes(r.status)),
  );
  remember(sweep.id, sweepName, ...sweep.runs.map((r: { id: string }) => r.id));

  // A run waiting for a worker that never takes it (it is not on the queue), so cancelling is always possible.
  const queuedRun = async () => {
    const { rows } = await ctx.pool.query<{ id: string }>(
      `INSERT INTO runs (plan_id, status, phase, parameters, data_version, input_hash)
       SELECT id, 'queued', 'queued', $2, data_version, 'authorization-test-' || gen_random_uuid() FROM plans WHERE id = $1 RETURNING id`,
      [planId, JSON.stringify(drillParameters)],
    );
    remember(rows[0]!.id);
    return rows[0]!.id;
  };

  // An import waiting for a worker that never takes it (it is not on the queue), so cancelling is always possible.
  const queuedImport = async () => {
    const { rows } = await ctx.pool.query<{ id: string }>(
      `WITH i AS (INSERT INTO imports (plan_id, kind, file_name, size_bytes) VALUES ($1, 'shelters', 'waiting.geojson', 2) RETURNING id),
       c AS (INSERT INTO import_chunks (import_id, seq, bytes) SELECT id, 0, '{}'::bytea FROM i)
       SELECT id FROM i`,
      [planId],
    );
    remember(rows[0]!.id);
    return rows[0]!.id;
  };

  // A search solved by the worker (the quickest departure order: its answer saves as a scenario),
  // and one waiting for a worker that never takes it.
  const proposalStarted = await api(planner, 'post', `/api/plans/${planId}/proposals`, { kind: 'release-order', parameters: drillParameters });
  const proposal = await waitFor('the search', () => api(planner, 'get', `/api/plans/${planId}/proposals/${proposalStarted.id}`), (r) => !['queued', 'running'].includes(r.status));
  expect(proposal.status, proposal.failureReason ?? '').toBe('succeeded');
  remember(proposal.id);
  // "Where each zone goes", for its CSV export.
  const zoneRoutesStarted = await api(planner, 'post', `/api/plans/${planId}/proposals`, { kind: 'zone-routes', parameters: drillParameters });
  const zoneRoutes = await waitFor('the zone routes', () => api(planner, 'get', `/api/plans/${planId}/proposals/${zoneRoutesStarted.id}`), (r) => !['queued', 'running'].includes(r.status));
  expect(zoneRoutes.status, zoneRoutes.failureReason ?? '').toBe('succeeded');
  remember(zoneRoutes.id);
  const queuedProposal = async () => {
    const { rows } = await ctx.pool.query<{ id: string }>(
      `INSERT INTO proposals (plan_id, kind, status, phase, input, input_hash)
       VALUES ($1, 'zone-routes', 'queued', 'queued', '{"request":{"kind":"zone-routes"}}'::jsonb, 'authorization-test-' || gen_random_uuid()) RETURNING id`,
      [planId],
    );
    remember(rows[0]!.id);
    return rows[0]!.id;
  };

  // The drill plan: a small road layer, a zone, a shelter, a scenario.
  const newPlan = async (name: string) => {
    const p = await api(planner, 'post', '/api/plans', { name, description: 'Veltmoor drill copy' });
    remember(p.id, p.name);
    return p.id as string;
  };
  const drillId = await newPlan('Veltmoor drill plan');
  remember('Veltmoor drill copy');
  await importedRoadLayer(planner, drillId, smallRoadFile(['Tannery Lane', 'Weir Street', 'Lock Bridge']), 'veltmoor-drill-roads.geojson');
  remember('Tannery Lane', 'Weir Street', 'Lock Bridge', 'veltmoor-drill-roads.geojson');
  const drillSegments = (await api(planner, 'get', `/api/plans/${drillId}/segments`)).items.map((s: { id: number }) => s.id) as number[];
  const zone = async () => {
    const name = `Tannery Ward ${next()}`;
    remember(name);
    return (await api(planner, 'post', `/api/plans/${drillId}/zones`, zoneBody(name))).id as number;
  };
  const shelter = async () => {
    const name = `Weir Hall ${next()}`;
    remember(name);
    return (await api(planner, 'post', `/api/plans/${drillId}/shelters`, shelterBody(name))).id as number;
  };
  const drillScenario = async () => {
    const s = await api(planner, 'post', `/api/plans/${drillId}/scenarios`, { name: `Lock Bridge drill ${next()}` });
    remember(s.id, s.name);
    return s.id as string;
  };
  const drill = { id: drillId, segmentIds: drillSegments, zoneId: await zone(), shelterId: await shelter(), scenarioId: await drillScenario() };
  const keptPlanId = await newPlan('Veltmoor archive plan');

  // Briefings: a draft, one awaiting the official's sign-off, one signed and mailed.
  const draft = async () => {
    const title = `Quay order briefing ${next()}`;
    remember(title);
    const { briefing } = await api(planner, 'post', '/api/briefings', { runId: run.id, title, recipients: [recipient] });
    remember(briefing.id);
    return briefing.id as string;
  };
  const officialId = ctx.userIds['official@cutline.example']!;
  const awaitingSignOff = async () => {
    const id = await draft();
    await api(planner, 'post', `/api/briefings/${id}/sign-off-requests`, { reviewerIds: [officialId], note: 'Quay order, please sign tonight' });
    return id;
  };
  remember('Quay order, please sign tonight');
  const briefings = { draft: await draft(), awaiting: await awaitingSignOff(), signed: await awaitingSignOff() };
  await api(official, 'post', `/api/briefings/${briefings.signed}/sign`);
  const signedPdf = (await official.agent.get(`/api/briefings/${briefings.signed}/pdf`).buffer(true).parse(binary)).body as Buffer;

  const { messages } = await api(admin, 'get', '/api/briefings/outbox');
  const distribution = (messages as { id: number; kind: string; briefingId: string; subject: string | null }[]).find((m) => m.kind === 'distribution' && m.briefingId === briefings.signed);
  if (!distribution) throw new Error('the signed briefing’s distribution is not in the outbox');
  for (const m of messages as { subject: string | null }[]) remember(m.subject);

  // Members an administrator acts on.
  const member = async (name = `Member ${next()}`) => {
    const email = `member-${next()}@cutline.example`;
    remember(email, name);
    return (await api(admin, 'post', '/api/members', { email, displayName: name, role: 'viewer', password: 'veltmoor-member-2026' })).userId as string;
  };
  const roleChangeId = await member('Ansel Dray');
  const lockedId = await member('Bryn Tolley');

  return {
    organizationId: ctx.demoOrganizationId,
    plan: { id: planId, segmentId, bbox, scenarioId: scenario.id, runId: run.id, queuedRunId: await queuedRun(), sweepId: sweep.id, queuedImportId: await queuedImport(), proposalId: proposal.id, zoneRoutesProposalId: zoneRoutes.id, queuedProposalId: await queuedProposal() },
    drill,
    keptPlanId,
    briefings,
    signedPdf,
    outbox: { messageId: distribution.id },
    members: { viewerId: ctx.userIds['viewer@cutline.example']!, officialId, roleChangeId, lockedId },
    parameters: drillParameters,
    far,
    tokens,
    remember,
    fresh: {
      plan: () => newPlan(`Veltmoor spare plan ${next()}`),
      zone,
      shelter,
      scenario: drillScenario,
      queuedImport,
      queuedRun,
      queuedProposal,
      draft,
      awaitingSignOff,
      member: () => member(),
    },
    arrange: {
      undelivered: async () => {
        await ctx.pool.query("UPDATE briefing_distributions SET message_id = NULL, error = 'The mail server refused the address.' WHERE briefing_id = $1", [briefings.signed]);
        return briefings.signed;
      },
      locked: async () => {
        await ctx.pool.query("UPDATE users SET locked_until = now() + interval '15 minutes' WHERE id = $1", [lockedId]);
        return lockedId;
      },
      viewerAgain: async () => {
        await ctx.pool.query("UPDATE memberships SET role = 'viewer' WHERE user_id = $1 AND organization_id = $2", [roleChangeId, ctx.demoOrganizationId]);
        return roleChangeId;
      },
    },
    next,
  };
}

/** Far County's own plan with a small road layer: the other organization's callers reach for demo records through it. */
export async function createFarPlan(farPlanner: SignedInAgent): Promise<string> {
  const p = await api(farPlanner, 'post', '/api/plans', { name: 'Far County levee plan' });
  await importedRoadLayer(farPlanner, p.id, smallRoadFile(['Levee Road', 'Dyke Lane', 'Sluice Bridge'], 11, 51), 'far-roads.geojson');
  return p.id as string;
}

// Searches for the best change, end to end on the demo town with a real queue worker: each
// answer saved as a scenario and run as an ordinary run must give what the search said it would
// (the scenario is exactly the change proposed), and the searches are stored, listed, cancellable.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './support/test-app';
import { defaultRunParameters, runWithResultSchema, type RunWithResult } from '../../shared/api/runs';
import Papa from 'papaparse';
import { proposalSchema, proposalCaution, type Proposal, type ProposalRequest } from '../../shared/api/proposals';
import { CAUTION_LINE } from '../../shared/api/caution';
import { zoneRoutesCsvHeader } from '../../shared/model/zone-routes-csv';

let ctx: TestContext;
let planner: SignedInAgent;
let planId: string;
let base: RunWithResult;
const parameters = { ...defaultRunParameters, horizonMinutes: 720, timeStepSeconds: 300 };

async function poll<T extends { status: string; failureReason: string | null }>(url: string, parse: (b: unknown) => T): Promise<T> {
  for (let i = 0; i < 600; i++) {
    const r = parse((await planner.agent.get(url).expect(200)).body);
    if (r.status === 'succeeded') return r;
    if (r.status !== 'queued' && r.status !== 'running') throw new Error(`${r.status}: ${r.failureReason}`);
    await new Promise((res) => setTimeout(res, 200));
  }
  throw new Error(`${url} did not finish`);
}

async function run(scenarioId: string | null): Promise<RunWithResult> {
  const started = await planner.agent.post(`/api/plans/${planId}/runs`).set('x-csrf-token', planner.csrf).send({ parameters, scenarioId }).expect(202);
  return poll(`/api/plans/${planId}/runs/${started.body.id}`, (b) => runWithResultSchema.parse(b));
}

type WithoutParameters<T> = T extends unknown ? Omit<T, 'parameters'> : never;

async function search(request: WithoutParameters<ProposalRequest>): Promise<Proposal> {
  const started = await planner.agent.post(`/api/plans/${planId}/proposals`).set('x-csrf-token', planner.csrf).send({ parameters, ...request }).expect(202);
  return poll(`/api/plans/${planId}/proposals/${started.body.id}`, (b) => proposalSchema.parse(b));
}

async function save(proposal: Proposal, name: string, segmentId?: number): Promise<string> {
  const r = await planner.agent.post(`/api/plans/${planId}/proposals/${proposal.id}/scenario`).set('x-csrf-token', planner.csrf).send({ name, segmentId }).expect(201);
  return r.body.id as string;
}

beforeAll(async () => {
  ctx = await createTestContext({ RUN_STARTS_PER_MINUTE: '100' }, { withRunWorker: true });
  planner = await signInAs(ctx.app, 'planner');
  planId = (await planner.agent.get('/api/plans').expect(200)).body.plans[0].id;
  base = await run(null);
}, 120_000);
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

describe('searches on the demo town', () => {
  it('best contraflow: the saved scenario carries exactly the throughput found, which no orientation can beat', async () => {
    const p = await search({ kind: 'contraflow' });
    const a = p.result!.answer;
    if (a.kind !== 'contraflow') throw new Error('wrong kind');
    expect(p.result!.caution).toBe(proposalCaution);
    expect(a.baseVehiclesPerHour).toBe(base.result!.headline.steadyStateVehiclesPerHour);
    expect(a.method).toBe('exact');
    expect(a.achievedVehiclesPerHour).toBe(a.boundVehiclesPerHour);
    expect(a.achievedVehiclesPerHour).toBeGreaterThan(a.baseVehiclesPerHour);
    const r = await run(await save(p, 'Contraflow as found'));
    expect(r.result!.headline.steadyStateVehiclesPerHour).toBe(a.achievedVehiclesPerHour);
    if (a.timeExpanded?.chosenFrom === 'steady-state') expect(r.result!.headline.clearanceMinutes).toBe(a.timeExpanded.chosenClearanceMinutes);
  }, 120_000);

  it('closures: the top-ranked closure saved and run loses what the ranking says', async () => {
    const p = await search({ kind: 'closures', maxRoads: 12 });
    const a = p.result!.answer;
    if (a.kind !== 'closures') throw new Error('wrong kind');
    expect(a.roads.length).toBeGreaterThan(0);
    const top = a.roads[0]!;
    const r = await run(await save(p, 'Top closure', top.segmentId));
    // Closing a segment closes both its directions; the ranking tests one direction at a time, so the run can only lose as much or more.
    expect(r.result!.headline.steadyStateVehiclesPerHour).toBeLessThanOrEqual(a.baseVehiclesPerHour - top.lossVehiclesPerHour);
    if (top.clearanceMinutes !== null && r.result!.headline.clearanceMinutes !== null) expect(r.result!.headline.clearanceMinutes).toBeGreaterThanOrEqual(top.clearanceMinutes);
  }, 120_000);

  it('best added lanes: exact on the demo town, and the saved scenario reaches the throughput found', async () => {
    const p = await search({ kind: 'lanes', budgetLanes: 2 });
    const a = p.result!.answer;
    if (a.kind !== 'lanes') throw new Error('wrong kind');
    expect(a.method).toBe('mip');
    expect(a.exact).toBe(true);
    expect(a.boundVehiclesPerHour).not.toBeNull();
    expect(a.achievedVehiclesPerHour).toBeLessThanOrEqual(a.boundVehiclesPerHour!);
    expect(a.steps.reduce((s, x) => s + x.gainVehiclesPerHour, a.baseVehiclesPerHour)).toBe(a.achievedVehiclesPerHour);
    const r = await run(await save(p, 'Two lanes'));
    expect(r.result!.headline.steadyStateVehiclesPerHour).toBe(a.achievedVehiclesPerHour);
  }, 120_000);

  it('quickest departure order: the saved schedule clears when the search said, no later than the expected departures', async () => {
    const p = await search({ kind: 'release-order' });
    const a = p.result!.answer;
    if (a.kind !== 'release-order') throw new Error('wrong kind');
    expect(a.scheduleClearanceMinutes).toBe(a.quickestClearanceMinutes);
    expect(a.expectedClearanceMinutes).toBe(base.result!.headline.clearanceMinutes);
    if (a.quickestClearanceMinutes !== null && a.expectedClearanceMinutes !== null) expect(a.quickestClearanceMinutes).toBeLessThanOrEqual(a.expectedClearanceMinutes);
    const r = await run(await save(p, 'Quickest order'));
    expect(r.result!.headline.clearanceMinutes).toBe(a.quickestClearanceMinutes);
  }, 120_000);

  it('zone routes: every zone’s delivered vehicles split over its shelters, as the run delivers them', async () => {
    const p = await search({ kind: 'zone-routes' });
    const a = p.result!.answer;
    if (a.kind !== 'zone-routes') throw new Error('wrong kind');
    expect(p.result!.overlay).toBeNull();
    for (const z of a.zones) expect(z.shelters.reduce((s, x) => s + x.vehicles, 0)).toBe(z.deliveredVehicles);
    const byZone = new Map(base.result!.zones.map((z) => [z.zoneId, z.deliveredVehicles]));
    for (const z of a.zones) expect(z.deliveredVehicles).toBe(byZone.get(z.zoneId));
    expect(a.clearanceMinutes).toBe(base.result!.headline.clearanceMinutes);

    // The export: the cautions and what the figures are of above the header, then one row per zone and road.
    const csv = await planner.agent.get(`/api/plans/${planId}/proposals/${p.id}/export/zone-routes.csv`).expect(200);
    expect(csv.headers['content-type']).toMatch(/text\/csv/);
    expect(csv.headers['content-disposition']).toMatch(/zone-routes\.csv/);
    const comments = csv.text.split('\r\n').filter((l: string) => l.startsWith('# '));
    expect(comments[0]).toBe(`# caution: ${CAUTION_LINE}`);
    expect(comments).toContain(`# plan_id: ${planId}`);
    expect(comments.some((l: string) => l.includes(proposalCaution))).toBe(true);
    expect(comments.some((l: string) => l.includes(`search ${p.id}`))).toBe(true);
    expect(comments.some((l: string) => l.includes(`engine ${p.result!.engineVersion}`))).toBe(true);
    const rows = Papa.parse<string[]>(csv.text, { skipEmptyLines: true, delimiter: ',', comments: '#' }).data;
    expect(rows[0]).toEqual(zoneRoutesCsvHeader);
    const body = rows.slice(1);
    expect(body.length).toBe(a.zones.reduce((s, z) => s + Math.max(1, z.roads.length), 0));
    for (const z of a.zones) {
      const own = body.filter((r) => Number(r[0]) === z.zoneId);
      expect(own.map((r) => Number(r[13]))).toEqual(z.roads.map((r) => r.vehicles));
    }
    // Only a zone-routes search has routes to export.
    const other = await search({ kind: 'release-order' });
    await planner.agent.get(`/api/plans/${planId}/proposals/${other.id}/export/zone-routes.csv`).expect(409);
  }, 120_000);

  it('a search that stops at a limit says which and what to do, in the stored answer', async () => {
    // 30 minutes is too short for the demo town to clear even with everyone leaving at the order,
    // and three roads are fewer than the roads that carry traffic.
    const short = { ...parameters, horizonMinutes: 30 };
    const started = await planner.agent.post(`/api/plans/${planId}/proposals`).set('x-csrf-token', planner.csrf).send({ kind: 'release-order', parameters: short }).expect(202);
    const order = await poll(`/api/plans/${planId}/proposals/${started.body.id}`, (b) => proposalSchema.parse(b));
    expect(order.result!.answer.kind === 'release-order' && order.result!.answer.quickestClearanceMinutes).toBeNull();
    expect(order.result!.limits.map((l) => l.kind)).toEqual(['horizon']);
    expect(order.result!.limits[0]!.message).toContain('within the horizon of 30 min');
    const closures = await search({ kind: 'closures', maxRoads: 3 });
    expect(closures.result!.limits.map((l) => l.kind)).toContain('candidates');
    expect(closures.result!.limits.find((l) => l.kind === 'candidates')!.message).toMatch(/^Only the 3 roads carrying the most vehicles were tested/);
  }, 120_000);

  it('an identical search reuses the stored answer; the list shows searches without their answers', async () => {
    const first = await search({ kind: 'zone-routes' });
    expect(first.phase).toMatch(/reused the answer/);
    const list = (await planner.agent.get(`/api/plans/${planId}/proposals`).expect(200)).body.proposals as Proposal[];
    expect(list.length).toBeGreaterThanOrEqual(5);
    expect(list.every((x) => x.result === null)).toBe(true);
  });

  it('bad input changes nothing: an area with no road, and a closures answer saved without a road', async () => {
    const nowhere = [[0, 0], [0.001, 0], [0.001, 0.001]];
    const r = await planner.agent.post(`/api/plans/${planId}/proposals`).set('x-csrf-token', planner.csrf).send({ kind: 'contraflow', parameters, area: nowhere }).expect(400);
    expect(r.body.error.message).toMatch(/No road segment matches/);
  });
});

// Runs end to end on the real database: queued in pg-boss, solved by a worker in a worker
// thread, result stored and served. The demo town's static minimum cut is its four bridges,
// 2,000 + 2,000 + 850 + 750 = 5,600 veh/h with the default capacity table (HCM-derived values
// of shared/model/capacity-defaults.ts; the bridges' classes are set in server/seed/demo-town).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, signInAs, countRows, type SignedInAgent, type TestContext } from './support/test-app';
import { defaultRunParameters, runWithResultSchema, type ArcFlow, type RunWithResult } from '../../shared/api/runs';
import { CAUTION_LINE } from '../../shared/api/caution';

let ctx: TestContext;
let planner: SignedInAgent;
let viewer: SignedInAgent;
let planId: string;

async function waitForRun(runId: string, timeoutMs = 60_000): Promise<RunWithResult> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const res = await viewer.agent.get(`/api/plans/${planId}/runs/${runId}`).expect(200);
    const run = runWithResultSchema.parse(res.body);
    if (!['queued', 'running'].includes(run.status)) return run;
    if (Date.now() > until) throw new Error(`run ${runId} still ${run.status} (${run.phase})`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

/** The run's directed roads with their figures, as its arcs export gives them. */
async function arcsOf(runId: string): Promise<ArcFlow[]> {
  const geo = await viewer.agent.get(`/api/plans/${planId}/runs/${runId}/export/arcs.geojson`).buffer(true).parse((res, cb) => {
    let data = '';
    res.on('data', (c: Buffer) => (data += c));
    res.on('end', () => cb(null, JSON.parse(data)));
  });
  expect(geo.status).toBe(200);
  return (geo.body.features as { properties: ArcFlow }[]).map((f) => f.properties);
}

function start(parameters: object, agent = planner) {
  return agent.agent.post(`/api/plans/${planId}/runs`).set('x-csrf-token', agent.csrf).send({ parameters });
}

beforeAll(async () => {
  ctx = await createTestContext({}, { withRunWorker: true });
  planner = await signInAs(ctx.app, 'planner');
  viewer = await signInAs(ctx.app, 'viewer');
  planId = (await viewer.agent.get('/api/plans').expect(200)).body.plans[0].id;
});
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

// Max-flow/min-cut on the time-expanded network: the cut's capacity is the most that can have
// arrived by its moment, and its parts are what the cut's arcs stand for.
function expectLimitsConsistent(result: NonNullable<RunWithResult['result']>) {
  const limits = result.arrivalLimits!;
  const { roads, departures, zoneRelease, storage, shelterIntake, shelterCapacity } = limits.parts;
  expect(roads + departures + zoneRelease + storage + shelterIntake + shelterCapacity).toBe(limits.vehicles);
  expect(limits.vehicles).toBe(result.curve.deliveredVehicles[limits.byMinutes / result.curve.stepMinutes]);
  // The roads' part is the choke-point table's time-expanded shares.
  expect(result.bottlenecks.reduce((sum, b) => sum + b.shareOfCut, 0)).toBeCloseTo(roads / limits.vehicles, 9);
  return limits;
}

describe('a run of the demo plan', () => {
  let run: RunWithResult;

  it('is accepted at once and solved in the background', async () => {
    const res = await start({ ...defaultRunParameters, horizonMinutes: 240, timeStepSeconds: 60 }).expect(202);
    expect(['queued', 'running']).toContain(res.body.status);
    run = await waitForRun(res.body.id);
    expect(run.status, run.failureReason ?? '').toBe('succeeded');
  });

  it('reports the four bridges as the static choke points, 5,600 veh/h', async () => {
    const result = run.result!;
    const arcs = await arcsOf(run.id);
    expect(result.headline.steadyStateVehiclesPerHour).toBeCloseTo(5600, 6);
    const staticCut = arcs.filter((a) => a.inStaticCut);
    expect(staticCut.reduce((sum, a) => sum + a.capacityVehiclesPerHour, 0)).toBeCloseTo(5600, 6);
    // Max-flow/min-cut: the cut arcs run full.
    for (const a of staticCut) expect(a.flowVehiclesPerHour).toBeCloseTo(a.capacityVehiclesPerHour, 6);
    expect(result.bottlenecks.length).toBeGreaterThan(0);
    expect(result.stats.verified).toBe(true);
  });

  it('keeps the figures consistent with each other', () => {
    const { headline, curve, zones, shelters } = run.result!;
    expect(headline.demandVehicles).toBe(zones.reduce((s, z) => s + z.demandVehicles, 0));
    expect(curve.deliveredVehicles.at(-1)).toBe(headline.deliveredVehicles);
    for (let i = 1; i < curve.deliveredVehicles.length; i++) expect(curve.deliveredVehicles[i]).toBeGreaterThanOrEqual(curve.deliveredVehicles[i - 1]!);
    expect(shelters.reduce((s, x) => s + x.arrivedVehicles, 0)).toBe(zones.reduce((s, z) => s + z.deliveredVehicles, 0));
    // Integrality: integral capacities give integral flows.
    expect(curve.deliveredVehicles.every(Number.isInteger)).toBe(true);
    if (headline.clearanceMinutes !== null) {
      expect(headline.p50Minutes!).toBeLessThanOrEqual(headline.p90Minutes!);
      expect(headline.p95Minutes!).toBeLessThanOrEqual(headline.clearanceMinutes);
    }
  });

  it('says what holds arrivals down: in the first 4 hours the departures, not the bridges', () => {
    // The bridges carry 5,600 veh/h; the demo's zones put fewer than that on the road in any hour.
    const limits = expectLimitsConsistent(run.result!);
    expect(limits.byMinutes).toBe(240);
    expect(limits.parts.departures).toBe(limits.vehicles);
  });

  it('stores how far trip times lie from free flow, with zone and shelter names (engine cutline-flow 1.3), and the plan\'s own routes (1.4)', () => {
    const { routeTiming: t, zones, shelters } = run.result!;
    expect(t).toBeDefined();
    expect(t!.timeStepSeconds).toBe(60);
    expect(t!.pairs).toBeGreaterThan(0);
    expect(t!.pairs).toBeLessThanOrEqual(zones.length * shelters.length);
    expect(t!.typicalSeconds).toBeLessThanOrEqual(t!.largestSeconds);
    expect(zones.map((z) => z.name)).toContain(t!.worst!.zoneName);
    expect(shelters.map((s) => s.name)).toContain(t!.worst!.shelterName);
    expect(t!.plannedRoutes!.vehicles).toBe(run.result!.headline.deliveredVehicles);
    expect(t!.plannedRoutes!.typicalSeconds).toBeLessThanOrEqual(t!.plannedRoutes!.largestSeconds);
    // The suggestion appears exactly when the difference passes one step, on the fastest trips or
    // for the plan's typical route.
    expect(t!.suggestedStepSeconds === null).toBe(Math.max(t!.largestSeconds, t!.plannedRoutes!.typicalSeconds) <= 60);
  });

  it('is listed, and exports CSV and GeoJSON', async () => {
    const list = (await viewer.agent.get(`/api/plans/${planId}/runs`).expect(200)).body.runs;
    expect(list[0].id).toBe(run.id);
    expect(list[0].result).toBeUndefined();
    const csv = await viewer.agent.get(`/api/plans/${planId}/runs/${run.id}/export/choke-points.csv`).expect(200);
    expect(csv.headers['content-type']).toMatch(/text\/csv/);
    // The caution and the run's identity lead as comment lines, then the table.
    const table = (text: string) => text.trim().split('\r\n').filter((l) => !l.startsWith('# '));
    expect(csv.text.split('\r\n')[0]).toBe(`# caution: ${CAUTION_LINE}`);
    expect(csv.text).toContain(`# run_id: ${run.id}\r\n`);
    expect(table(csv.text)[0]).toMatch(/^rank,segment_id,direction/);
    const curve = await viewer.agent.get(`/api/plans/${planId}/runs/${run.id}/export/curve.csv`).expect(200);
    expect(table(curve.text)).toHaveLength(run.result!.curve.deliveredVehicles.length + 1);
    const geo = await viewer.agent.get(`/api/plans/${planId}/runs/${run.id}/export/arcs.geojson`).buffer(true).parse((res, cb) => {
      let data = '';
      res.on('data', (c: Buffer) => (data += c));
      res.on('end', () => cb(null, JSON.parse(data)));
    }).expect(200);
    // One feature per directed road of the run: as many as the engine problem's roads.
    const { rows } = await ctx.pool.query<{ n: number }>(
      `SELECT (count(capacity_forward) + count(capacity_backward))::int AS n FROM run_road_results WHERE run_id = $1`,
      [run.id],
    );
    expect(rows[0]!.n).toBeGreaterThan(0);
    expect(geo.body.features).toHaveLength(rows[0]!.n);
    expect(geo.body.features[0].geometry.coordinates.length).toBeGreaterThanOrEqual(2);
    expect(geo.body.cutline).toMatchObject({ caution: CAUTION_LINE, run_id: run.id });
  });

  it('reuses the stored result for identical inputs (found by the worker when it prepares the run)', async () => {
    const res = await start({ ...defaultRunParameters, horizonMinutes: 240, timeStepSeconds: 60 }).expect(202);
    expect(res.body.status).toBe('queued');
    const again = await waitForRun(res.body.id);
    expect(again.status).toBe('succeeded');
    expect(again.phase).toContain(run.id);
    expect(again.result).toEqual(run.result);
    // Reused: no input of its own was stored.
    const { rows } = await ctx.pool.query('SELECT count(*)::int AS n FROM run_inputs WHERE run_id = $1', [res.body.id]);
    expect(rows[0].n).toBe(0);
    // The roads' figures come along with the result.
    expect(await arcsOf(again.id)).toEqual(await arcsOf(run.id));
  });
});

describe('refusals', () => {
  it('says the roads hold arrivals down once their capacity is cut to a quarter', async () => {
    const res = await start({ ...defaultRunParameters, horizonMinutes: 240, timeStepSeconds: 60, capacityFactor: 0.25 }).expect(202);
    const slow = await waitForRun(res.body.id);
    expect(slow.status, slow.failureReason ?? '').toBe('succeeded');
    const limits = expectLimitsConsistent(slow.result!);
    expect(limits.parts.roads).toBeGreaterThan(limits.vehicles / 2);
    expect(slow.result!.bottlenecks.some((b) => b.shareOfCut > 0 && b.name.endsWith('Bridge'))).toBe(true);
  });

  it('bad parameters: 400 naming the field, no run written', async () => {
    const before = await countRows(ctx, 'runs');
    const res = await start({ ...defaultRunParameters, timeStepSeconds: 1 }).expect(400);
    expect(res.body.error.fields[0].path).toBe('parameters.timeStepSeconds');
    expect(await countRows(ctx, 'runs')).toBe(before);
  });

  it('viewers cannot start runs', async () => {
    await start(defaultRunParameters, viewer).expect(403);
  });

  it('a problem larger than the budget is refused before it is queued, with a coarser step that fits', async () => {
    const small = await createTestContext({ RUN_MAX_EXPANDED_ARCS: '200000' }, { withRunWorker: true });
    try {
      const p = await signInAs(small.app, 'planner');
      const id = (await p.agent.get('/api/plans').expect(200)).body.plans[0].id;
      const res = await p.agent.post(`/api/plans/${id}/runs`).set('x-csrf-token', p.csrf).send({ parameters: defaultRunParameters }).expect(400);
      const message: string = res.body.error.message;
      expect(message).toMatch(/would need more than [\d,]+ time-expanded arcs/);
      expect(await countRows(small, 'runs')).toBe(0);
      // The offered step is accepted by the same budget.
      const offered = /At a time step of (\d+) minutes it fits/.exec(message);
      expect(offered, message).not.toBeNull();
      expect(message).toContain(`stay within ${offered![1]} minutes of free flow (instead of 1 minute)`);
      const accepted = await p.agent
        .post(`/api/plans/${id}/runs`)
        .set('x-csrf-token', p.csrf)
        .send({ parameters: { ...defaultRunParameters, timeStepSeconds: Number(offered![1]) * 60 } })
        .expect(202);
      // …and by the worker's exact count.
      const until = Date.now() + 60_000;
      let run: RunWithResult;
      do {
        await new Promise((r) => setTimeout(r, 200));
        run = runWithResultSchema.parse((await p.agent.get(`/api/plans/${id}/runs/${accepted.body.id}`).expect(200)).body);
      } while (['queued', 'running'].includes(run.status) && Date.now() < until);
      expect(run.status, run.failureReason ?? '').toBe('succeeded');
    } finally {
      await small.drop();
    }
  });
});

describe('cancelling', () => {
  it('stops a run and keeps it cancelled', async () => {
    // A long horizon at a short step keeps the solver busy long enough to cancel.
    const res = await start({ ...defaultRunParameters, horizonMinutes: 12 * 60, timeStepSeconds: 10, capacityFactor: 0.5 }).expect(202);
    const cancelled = await planner.agent.post(`/api/plans/${planId}/runs/${res.body.id}/cancel`).set('x-csrf-token', planner.csrf).expect(200);
    expect(cancelled.body.status).toBe('cancelled');
    await new Promise((r) => setTimeout(r, 1500));
    const after = await waitForRun(res.body.id);
    expect(after.status).toBe('cancelled');
    expect(after.result).toBeNull();
    await planner.agent.post(`/api/plans/${planId}/runs/${res.body.id}/cancel`).set('x-csrf-token', planner.csrf).expect(409);
  });
});

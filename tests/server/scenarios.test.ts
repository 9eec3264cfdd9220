// Scenarios against the real database and a real queue worker. The demo town's static minimum
// cut is its four bridges (tests/server/runs.test.ts); closing and reversing them must change
// the steady-state flow by exactly the capacities the max-flow/min-cut theorem says.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, signInAs, countRows, type SignedInAgent, type TestContext } from './support/test-app';
import { defaultRunParameters, runWithResultSchema, type ArcFlow, type RunWithResult } from '../../shared/api/runs';

let ctx: TestContext;
let planner: SignedInAgent;
let planId: string;
let base: RunWithResult;
let bridges: ArcFlow[];
let baseArcs: ArcFlow[];
const parameters = { ...defaultRunParameters, horizonMinutes: 120, timeStepSeconds: 120 };

async function run(scenarioId: string | null): Promise<RunWithResult> {
  const started = await planner.agent.post(`/api/plans/${planId}/runs`).set('x-csrf-token', planner.csrf).send({ parameters, scenarioId }).expect(202);
  for (let i = 0; i < 300; i++) {
    const r = runWithResultSchema.parse((await planner.agent.get(`/api/plans/${planId}/runs/${started.body.id}`).expect(200)).body);
    if (r.status === 'succeeded') return r;
    if (r.status !== 'queued' && r.status !== 'running') throw new Error(`run ${r.status}: ${r.failureReason}`);
    await new Promise((res) => setTimeout(res, 200));
  }
  throw new Error('run did not finish');
}

async function scenario(name: string, overlay: object): Promise<string> {
  return (await planner.agent.post(`/api/plans/${planId}/scenarios`).set('x-csrf-token', planner.csrf).send({ name, overlay }).expect(201)).body.id;
}

/** A run's directed roads with their figures, as its arcs export gives them. */
async function arcsOf(runId: string): Promise<ArcFlow[]> {
  const geo = await planner.agent.get(`/api/plans/${planId}/runs/${runId}/export/arcs.geojson`).buffer(true).parse((res, cb) => {
    let data = '';
    res.on('data', (c: Buffer) => (data += c));
    res.on('end', () => cb(null, JSON.parse(data)));
  });
  expect(geo.status).toBe(200);
  return (geo.body.features as { properties: ArcFlow }[]).map((f) => f.properties);
}

const closeAll = (arcs: ArcFlow[]) => ({ closures: arcs.map((a) => ({ segmentId: a.segmentId, fromMinutes: 0, untilMinutes: null })) });

beforeAll(async () => {
  ctx = await createTestContext({}, { withRunWorker: true });
  planner = await signInAs(ctx.app, 'planner');
  planId = (await planner.agent.get('/api/plans').expect(200)).body.plans[0].id;
  base = await run(null);
  baseArcs = await arcsOf(base.id);
  bridges = baseArcs.filter((a) => a.inStaticCut).sort((a, b) => b.capacityVehiclesPerHour - a.capacityVehiclesPerHour);
  expect(bridges).toHaveLength(4);
});
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

describe('closures', () => {
  it('closing one bridge lowers the steady state by exactly its capacity', async () => {
    const smallest = bridges[3]!;
    const r = await run(await scenario('Low bridge closed', closeAll([smallest])));
    expect(r.scenarioId).not.toBeNull();
    expect(r.result!.headline.steadyStateVehiclesPerHour).toBeCloseTo(base.result!.headline.steadyStateVehiclesPerHour - smallest.capacityVehiclesPerHour, 6);
  });

  it('with one crossing left, that bridge is the whole cut, and closing it too stops the flow', async () => {
    const last = bridges[0]!;
    const oneLeft = await run(await scenario('One crossing left', closeAll(bridges.slice(1))));
    expect(oneLeft.result!.headline.steadyStateVehiclesPerHour).toBeCloseTo(last.capacityVehiclesPerHour, 6);
    const cut = oneLeft.result!.bottlenecks.filter((b) => b.inStaticCut);
    expect(cut.map((b) => b.segmentId)).toEqual([last.segmentId]);
    const none = await run(await scenario('No crossing', closeAll(bridges)));
    // The exits all lie east of the river: nothing gets out.
    expect(none.result!.headline.steadyStateVehiclesPerHour).toBe(0);
  });

  it('a bridge closed from minute 60 still carries traffic before then', async () => {
    const closedLater = await run(await scenario('Flooded at minute 60', { closures: bridges.slice(1).map((a) => ({ segmentId: a.segmentId, fromMinutes: 60, untilMinutes: null })) }));
    const closedAlways = await run(await scenario('Closed from the start', closeAll(bridges.slice(1))));
    const at = (r: RunWithResult, minute: number) => r.result!.curve.deliveredVehicles[Math.round(minute / r.result!.curve.stepMinutes)]!;
    expect(at(closedLater, 120)).toBeGreaterThan(at(closedAlways, 120));
  });
});

describe('contraflow', () => {
  it('adds the reversed lanes to the outbound capacity of the corridor', async () => {
    // The bridge where one more lane gains most (the engine's fix ranking of the base run).
    const laneGain = (a: ArcFlow) => base.result!.bottlenecks.find((b) => b.segmentId === a.segmentId && b.direction === a.direction)?.gainPerExtraLaneVehiclesPerHour ?? 0;
    const bridge = [...bridges].sort((a, b) => laneGain(b) - laneGain(a))[0]!;
    const inbound = baseArcs.find((a) => a.segmentId === bridge.segmentId && a.direction !== bridge.direction)!;
    const r = await run(await scenario('Bridge contraflow', { contraflow: [{ name: 'Main bridge', segmentIds: [bridge.segmentId], direction: bridge.direction }] }));
    const out = (await arcsOf(r.id)).find((a) => a.segmentId === bridge.segmentId && a.direction === bridge.direction)!;
    expect(out.capacityVehiclesPerHour).toBeCloseTo(bridge.capacityVehiclesPerHour + inbound.capacityVehiclesPerHour, 6);
    const gain = r.result!.headline.steadyStateVehiclesPerHour - base.result!.headline.steadyStateVehiclesPerHour;
    // Reversing at least one lane gains at least what one more lane gains (flow is monotone in
    // capacity), and never more than the capacity reversed.
    expect(gain).toBeGreaterThanOrEqual(laneGain(bridge) - 1e-6);
    expect(gain).toBeLessThanOrEqual(inbound.capacityVehiclesPerHour + 1e-6);
  });
});

describe('staggered departures and shelters', () => {
  it('delaying every zone by 30 minutes delays the first arrivals', async () => {
    const zones = (await planner.agent.get(`/api/plans/${planId}/zones`).expect(200)).body.zones as { id: number }[];
    const r = await run(await scenario('Staggered', { departureDelays: zones.map((z) => ({ zoneId: z.id, delayMinutes: 30 })) }));
    const at30 = Math.round(30 / r.result!.curve.stepMinutes);
    expect(r.result!.curve.deliveredVehicles[at30 - 1]).toBe(0);
    expect(base.result!.curve.deliveredVehicles[at30]).toBeGreaterThan(0);
  });

  it('refuses a scenario naming a segment or shelter the plan does not have, and the base data never changes', async () => {
    const before = await Promise.all(['road_segments', 'shelters', 'zones'].map((t) => countRows(ctx, t)));
    const bad = await scenario('Bad', { closures: [{ segmentId: 987654321, fromMinutes: 0, untilMinutes: null }] });
    const res = await planner.agent.post(`/api/plans/${planId}/runs`).set('x-csrf-token', planner.csrf).send({ parameters, scenarioId: bad }).expect(400);
    expect(res.body.error.message).toMatch(/segment 987654321/);
    const noShelter = await scenario('No such shelter', { removedShelterIds: [987654] });
    await planner.agent.post(`/api/plans/${planId}/runs`).set('x-csrf-token', planner.csrf).send({ parameters, scenarioId: noShelter }).expect(400);
    expect(await Promise.all(['road_segments', 'shelters', 'zones'].map((t) => countRows(ctx, t)))).toEqual(before);
  });

  it('validates the overlay at the edge', async () => {
    const res = await planner.agent
      .post(`/api/plans/${planId}/scenarios`)
      .set('x-csrf-token', planner.csrf)
      .send({ name: 'x', overlay: { closures: [{ segmentId: 1, fromMinutes: 60, untilMinutes: 30 }] } })
      .expect(400);
    expect(res.body.error.fields[0].path).toBe('overlay.closures.0.untilMinutes');
  });
});

// Zones, shelters, attachments, the capacity table and map settings against the real database.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, signIn, signInAs, countRows, otherAccounts, type SignedInAgent, type TestContext } from './support/test-app';
import { defaultCapacityTable } from '../../shared/model/capacity-defaults';
import { imported, importRefused } from './support/import-jobs';

let ctx: TestContext;
let planner: SignedInAgent;
let viewer: SignedInAgent;
let admin: SignedInAgent;
let demoPlanId: string;

const square = (lon: number, lat: number, d: number) => ({
  type: 'Polygon',
  coordinates: [[[lon, lat], [lon + d, lat], [lon + d, lat + d], [lon, lat + d], [lon, lat]]],
});

beforeAll(async () => {
  ctx = await createTestContext({}, { withRunWorker: true });
  planner = await signInAs(ctx.app, 'planner');
  viewer = await signInAs(ctx.app, 'viewer');
  admin = await signInAs(ctx.app, 'admin');
  demoPlanId = (await viewer.agent.get('/api/plans').expect(200)).body.plans[0].id;
});
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

describe('the seeded demo plan', () => {
  it('says that its zone values are illustrative', async () => {
    const plan = (await viewer.agent.get('/api/plans').expect(200)).body.plans.find((p: { id: string }) => p.id === demoPlanId);
    expect(plan.description).toMatch(/illustrative values .* not data about any real place/);
  });

  it('has its zones and shelters, each attached to the roads', async () => {
    const zones = (await viewer.agent.get(`/api/plans/${demoPlanId}/zones`).expect(200)).body.zones;
    const shelters = (await viewer.agent.get(`/api/plans/${demoPlanId}/shelters`).expect(200)).body.shelters;
    expect(zones.length).toBeGreaterThanOrEqual(4);
    expect(shelters.length).toBeGreaterThanOrEqual(3);
    const attachments = (await viewer.agent.get(`/api/plans/${demoPlanId}/attachments`).expect(200)).body;
    expect(attachments.zones.every((z: { nodes: unknown[]; problem: null }) => z.nodes.length > 0 && z.problem === null)).toBe(true);
    expect(attachments.shelters.every((s: { node: unknown }) => s.node !== null)).toBe(true);
  });
});

describe('zones', () => {
  it('creates, edits and deletes a zone drawn on the map', async () => {
    const zone = (
      await planner.agent
        .post(`/api/plans/${demoPlanId}/zones`)
        .set('x-csrf-token', planner.csrf)
        .send({ name: 'Drawn', population: 1200, participationRate: 0.9, personsPerVehicle: 2.2, departureCurve: { kind: 'uniform', durationHours: 2 }, geometry: square(0, 0, 0.01) })
        .expect(201)
    ).body;
    expect(zone).toMatchObject({ name: 'Drawn', population: 1200 });
    const edited = await planner.agent.patch(`/api/plans/${demoPlanId}/zones/${zone.id}`).set('x-csrf-token', planner.csrf).send({ population: 1500 }).expect(200);
    expect(edited.body.population).toBe(1500);
    // Far from every road: the attachment view says so instead of failing.
    const attachments = (await viewer.agent.get(`/api/plans/${demoPlanId}/attachments`).expect(200)).body;
    expect(attachments.zones.find((z: { zoneId: number }) => z.zoneId === zone.id).problem).toMatch(/no road node/);
    await planner.agent.delete(`/api/plans/${demoPlanId}/zones/${zone.id}`).set('x-csrf-token', planner.csrf).expect(204);
  });

  it('refuses an open ring and writes nothing', async () => {
    const before = await countRows(ctx, 'zones');
    const open = { type: 'Polygon', coordinates: [[[0, 0], [1, 0], [1, 1], [0, 1]]] };
    const res = await planner.agent
      .post(`/api/plans/${demoPlanId}/zones`)
      .set('x-csrf-token', planner.csrf)
      .send({ name: 'Bad', population: 1, participationRate: 1, personsPerVehicle: 2, departureCurve: { kind: 'allAtOnce' }, geometry: open })
      .expect(400);
    expect(res.body.error.fields[0].path).toMatch(/^geometry/);
    expect(await countRows(ctx, 'zones')).toBe(before);
  });

  it('imports zones from GeoJSON, all or nothing', async () => {
    const before = await countRows(ctx, 'zones');
    const bad = { type: 'FeatureCollection', features: [{ type: 'Feature', properties: { name: 'A', population: 10 }, geometry: square(1, 1, 0.01) }, { type: 'Feature', properties: { name: 'B' }, geometry: square(2, 2, 0.01) }] };
    const refused = await importRefused(planner, demoPlanId, 'zones', JSON.stringify(bad), 'zones.geojson');
    expect(refused.badFeatures.map((f) => f.index)).toEqual([1]);
    expect(await countRows(ctx, 'zones')).toBe(before);
    const good = { type: 'FeatureCollection', features: [bad.features[0]] };
    const ok = await imported(planner, demoPlanId, 'zones', JSON.stringify(good), 'zones.geojson');
    expect(ok.outcome).toMatchObject({ created: 1 });
    expect((ok.outcome!['defaulted'] as string[][])[0]).toContain('participationRate');
    expect(await countRows(ctx, 'zones')).toBe(before + 1);
    const zone = (await ctx.pool.query("SELECT id FROM zones WHERE plan_id = $1 AND name = 'A'", [demoPlanId])).rows[0];
    await planner.agent.delete(`/api/plans/${demoPlanId}/zones/${zone.id}`).set('x-csrf-token', planner.csrf).expect(204);
  });

  it('is read-only for viewers', async () => {
    const zones = (await viewer.agent.get(`/api/plans/${demoPlanId}/zones`).expect(200)).body.zones;
    await viewer.agent.patch(`/api/plans/${demoPlanId}/zones/${zones[0].id}`).set('x-csrf-token', viewer.csrf).send({ population: 1 }).expect(403);
  });
});

describe('shelters', () => {
  it('creates an exit without capacity and refuses a negative capacity', async () => {
    const exit = await planner.agent.post(`/api/plans/${demoPlanId}/shelters`).set('x-csrf-token', planner.csrf).send({ name: 'Edge', capacityPersons: null, lon: 0, lat: 0 }).expect(201);
    expect(exit.body.capacityPersons).toBeNull();
    const res = await planner.agent.post(`/api/plans/${demoPlanId}/shelters`).set('x-csrf-token', planner.csrf).send({ name: 'X', capacityPersons: -5, lon: 0, lat: 0 }).expect(400);
    expect(res.body.error.fields[0].path).toBe('capacityPersons');
    await planner.agent.delete(`/api/plans/${demoPlanId}/shelters/${exit.body.id}`).set('x-csrf-token', planner.csrf).expect(204);
  });
});

describe('capacity table', () => {
  it('starts from the published defaults and takes a planner edit', async () => {
    const table = (await viewer.agent.get(`/api/plans/${demoPlanId}/capacity-table`).expect(200)).body;
    expect(table).toEqual(defaultCapacityTable());
    const edited = { ...table, capacityFactor: 0.86, capacityFactorNote: 'heavy rain (HCM 7th ed. Exhibit 11-20)' };
    await planner.agent.put(`/api/plans/${demoPlanId}/capacity-table`).set('x-csrf-token', planner.csrf).send(edited).expect(200);
    expect((await viewer.agent.get(`/api/plans/${demoPlanId}/capacity-table`)).body.capacityFactor).toBe(0.86);
    const missingRow = { ...edited, rows: edited.rows.slice(1) };
    await planner.agent.put(`/api/plans/${demoPlanId}/capacity-table`).set('x-csrf-token', planner.csrf).send(missingRow).expect(400);
  });
});

describe('map settings', () => {
  it('has no basemap by default, and only administrators set one', async () => {
    expect((await viewer.agent.get('/api/settings/map').expect(200)).body).toEqual({ tileUrl: '', attribution: '' });
    const tiles = { tileUrl: 'https://tiles.cutline.example/{z}/{x}/{y}.png', attribution: 'Test tiles' };
    await planner.agent.put('/api/settings/map').set('x-csrf-token', planner.csrf).send(tiles).expect(403);
    await admin.agent.put('/api/settings/map').set('x-csrf-token', admin.csrf).send({ tileUrl: 'ftp://x', attribution: '' }).expect(400);
    await admin.agent.put('/api/settings/map').set('x-csrf-token', admin.csrf).send(tiles).expect(200);
    const res = await viewer.agent.get('/api/settings/map').expect(200);
    expect(res.body).toEqual(tiles);
    // The Content-Security-Policy now lets map tiles come from that server.
    expect(res.headers['content-security-policy']).toContain('https://tiles.cutline.example');
  });

  it('belongs to one organization: another one neither sees it nor can change it', async () => {
    const otherAdmin = await signIn(ctx.app, otherAccounts[0]!.email, otherAccounts[0]!.password);
    expect((await otherAdmin.agent.get('/api/settings/map').expect(200)).body).toEqual({ tileUrl: '', attribution: '' });
    const theirs = { tileUrl: 'https://maps.other.example/{z}/{x}/{y}.png', attribution: 'Other County tiles' };
    await otherAdmin.agent.put('/api/settings/map').set('x-csrf-token', otherAdmin.csrf).send(theirs).expect(200);
    expect((await viewer.agent.get('/api/settings/map').expect(200)).body.attribution).toBe('Test tiles');
    // One policy for every page (it is written before the session is read): both origins.
    const csp = (await viewer.agent.get('/api/settings/map')).headers['content-security-policy'];
    expect(csp).toContain('https://tiles.cutline.example');
    expect(csp).toContain('https://maps.other.example');
  });
});

// The field-mapping step's answer reaches the import job: zones and shelters from a county's
// CSV tables with its own column names (and a state-plane CRS) are imported as jobs with the
// planner's columns; the same files without the mapping are refused, nothing written.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { importSchema, type Import } from '../../shared/api/imports';
import { createTestContext, countRows, signInAs, type SignedInAgent, type TestContext } from './support/test-app';

let ctx: TestContext;
let planner: SignedInAgent;
let planId: string;

function upload(kind: string, text: string, fileName: string, options?: unknown) {
  const req = planner.agent.post(`/api/plans/${planId}/imports/${kind}`).set('x-csrf-token', planner.csrf);
  if (options !== undefined) req.field('options', JSON.stringify(options));
  return req.attach('file', Buffer.from(text), fileName);
}

async function finished(id: string): Promise<Import> {
  const end = Date.now() + 150_000;
  for (;;) {
    const i = importSchema.parse((await planner.agent.get(`/api/plans/${planId}/imports/${id}`).expect(200)).body);
    if (!['queued', 'running'].includes(i.status)) return i;
    if (Date.now() > end) throw new Error(`import ${id} did not finish`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

beforeAll(async () => {
  ctx = await createTestContext({}, { withRunWorker: true });
  planner = await signInAs(ctx.app, 'planner');
  planId = (await planner.agent.post('/api/plans').set('x-csrf-token', planner.csrf).send({ name: 'Mapped imports' }).expect(201)).body.id;
});
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

// Invented places; positions in EPSG:2227 (California zone III, US survey feet) near 37.80 N, 122.27 W.
const sheltersCsv = 'SITE_NAME,X_COORD,Y_COORD,MAX_OCC\nArmory Hall,6050000,2115000,240\nNorth School,6051500,2116200,180\n';
const zonesCsv = 'TRACT_ID,lon,lat,POP_TOTAL,EVAC_PCT\nWard A,-122.300,37.807,1200,80\nWard B,-122.296,37.809,640,\n';

describe('import jobs with the field mapping', () => {
  it('shelters: the capacity column and the CRS the planner named', async () => {
    const options = { source: { crs: 'EPSG:2227', xColumn: 'X_COORD', yColumn: 'Y_COORD' }, fields: { name: 'SITE_NAME', capacityPersons: 'MAX_OCC' } };
    const done = await finished((await upload('shelters', sheltersCsv, 'shelters.csv', options).expect(202)).body.id);
    expect(done.status, JSON.stringify(done.failure)).toBe('succeeded');
    const list = (await planner.agent.get(`/api/plans/${planId}/shelters`).expect(200)).body.shelters;
    expect(list.map((s: { name: string; capacityPersons: number }) => [s.name, s.capacityPersons])).toEqual([['Armory Hall', 240], ['North School', 180]]);
  }, 180_000);

  it('zones: population and participation from the county columns', async () => {
    const options = { fields: { name: 'TRACT_ID', population: 'POP_TOTAL', participationRate: 'EVAC_PCT' } };
    const done = await finished((await upload('zones', zonesCsv, 'zones.csv', options).expect(202)).body.id);
    expect(done.status, JSON.stringify(done.failure)).toBe('succeeded');
    const list = (await planner.agent.get(`/api/plans/${planId}/zones`).expect(200)).body.zones;
    expect(list.map((z: { name: string; population: number }) => [z.name, z.population])).toEqual([['Ward A', 1200], ['Ward B', 640]]);
    expect(list[0].participationRate).toBe(0.8);
  }, 180_000);

  it('without the mapping the same table is refused and nothing is written', async () => {
    const before = await countRows(ctx, 'zones');
    const done = await finished((await upload('zones', zonesCsv, 'zones.csv').expect(202)).body.id);
    expect(done.status).toBe('failed');
    expect(done.failure?.code).toBe('badFeatures');
    expect(await countRows(ctx, 'zones')).toBe(before);
  }, 180_000);

  it('refuses a hostile options field at the edge, storing nothing', async () => {
    const before = await countRows(ctx, 'imports');
    await upload('zones', zonesCsv, 'zones.csv', { fields: { population: 'x'.repeat(5000) } }).expect(400);
    await upload('shelters', sheltersCsv, 'shelters.csv', { source: { crs: 42 } }).expect(400);
    expect(await countRows(ctx, 'imports')).toBe(before);
  }, 60_000);
});

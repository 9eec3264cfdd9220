// Road-layer import (through the import job), storage, map and table queries and edits, against the real PostgreSQL
// with PostGIS. Small GeoJSON files are made here; real-world files are checked in
// road-layer-files.test.ts.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, signInAs, countRows, type SignedInAgent, type TestContext } from './support/test-app';
import { importedRoadLayer, importRefused, postImport } from './support/import-jobs';

let ctx: TestContext;
let planner: SignedInAgent;
let viewer: SignedInAgent;
let planId: string;

const road = (coordinates: [number, number][], properties: Record<string, unknown>) => ({
  type: 'Feature',
  properties,
  geometry: { type: 'LineString', coordinates },
});

// GIS-style data: two roads crossing without a shared vertex, and a bridge over one of them.
const crossing = {
  type: 'FeatureCollection',
  features: [
    road([[10.0, 50.0], [10.01, 50.0]], { highway: 'primary', name: 'East Road' }),
    road([[10.005, 49.995], [10.005, 50.005]], { highway: 'residential', name: 'North Lane' }),
    road([[10.008, 49.995], [10.008, 50.005]], { highway: 'secondary', bridge: 'yes', layer: '1', name: 'High Bridge' }),
  ],
};

const bytesOf = (body: unknown) => Buffer.from(typeof body === 'string' ? body : JSON.stringify(body));
const upload = (agent: SignedInAgent, body: unknown, fileName = 'roads.geojson') => postImport(agent, planId, 'road-layer', bytesOf(body), fileName);
const layerOf = (body: unknown, fileName = 'roads.geojson') => importedRoadLayer(planner, planId, bytesOf(body), fileName);
const refusal = (body: unknown, fileName = 'roads.geojson') => importRefused(planner, planId, 'road-layer', bytesOf(body), fileName);

const tables = ['road_layers', 'road_nodes', 'road_segments'];
async function counts() {
  const audit = await ctx.pool.query("SELECT count(*)::int AS n FROM audit_events WHERE action NOT LIKE 'import.%'");
  return [...(await Promise.all(tables.map((t) => countRows(ctx, t)))), audit.rows[0].n];
}

beforeAll(async () => {
  ctx = await createTestContext({}, { withRunWorker: true });
  planner = await signInAs(ctx.app, 'planner');
  viewer = await signInAs(ctx.app, 'viewer');
  planId = (await planner.agent.post('/api/plans').set('x-csrf-token', planner.csrf).send({ name: 'Roads' }).expect(201)).body.id;
});
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

describe('uploading a road layer', () => {
  it('splits GIS roads where they cross on one layer, not under a bridge, and stores the result', async () => {
    const layer = await layerOf(crossing);
    // East Road is cut at North Lane (joined) but passes under High Bridge (different layer):
    // East Road → 2 segments, North Lane → 2, High Bridge → 1.
    expect(layer.segmentCount).toBe(5);
    expect(layer.report.crossingsJoined).toBe(1);
    expect(layer.report.crossingsOnDifferentLayers).toBe(1);
    expect(layer.bbox[0]).toBeCloseTo(10.0, 6);
    expect(layer.bbox[3]).toBeCloseTo(50.005, 6);
    const stored = await ctx.pool.query('SELECT count(*)::int AS n FROM road_segments WHERE layer_id = $1', [layer.id]);
    expect(stored.rows[0].n).toBe(5);

    const active = await viewer.agent.get(`/api/plans/${planId}/road-layer`).expect(200);
    expect(active.body.layer.id).toBe(layer.id);
    const plan = await viewer.agent.get(`/api/plans/${planId}`).expect(200);
    expect(plan.body.name).toBe('Roads');
  });

  it('shows a new layer at once, though the layer summary is kept ready per data version', async () => {
    const summaryOf = async () => (await viewer.agent.get(`/api/plans/${planId}/road-layer`).expect(200)).body.layer as { id: number; segmentCount: number };
    const before = await summaryOf();
    expect(await summaryOf()).toEqual(before);
    const replacement = { type: 'FeatureCollection', features: crossing.features.slice(0, 2) };
    const layer = await layerOf(replacement, 'two-roads.geojson');
    expect(layer.id).not.toBe(before.id);
    expect(await summaryOf()).toMatchObject({ id: layer.id, segmentCount: 4 });
    // Back to the three roads the tests below expect.
    expect((await layerOf(crossing)).segmentCount).toBe(5);
  });

  it('refuses a broken file, names each bad feature and saves nothing', async () => {
    const before = await counts();
    const broken = {
      type: 'FeatureCollection',
      features: [
        road([[10, 50], [10.01, 50]], { highway: 'primary' }),
        { type: 'Feature', properties: { highway: 'primary' }, geometry: { type: 'LineString', coordinates: [[10, 50], ['x', 50]] } },
        road([[10, 50], [200, 50]], { highway: 'residential' }),
      ],
    };
    const failure = await refusal(broken);
    expect(failure.code).toBe('badFeatures');
    expect(failure.badFeatures.map((f) => f.index)).toEqual([1, 2]);
    expect(await counts()).toEqual(before);
  });

  it('refuses a file that is not JSON with a plain message', async () => {
    const before = await counts();
    const failure = await refusal('{"type": "FeatureCollection", "features": [');
    expect(failure.code).toBe('unreadableFile');
    expect(failure.message.length).toBeGreaterThan(10);
    expect(await counts()).toEqual(before);
  });

  it('refuses a coordinate reference system it does not know (known ones are reprojected: tests/shared/gis)', async () => {
    const failure = await refusal({ ...crossing, crs: { type: 'name', properties: { name: 'urn:ogc:def:crs:EPSG::999999' } } });
    expect(failure.code).toBe('wrongCrs');
    expect(failure.message).toMatch(/EPSG:999999 is not a coordinate system this server knows/);
  });

  it('asks for the file when none is attached', async () => {
    const res = await planner.agent.post(`/api/plans/${planId}/imports/road-layer`).set('x-csrf-token', planner.csrf).field('name', 'x').expect(400);
    expect(res.body.error.fields[0].path).toBe('file');
  });

  it('does not let a viewer upload', async () => {
    const before = await counts();
    const imports = await countRows(ctx, 'imports');
    await upload(viewer, crossing).expect(403);
    expect(await counts()).toEqual(before);
    expect(await countRows(ctx, 'imports')).toBe(imports);
  });
});

describe('reading segments', () => {
  it('pages, sorts and filters the segment table', async () => {
    const page = await viewer.agent.get(`/api/plans/${planId}/segments`).query({ pageSize: 2, sortBy: 'lengthMeters', sortOrder: 'desc' }).expect(200);
    expect(page.body.total).toBe(5);
    expect(page.body.items).toHaveLength(2);
    expect(page.body.items[0].lengthMeters).toBeGreaterThanOrEqual(page.body.items[1].lengthMeters);
    const bridges = await viewer.agent.get(`/api/plans/${planId}/segments`).query({ bridge: 'true' }).expect(200);
    expect(bridges.body.items.map((s: { name: string }) => s.name)).toEqual(['High Bridge']);
    const named = await viewer.agent.get(`/api/plans/${planId}/segments`).query({ name: 'lane' }).expect(200);
    expect(named.body.total).toBe(2);
  });
});

describe('editing segments', () => {
  async function firstSegment(name: string) {
    const res = await viewer.agent.get(`/api/plans/${planId}/segments`).query({ name }).expect(200);
    return res.body.items[0];
  }

  it('changes one segment without re-importing, and moves the data version on', async () => {
    const segment = await firstSegment('High Bridge');
    const layersBefore = await countRows(ctx, 'road_layers');
    const res = await planner.agent
      .patch(`/api/plans/${planId}/segments/${segment.id}`)
      .set('x-csrf-token', planner.csrf)
      .send({ lanesForward: 2, closed: true })
      .expect(200);
    expect(res.body).toMatchObject({ id: segment.id, lanesForward: 2, closed: true });
    expect(await countRows(ctx, 'road_layers')).toBe(layersBefore);
    const { rows } = await ctx.pool.query('SELECT data_version FROM plans WHERE id = $1', [planId]);
    expect(rows[0].data_version).toBeGreaterThan(0);
  });

  it('shows an edit in the road table at once, though each page is kept ready per data version', async () => {
    const pageOf = async () => (await viewer.agent.get(`/api/plans/${planId}/segments`).query({ name: 'North Lane' }).expect(200)).body as { items: { id: number; lanesForward: number }[] };
    const before = await pageOf();
    expect(await pageOf()).toEqual(before);
    const segment = before.items[0]!;
    const changed = segment.lanesForward === 3 ? 2 : 3;
    await planner.agent.patch(`/api/plans/${planId}/segments/${segment.id}`).set('x-csrf-token', planner.csrf).send({ lanesForward: changed }).expect(200);
    expect((await pageOf()).items.find((i) => i.id === segment.id)!.lanesForward).toBe(changed);
  });

  it('sends a page of the road table gzip-compressed when asked, plain otherwise, and answers a matching ETag with 304', async () => {
    const path = `/api/plans/${planId}/segments?page=1&pageSize=500`;
    const plain = await viewer.agent.get(path).set('accept-encoding', 'identity').expect(200);
    expect(plain.headers['content-encoding']).toBeUndefined();
    const raw = await viewer.agent
      .get(path)
      .set('accept-encoding', 'gzip, deflate, br')
      .buffer(true)
      .parse((res, cb) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => cb(null, Buffer.concat(chunks)));
      })
      .expect(200);
    expect(raw.headers['content-encoding']).toBe('gzip');
    expect(raw.headers.vary).toMatch(/accept-encoding/i);
    // superagent inflates gzip itself; the body it hands over is the plain answer.
    expect(JSON.parse((raw.body as Buffer).toString('utf8'))).toEqual(plain.body);
    expect(raw.headers.etag).not.toBe(plain.headers.etag);
    await viewer.agent.get(path).set('accept-encoding', 'identity').set('if-none-match', plain.headers.etag!).expect(304);
  });

  it('refuses an edit that breaks the one-way rule and changes nothing', async () => {
    const segment = await firstSegment('East Road');
    const res = await planner.agent
      .patch(`/api/plans/${planId}/segments/${segment.id}`)
      .set('x-csrf-token', planner.csrf)
      .send({ oneway: true, lanesBackward: 2 })
      .expect(400);
    expect(res.body.error.fields[0].path).toBe('lanesBackward');
    expect(await firstSegment('East Road')).toEqual(segment);
  });

  it('bulk-edits a selection, all or nothing', async () => {
    const page = await viewer.agent.get(`/api/plans/${planId}/segments`).query({ name: 'Road' }).expect(200);
    const ids = page.body.items.map((s: { id: number }) => s.id);
    await planner.agent.patch(`/api/plans/${planId}/segments`).set('x-csrf-token', planner.csrf).send({ ids: [...ids, 999999], patch: { speedKmh: 30 } }).expect(404);
    const unchanged = await viewer.agent.get(`/api/plans/${planId}/segments`).query({ name: 'Road' }).expect(200);
    expect(unchanged.body.items.every((s: { speedKmh: number | null }) => s.speedKmh !== 30)).toBe(true);
    const res = await planner.agent.patch(`/api/plans/${planId}/segments`).set('x-csrf-token', planner.csrf).send({ ids, patch: { speedKmh: 30 } }).expect(200);
    expect(res.body.updated).toBe(ids.length);
  });

  it("hides another organization's segments", async () => {
    const segment = await firstSegment('East Road');
    const { signIn, otherAccounts } = await import('./support/test-app');
    const other = await signIn(ctx.app, otherAccounts[1]!.email, otherAccounts[1]!.password);
    await other.agent.get(`/api/plans/${planId}/segments/${segment.id}`).expect(404);
    await other.agent.patch(`/api/plans/${planId}/segments/${segment.id}`).set('x-csrf-token', other.csrf).send({ closed: true }).expect(404);
    await other.agent.get(`/api/plans/${planId}/segments`).expect(404);
  });
});

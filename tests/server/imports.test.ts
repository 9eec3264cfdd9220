// Imports as queued jobs on the real database: the upload answers 202 with the queued import,
// a worker (in-process here, taking the pg-boss queue) reads the file in a worker thread and
// saves it, reporting phase and progress; a cancel stops it with nothing written; a file the
// reader refuses fails in the job with the reader's reason; several imports queue.
import type pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { importSchema, type Import } from '../../shared/api/imports';
import { createTestContext, countRows, signInAs, type SignedInAgent, type TestContext } from './support/test-app';

let ctx: TestContext;
let planner: SignedInAgent;
let planId: string;

const road = (coordinates: [number, number][], properties: Record<string, unknown>) => ({ type: 'Feature', properties, geometry: { type: 'LineString', coordinates } });
// Invented: three roads, two of them crossing.
const roads = {
  type: 'FeatureCollection',
  features: [
    road([[10.0, 50.0], [10.01, 50.0]], { highway: 'primary', name: 'East Road' }),
    road([[10.005, 49.995], [10.005, 50.005]], { highway: 'residential', name: 'North Lane' }),
    road([[10.008, 49.995], [10.008, 50.005]], { highway: 'secondary', name: 'Quarry Street' }),
  ],
};

function upload(kind: string, bytes: Buffer | string, fileName: string) {
  return planner.agent
    .post(`/api/plans/${planId}/imports/${kind}`)
    .set('x-csrf-token', planner.csrf)
    .attach('file', Buffer.isBuffer(bytes) ? bytes : Buffer.from(bytes), fileName);
}

async function getImport(id: string, plan = planId): Promise<Import> {
  return importSchema.parse((await planner.agent.get(`/api/plans/${plan}/imports/${id}`).expect(200)).body);
}

async function until<T>(what: string, probe: () => Promise<T | undefined>, timeoutMs = 150_000): Promise<T> {
  const end = Date.now() + timeoutMs;
  for (;;) {
    const v = await probe();
    if (v !== undefined) return v;
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

const finished = (id: string, plan = planId) => until(`import ${id} to finish`, async () => {
  const i = await getImport(id, plan);
  return ['queued', 'running'].includes(i.status) ? undefined : i;
});

const storedBytes = async (importId: string): Promise<number> =>
  Number((await ctx.pool.query('SELECT coalesce(sum(octet_length(bytes)), 0) AS n FROM import_chunks WHERE import_id = $1', [importId])).rows[0].n);

/** Holds every writer of road layers until released: the import waits inside its save. */
async function holdRoadLayers(): Promise<pg.PoolClient> {
  const client = await ctx.pool.connect();
  await client.query('BEGIN');
  await client.query('LOCK TABLE road_layers IN EXCLUSIVE MODE');
  return client;
}

beforeAll(async () => {
  ctx = await createTestContext({}, { withRunWorker: true });
  planner = await signInAs(ctx.app, 'planner');
  planId = (await planner.agent.post('/api/plans').set('x-csrf-token', planner.csrf).send({ name: 'Imports' }).expect(201)).body.id;
});
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

describe('a road layer import', () => {
  it('is queued at once, reports its phase and progress from the worker, and saves the layer', async () => {
    const res = await upload('road-layer', JSON.stringify(roads), 'roads.geojson').expect(202);
    expect(res.body.status).toBe('queued');
    // The bytes wait in PostgreSQL for any worker.
    expect(await storedBytes(res.body.id)).toBeGreaterThan(0);
    const done = await finished(res.body.id);
    expect(done.status, JSON.stringify(done.failure)).toBe('succeeded');
    expect(done.progress).toBe(1);
    // The two north–south roads cross East Road without a shared vertex: it is split twice (3 + 2 + 2).
    expect(done.outcome).toMatchObject({ segments: 7 });
    const layer = (await planner.agent.get(`/api/plans/${planId}/road-layer`).expect(200)).body.layer;
    expect(layer.id).toBe(done.outcome!.layerId);
    // Finished: the upload's bytes are gone.
    expect(await storedBytes(res.body.id)).toBe(0);
  }, 180_000);

  it('shows the saving phase with a share between reading and done while it saves', async () => {
    const held = await holdRoadLayers();
    try {
      const { id } = (await upload('road-layer', JSON.stringify(roads), 'again.geojson').expect(202)).body;
      const saving = await until('the save to start', async () => {
        const i = await getImport(id);
        return i.phase === 'saving' ? i : undefined;
      });
      expect(saving.status).toBe('running');
      expect(saving.progress).toBeGreaterThan(0);
      expect(saving.progress).toBeLessThan(1);
      await held.query('COMMIT');
      expect((await finished(id)).status).toBe('succeeded');
    } finally {
      await held.query('ROLLBACK').catch(() => undefined);
      held.release();
    }
  }, 180_000);

  it('a cancel while it saves stops it and writes nothing', async () => {
    const before = await Promise.all(['road_layers', 'road_segments', 'road_nodes'].map((t) => countRows(ctx, t)));
    const version = async () => (await ctx.pool.query('SELECT data_version FROM plans WHERE id = $1', [planId])).rows[0].data_version;
    const versionBefore = await version();
    const held = await holdRoadLayers();
    let id = '';
    try {
      id = (await upload('road-layer', JSON.stringify(roads), 'cancelled.geojson').expect(202)).body.id;
      await until('the save to start', async () => ((await getImport(id)).phase === 'saving' ? true : undefined));
      const cancelled = await planner.agent.post(`/api/plans/${planId}/imports/${id}/cancel`).set('x-csrf-token', planner.csrf).expect(200);
      expect(cancelled.body.status).toBe('cancelled');
      await held.query('COMMIT');
    } finally {
      await held.query('ROLLBACK').catch(() => undefined);
      held.release();
    }
    // The save went on behind the lock; its last step saw the cancel and rolled it all back.
    await new Promise((r) => setTimeout(r, 2000));
    expect((await getImport(id)).status).toBe('cancelled');
    expect(await Promise.all(['road_layers', 'road_segments', 'road_nodes'].map((t) => countRows(ctx, t)))).toEqual(before);
    expect(await version()).toBe(versionBefore);
    await planner.agent.post(`/api/plans/${planId}/imports/${id}/cancel`).set('x-csrf-token', planner.csrf).expect(409);
  }, 180_000);

  it('a file the reader refuses fails in the job with the reason, and writes nothing', async () => {
    const before = await countRows(ctx, 'road_layers');
    const { id } = (await upload('road-layer', '{"type": "FeatureCollection", "features": [', 'broken.geojson').expect(202)).body;
    const done = await finished(id);
    expect(done.status).toBe('failed');
    expect(done.failure!.code).toBe('unreadableFile');
    expect(done.failure!.message.length).toBeGreaterThan(10);
    expect(await countRows(ctx, 'road_layers')).toBe(before);
  }, 180_000);
});

describe('the upload request', () => {
  // A road file of several pieces: the bytes are stored as they arrive, one row per piece, and
  // read back whole and in order by the worker (the layer it saves is the file's).
  it('stores a file of several pieces in order, takes fields sent after the file, and reads it back whole', async () => {
    const many = {
      type: 'FeatureCollection',
      features: Array.from({ length: 12_000 }, (_, i) => road([[10 + i * 1e-4, 50.1], [10 + (i + 1) * 1e-4, 50.1]], { highway: 'residential', name: `Lane ${i} ${'·'.repeat(80)}` })),
    };
    const text = JSON.stringify(many);
    expect(text.length).toBeGreaterThan(2.5 * 1024 * 1024);
    const plan = (await planner.agent.post('/api/plans').set('x-csrf-token', planner.csrf).send({ name: 'Pieces' }).expect(201)).body.id;
    // The file first, then the name: the name is read after the bytes are stored.
    const res = await planner.agent
      .post(`/api/plans/${plan}/imports/road-layer`)
      .set('x-csrf-token', planner.csrf)
      .attach('file', Buffer.from(text), 'long-street.geojson')
      .field('name', 'Long Street')
      .expect(202);
    expect(res.body.sizeBytes).toBe(Buffer.byteLength(text));
    const pieces = await ctx.pool.query('SELECT seq, octet_length(bytes) AS n FROM import_chunks WHERE import_id = $1 ORDER BY seq', [res.body.id]);
    if (pieces.rows.length > 0) {
      // (Unless the worker was quicker and has read and dropped them already.)
      expect(pieces.rows.map((r) => r.seq)).toEqual(pieces.rows.map((_, i) => i));
      expect(pieces.rows.length).toBeGreaterThanOrEqual(3);
    }
    const done = await finished(res.body.id, plan);
    expect(done.status, JSON.stringify(done.failure)).toBe('succeeded');
    expect(done.outcome).toMatchObject({ segments: 12_000 });
    const layer = (await planner.agent.get(`/api/plans/${plan}/road-layer`).expect(200)).body.layer;
    expect(layer.name).toBe('Long Street');
    expect(await storedBytes(res.body.id)).toBe(0);
  }, 180_000);

  it('refused on the way (too large, a field it does not take, bad options after the file): a clear 4xx and no import, piece or audit row', async () => {
    const small = await createTestContext({ UPLOAD_MAX_MEGABYTES: '1' });
    try {
      const member = await signInAs(small.app, 'planner');
      const plan = (await member.agent.post('/api/plans').set('x-csrf-token', member.csrf).send({ name: 'Refusals' }).expect(201)).body.id;
      const rows = async () => Promise.all(['imports', 'import_chunks', 'audit_events'].map((t) => countRows(small, t)));
      const before = await rows();
      const post = () => member.agent.post(`/api/plans/${plan}/imports/road-layer`).set('x-csrf-token', member.csrf);
      const big = Buffer.from(JSON.stringify({ type: 'FeatureCollection', features: [], pad: 'x'.repeat(3 * 1024 * 1024) }));
      const tooLarge = await post().attach('file', big, 'big.geojson').expect(413);
      expect(tooLarge.body.error.message).toContain('1 MB');
      const unknown = await post().field('mapping', '{}').attach('file', Buffer.from(JSON.stringify(roads)), 'roads.geojson').expect(400);
      expect(unknown.body.error.message).toContain('"mapping"');
      const twice = await post().field('name', 'a').field('name', 'b').attach('file', Buffer.from(JSON.stringify(roads)), 'roads.geojson').expect(400);
      expect(twice.body.error.message).toContain('twice');
      const late = await post().attach('file', Buffer.from(JSON.stringify(roads)), 'roads.geojson').field('options', '{"snapToleranceMeters": -1}').expect(400);
      expect(JSON.stringify(late.body.error)).toContain('snapToleranceMeters');
      expect(await rows()).toEqual(before);
      expect(small.errors).toEqual([]);
    } finally {
      await small.drop();
    }
  }, 180_000);
});

describe('zone and shelter imports', () => {
  it('queue one after another and are each saved', async () => {
    const zones = {
      type: 'FeatureCollection',
      features: [{ type: 'Feature', properties: { name: 'Lower Ward', population: 1200 }, geometry: { type: 'Polygon', coordinates: [[[10.001, 49.996], [10.004, 49.996], [10.004, 49.999], [10.001, 49.999], [10.001, 49.996]]] } }],
    };
    const shelters = { type: 'FeatureCollection', features: [{ type: 'Feature', properties: { name: 'Hill School', capacity: 400 }, geometry: { type: 'Point', coordinates: [10.009, 50.004] } }] };
    const a = (await upload('zones', JSON.stringify(zones), 'zones.geojson').expect(202)).body.id;
    const b = (await upload('shelters', JSON.stringify(shelters), 'shelters.geojson').expect(202)).body.id;
    const [za, sb] = [await finished(a), await finished(b)];
    expect(za.status, JSON.stringify(za.failure)).toBe('succeeded');
    expect(sb.status, JSON.stringify(sb.failure)).toBe('succeeded');
    expect(za.outcome).toMatchObject({ created: 1 });
    expect(sb.outcome).toMatchObject({ created: 1 });
  }, 180_000);

  it('refuses an unknown kind at the edge, storing nothing', async () => {
    const before = await countRows(ctx, 'imports');
    await upload('roads-and-more', '{}', 'x.geojson').expect(400);
    expect(await countRows(ctx, 'imports')).toBe(before);
  }, 180_000);
});

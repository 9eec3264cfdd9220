// Imports as queued jobs on the real database: the upload answers 202 with the queued import,
// a worker (in-process here, taking the pg-boss queue) reads the file in a worker thread and
// saves it, reporting phase and progress; a cancel stops it with nothing written; a file the
// reader refuses fails in the job with the reader's reason; several imports queue.
import type pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { importSchema, type Import } from '../../shared/api/imports';
import { reconcileImports } from '../../server/services/imports';
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
  await ctx.pool.query(`
    CREATE TABLE chunk_log (import_id uuid, seq int, n int, at timestamptz DEFAULT clock_timestamp());
    CREATE FUNCTION log_chunk() RETURNS trigger LANGUAGE plpgsql AS $$ BEGIN
      INSERT INTO chunk_log (import_id, seq, n) VALUES (NEW.import_id, NEW.seq, octet_length(NEW.bytes)); RETURN NEW;
    END $$;
    CREATE TRIGGER log_chunk AFTER INSERT ON import_chunks FOR EACH ROW EXECUTE FUNCTION log_chunk();`);
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
    // The bytes wait in PostgreSQL for any worker (stored behind the answer: the trigger in
    // beforeAll logs each piece, since the worker drops them once it has read them).
    await until('its pieces to be stored', async () => ((await ctx.pool.query('SELECT 1 FROM chunk_log WHERE import_id = $1', [res.body.id])).rowCount! > 0 ? true : undefined));
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

describe('an empty file', () => {
  // It has no pieces to store: the job still reads it and fails with the reader's reason (it used
  // to find no bytes and leave the import queued for ever).
  it('fails in its job with the reason, and writes nothing', async () => {
    const before = await countRows(ctx, 'zones');
    const { id } = (await upload('zones', Buffer.alloc(0), 'empty.geojson').expect(202)).body;
    const done = await finished(id);
    expect(done.status).toBe('failed');
    expect(done.failure!.message).toMatch(/empty/i);
    expect(await countRows(ctx, 'zones')).toBe(before);
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
    const done = await finished(res.body.id, plan);
    // Every piece was stored, in order, about 1 MB each (the log the trigger in beforeAll keeps,
    // since the worker drops the pieces once it has read them).
    const pieces = (await ctx.pool.query('SELECT seq, n FROM chunk_log WHERE import_id = $1 ORDER BY at', [res.body.id])).rows as { seq: number; n: number }[];
    expect(pieces.map((r) => r.seq)).toEqual(pieces.map((_, i) => i));
    expect(pieces.length).toBeGreaterThanOrEqual(3);
    expect(pieces.reduce((a, r) => a + r.n, 0)).toBe(Buffer.byteLength(text));
    expect(done.status, JSON.stringify(done.failure)).toBe('succeeded');
    expect(done.outcome).toMatchObject({ segments: 12_000 });
    const layer = (await planner.agent.get(`/api/plans/${plan}/road-layer`).expect(200)).body.layer;
    expect(layer.name).toBe('Long Street');
    expect(await storedBytes(res.body.id)).toBe(0);
  }, 180_000);

  it('answers once the file has arrived, while its pieces are still being stored; the job is queued once they are', async () => {
    // The database cannot store a piece until released: the answer must not wait for it.
    const held = await ctx.pool.connect();
    await held.query('BEGIN');
    await held.query('LOCK TABLE import_chunks IN EXCLUSIVE MODE');
    let answered: Import;
    try {
      const res = await Promise.race([
        upload('road-layer', JSON.stringify(roads), 'held.geojson'),
        new Promise<never>((_, reject) => setTimeout(() => reject(new Error('the upload waited for its pieces to be stored')), 20_000)),
      ]);
      expect(res.status).toBe(202);
      answered = importSchema.parse(res.body);
      expect(answered.phase).toBe('receiving the file');
      expect(answered.sizeBytes).toBe(JSON.stringify(roads).length);
      // No job and no audit row yet: nothing for a worker to take before the file is stored.
      expect((await getImport(answered.id)).phase).toBe('receiving the file');
      expect((await ctx.pool.query("SELECT count(*)::int AS n FROM pgboss.job WHERE data->>'importId' = $1", [answered.id])).rows[0].n).toBe(0);
    } finally {
      await held.query('COMMIT');
      held.release();
    }
    const done = await finished(answered.id);
    expect(done.status, JSON.stringify(done.failure)).toBe('succeeded');
    expect((await ctx.pool.query("SELECT count(*)::int AS n FROM audit_events WHERE action = 'import.queue' AND entity_id = $1", [answered.id])).rows[0].n).toBe(1);
  }, 180_000);

  it('an import whose upload never finished storing (its API process stopped) is failed by the reconciler, its pieces dropped', async () => {
    const held = await ctx.pool.connect();
    await held.query('BEGIN');
    await held.query('LOCK TABLE import_chunks IN EXCLUSIVE MODE');
    let id: string;
    let reconciled: Promise<string[]>;
    try {
      id = (await upload('road-layer', JSON.stringify(roads), 'orphan.geojson').expect(202)).body.id;
      // As if its process had died: the reconciler sees it still receiving (older than 0 s here).
      // (It drops the pieces once the lock is released.)
      reconciled = reconcileImports(ctx.db, 0);
      await until('the reconciler to fail it', async () => ((await getImport(id)).status === 'failed' ? true : undefined));
    } finally {
      await held.query('COMMIT');
      held.release();
    }
    expect(await reconciled).toEqual([id]);
    const done = await finished(id);
    expect(done.status).toBe('failed');
    expect(done.failure?.message).toContain('did not finish');
    // The request's own storing ends after it: it finds the import failed and queues nothing.
    await until('its pieces to be dropped', async () => ((await storedBytes(id)) === 0 ? true : undefined));
    await new Promise((r) => setTimeout(r, 300));
    expect(await storedBytes(id)).toBe(0);
    expect((await ctx.pool.query("SELECT count(*)::int AS n FROM pgboss.job WHERE data->>'importId' = $1", [id])).rows[0].n).toBe(0);
    expect((await getImport(id)).status).toBe('failed');
  }, 180_000);

  it('refused on the way (too large, a field it does not take, bad options after the file): a clear 4xx and no import, piece or audit row', async () => {
    const small = await createTestContext({ UPLOAD_MAX_MEGABYTES: '1', UPLOAD_READ_TIMEOUT_SECONDS: '1' });
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
      // Options refused before the file: answered before the form has been read to its end. The
      // body's time limit must not answer again once it runs out (it used to throw, uncaught).
      const early = await post().field('options', '{"snapToleranceMeters": -1}').attach('file', Buffer.from(JSON.stringify(roads)), 'roads.geojson').expect(400);
      expect(JSON.stringify(early.body.error)).toContain('snapToleranceMeters');
      await new Promise((r) => setTimeout(r, 1_500));
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

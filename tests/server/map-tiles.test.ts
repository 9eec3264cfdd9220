// The map's data by tile and by road, on the real database with a real run of the demo plan:
// tiles decode with @mapbox/vector-tile (the Mapbox Vector Tile reference decoder, an outside
// reader of what PostGIS's ST_AsMVT wrote), hold the roads they should with the properties the
// client styles by, follow edits, and a run's figures live beside its result, not in it.
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { VectorTile } from '@mapbox/vector-tile';
import Pbf from 'pbf';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './support/test-app';
import { defaultRunParameters, roadResultAnswerSchema, runWithResultSchema, segmentGeometrySchema, type RunWithResult } from '../../shared/api/runs';
import { roadClassMinZoom, roadTileLayer } from '../../shared/api/map-tiles';

let ctx: TestContext;
let planner: SignedInAgent;
let viewer: SignedInAgent;
let planId: string;
let bbox: [number, number, number, number];
let run: RunWithResult;

type Tile = { z: number; x: number; y: number };

// Slippy-map tile numbers from longitude and latitude (the OSM wiki's formula; common practice).
function tileOf(lon: number, lat: number, z: number): Tile {
  const n = 2 ** z;
  const r = (lat * Math.PI) / 180;
  return { z, x: Math.floor(((lon + 180) / 360) * n), y: Math.floor(((1 - Math.log(Math.tan(r) + 1 / Math.cos(r)) / Math.PI) / 2) * n) };
}

function tilesCovering(b: [number, number, number, number], z: number): Tile[] {
  const nw = tileOf(b[0], b[3], z);
  const se = tileOf(b[2], b[1], z);
  const tiles: Tile[] = [];
  for (let x = nw.x; x <= se.x; x++) for (let y = nw.y; y <= se.y; y++) tiles.push({ z, x, y });
  return tiles;
}

async function getTile(path: string, agent = viewer) {
  const res = await agent.agent.get(path).buffer(true).parse((r, cb) => {
    const chunks: Buffer[] = [];
    r.on('data', (c: Buffer) => chunks.push(c));
    r.on('end', () => cb(null, Buffer.concat(chunks)));
  });
  expect(res.status, String(res.body)).toBe(200);
  expect(res.headers['content-type']).toMatch(/application\/vnd\.mapbox-vector-tile/);
  // A copy: pbf reads a Node Buffer from a shared pool at the wrong offset for floats.
  const tile = new VectorTile(new Pbf(new Uint8Array(res.body as Buffer)));
  const layer = tile.layers[roadTileLayer];
  const features = layer ? Array.from({ length: layer.length }, (_, i) => layer.feature(i)) : [];
  return { res, features };
}

const roadTilePath = (t: Tile) => `/api/plans/${planId}/tiles/roads/${t.z}/${t.x}/${t.y}`;
const runTilePath = (t: Tile) => `/api/plans/${planId}/runs/${run.id}/tiles/${t.z}/${t.x}/${t.y}`;

async function allSegments(): Promise<{ id: number; road_class: string; closed: boolean; lon: number; lat: number }[]> {
  const { rows } = await ctx.pool.query(
    `SELECT s.id::int AS id, s.road_class, s.closed, ST_X(ST_StartPoint(s.geom)) AS lon, ST_Y(ST_StartPoint(s.geom)) AS lat
     FROM road_segments s JOIN road_layers l ON l.id = s.layer_id WHERE l.plan_id = $1 AND l.active`,
    [planId],
  );
  return rows;
}

beforeAll(async () => {
  ctx = await createTestContext({}, { withRunWorker: true });
  planner = await signInAs(ctx.app, 'planner');
  viewer = await signInAs(ctx.app, 'viewer');
  planId = (await viewer.agent.get('/api/plans').expect(200)).body.plans[0].id;
  bbox = (await viewer.agent.get(`/api/plans/${planId}/road-layer`).expect(200)).body.layer.bbox;
  // Every change of a run's row, with the run_tiles it has at that moment as its own writer sees
  // them (a trigger runs inside the writing transaction): what anyone reading the row then would find.
  await ctx.pool.query(`
    CREATE TABLE run_row_log (seq serial, run_id uuid, status text, phase text, progress real, tiles int);
    CREATE FUNCTION log_run_row() RETURNS trigger LANGUAGE plpgsql AS $$ BEGIN
      INSERT INTO run_row_log (run_id, status, phase, progress, tiles)
      VALUES (NEW.id, NEW.status, NEW.phase, NEW.progress, (SELECT count(*) FROM run_tiles WHERE run_id = NEW.id));
      RETURN NEW;
    END $$;
    CREATE TRIGGER log_run_row AFTER UPDATE ON runs FOR EACH ROW EXECUTE FUNCTION log_run_row();`);
  run = await finishedRun();
});
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

async function finishedRun(): Promise<RunWithResult> {
  const started = await planner.agent
    .post(`/api/plans/${planId}/runs`)
    .set('x-csrf-token', planner.csrf)
    .send({ parameters: { ...defaultRunParameters, horizonMinutes: 120, timeStepSeconds: 120 } })
    .expect(202);
  for (;;) {
    const read = runWithResultSchema.parse((await viewer.agent.get(`/api/plans/${planId}/runs/${started.body.id}`).expect(200)).body);
    if (!['queued', 'running'].includes(read.status)) {
      expect(read.status, read.failureReason ?? '').toBe('succeeded');
      return read;
    }
    await new Promise((r) => setTimeout(r, 200));
  }
}

const rowLog = async (runId: string) =>
  (await ctx.pool.query('SELECT status, phase, progress, tiles FROM run_row_log WHERE run_id = $1 ORDER BY seq', [runId])).rows as {
    status: string;
    phase: string;
    progress: number;
    tiles: number;
  }[];

const overviewTileCount = () => Array.from({ length: 13 }, (_, z) => tilesCovering(bbox, z).length).reduce((a, b) => a + b, 0);

describe('a run’s whole-plan tiles are its last phase', () => {
  it('are all kept before the run is marked finished, drawn in a phase of their own with its progress', async () => {
    const log = await rowLog(run.id);
    const finished = log.findIndex((r) => r.status === 'succeeded');
    expect(finished).toBeGreaterThan(0);
    // The moment the run became finished, every whole-plan tile was already kept with it.
    expect(log[finished]!.tiles).toBe(overviewTileCount());
    // Before that, the drawing showed as the run's phase, its progress rising to 1, after the solve.
    const drawing = log.slice(0, finished).filter((r) => r.phase === 'tiles');
    expect(drawing.length).toBeGreaterThan(0);
    expect(drawing.at(-1)!.progress).toBe(1);
    for (let i = 1; i < drawing.length; i++) expect(drawing[i]!.progress).toBeGreaterThanOrEqual(drawing[i - 1]!.progress);
    expect(log.slice(0, finished).every((r) => r.status !== 'succeeded')).toBe(true);
    const phases = log.slice(0, finished).map((r) => r.phase);
    expect(phases.indexOf('saving')).toBeGreaterThan(phases.indexOf('starting'));
    expect(phases.indexOf('tiles')).toBeGreaterThan(phases.indexOf('saving'));
  });

  it('a run that reuses an identical result is finished with its tiles too', async () => {
    const again = await finishedRun();
    expect(again.phase).toMatch(/^reused the result of run /);
    const log = await rowLog(again.id);
    const finished = log.find((r) => r.status === 'succeeded')!;
    expect(finished.tiles).toBe(overviewTileCount());
    const copied = (await ctx.pool.query('SELECT z, x, y, tile FROM run_tiles WHERE run_id = $1 ORDER BY z, x, y', [again.id])).rows;
    const original = (await ctx.pool.query('SELECT z, x, y, tile FROM run_tiles WHERE run_id = $1 ORDER BY z, x, y', [run.id])).rows;
    expect(copied).toEqual(original);
  });
});
describe('a run’s whole-plan tiles', () => {
  it('at the zooms that show the whole plan, are drawn by the worker before the run finishes and kept in PostgreSQL for every process', async () => {
    const stored = async () =>
      (await ctx.pool.query('SELECT z, x, y, data_version, tile FROM run_tiles WHERE run_id = $1 ORDER BY z, x, y', [run.id])).rows as { z: number; x: number; y: number; data_version: number; tile: Buffer }[];
    const expected = overviewTileCount();
    const kept = await stored();
    // Every zoom from 0 to 12 covers the small demo town in a few tiles: each is drawn once.
    expect(new Set(kept.map((t) => t.z))).toEqual(new Set(Array.from({ length: 13 }, (_, z) => z)));
    expect(kept.length).toBe(expected);
    for (const z of [0, 8, 12]) expect(kept.filter((t) => t.z === z).map(({ x, y }) => ({ z, x, y }))).toEqual(tilesCovering(bbox, z));
    // What the route answers (another process would too) is the stored tile, byte for byte.
    const t8 = tilesCovering(bbox, 8)[0]!;
    const { res } = await getTile(runTilePath(t8));
    expect(Buffer.compare(res.body as Buffer, kept.find((t) => t.z === 8 && t.x === t8.x && t.y === t8.y)!.tile)).toBe(0);
    // A stored tile is read, not drawn again: a marked copy in the table is what a fresh process serves.
    await ctx.pool.query('UPDATE run_tiles SET tile = $2 WHERE run_id = $1 AND z = 9', [run.id, Buffer.from([0x1a, 0x00])]);
    const t9 = tilesCovering(bbox, 9)[0]!;
    // (Not asked of this process before, so its answer cache does not hold it.)
    const marked = await viewer.agent.get(runTilePath(t9)).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect([...(marked.body as Buffer)]).toEqual([0x1a, 0x00]);
    // Deeper tiles are not kept in the table.
    await getTile(runTilePath(tileOf(bbox[0], bbox[1], 15)));
    expect((await stored()).some((t) => t.z > 12)).toBe(false);
  });

  it('kept per data version: after an edit a new tile is drawn and kept beside the old one', async () => {
    const before = (await ctx.pool.query('SELECT count(*)::int AS n FROM run_tiles WHERE run_id = $1 AND z = 10', [run.id])).rows[0].n as number;
    const [segment] = await allSegments();
    await planner.agent.patch(`/api/plans/${planId}/segments/${segment!.id}`).set('x-csrf-token', planner.csrf).send({ name: 'Renamed Lane' }).expect(200);
    const t10 = tilesCovering(bbox, 10)[0]!;
    await getTile(runTilePath(t10));
    const versions = (await ctx.pool.query('SELECT DISTINCT data_version FROM run_tiles WHERE run_id = $1 AND z = 10', [run.id])).rows;
    expect(versions.length).toBe(2);
    expect((await ctx.pool.query('SELECT count(*)::int AS n FROM run_tiles WHERE run_id = $1 AND z = 10', [run.id])).rows[0].n).toBe(before + 1);
  });
});

describe('road tiles', () => {
  it('hold every road of the layer once zoomed in, each where it lies', async () => {
    const segments = await allSegments();
    const seen = new Map<number, { lon: number; lat: number }[]>();
    for (const t of tilesCovering(bbox, 14)) {
      const { features } = await getTile(roadTilePath(t));
      for (const f of features) {
        expect(f.type).toBe(2); // LineString
        const geo = f.toGeoJSON(t.x, t.y, t.z);
        const lines = geo.geometry.type === 'LineString' ? [geo.geometry.coordinates] : (geo.geometry as { coordinates: number[][][] }).coordinates;
        const points = lines.flat().map(([lon, lat]) => ({ lon: lon!, lat: lat! }));
        seen.set(Number(f.properties.id), [...(seen.get(Number(f.properties.id)) ?? []), ...points]);
        expect(typeof f.properties.roadClass).toBe('string');
        expect(typeof f.properties.closed).toBe('boolean');
      }
    }
    expect([...seen.keys()].sort((a, b) => a - b)).toEqual(segments.map((s) => s.id).sort((a, b) => a - b));
    // Each road's first vertex is within about a tile unit (zoom 14: ~2.4 m at the equator) of
    // one of the points the tiles gave for it.
    for (const s of segments) {
      const near = Math.min(...seen.get(s.id)!.map((p) => Math.hypot(p.lon - s.lon, p.lat - s.lat)));
      expect(near).toBeLessThan(1e-4);
    }
  });

  it('leave out the minor classes far out', async () => {
    const z = 8;
    const minor = new Set(Object.entries(roadClassMinZoom).filter(([, min]) => min > z).map(([c]) => c));
    const segments = await allSegments();
    expect(segments.some((s) => minor.has(s.road_class))).toBe(true);
    const shown = new Set<number>();
    for (const t of tilesCovering(bbox, z)) for (const f of (await getTile(roadTilePath(t))).features) shown.add(Number(f.properties.id));
    for (const s of segments) expect(shown.has(s.id), `${s.road_class} ${s.id}`).toBe(!minor.has(s.road_class));
  });

  it('show an edit at once: the data version names the tile', async () => {
    const segments = await allSegments();
    const target = segments.find((s) => !s.closed)!;
    const t = tileOf(target.lon, target.lat, 15);
    const before = await getTile(roadTilePath(t));
    expect(before.features.find((f) => Number(f.properties.id) === target.id)!.properties.closed).toBe(false);
    await planner.agent.patch(`/api/plans/${planId}/segments/${target.id}`).set('x-csrf-token', planner.csrf).send({ closed: true }).expect(200);
    const after = await getTile(roadTilePath(t));
    expect(after.features.find((f) => Number(f.properties.id) === target.id)!.properties.closed).toBe(true);
    expect(after.res.headers.etag).not.toBe(before.res.headers.etag);
    await planner.agent.patch(`/api/plans/${planId}/segments/${target.id}`).set('x-csrf-token', planner.csrf).send({ closed: false }).expect(200);
  });

  it('refuse a tile that does not exist', async () => {
    await viewer.agent.get(`/api/plans/${planId}/tiles/roads/3/8/0`).expect(400);
    await viewer.agent.get(`/api/plans/${planId}/tiles/roads/23/0/0`).expect(400);
  });
});

describe('a run’s figures', () => {
  it('are not in the result: the run answers small', async () => {
    const res = await viewer.agent.get(`/api/plans/${planId}/runs/${run.id}`).set('Accept-Encoding', 'identity').expect(200);
    expect(res.body.result).not.toHaveProperty('arcs');
    expect(Buffer.byteLength(res.text)).toBeLessThan(64 * 1024);
  });

  it('are on the run’s tiles: the four bridges in the cut, run full', async () => {
    const cut = run.result!.bottlenecks.filter((b) => b.inStaticCut);
    expect(cut.length).toBe(4);
    for (const b of cut) {
      const [lon, lat] = (await viewer.agent.get(`/api/plans/${planId}/segment-geometry?ids=${b.segmentId}`).expect(200)).body.segments[0].coordinates[0];
      // Zoomed out to where only the major roads show, roads in the cut still do.
      for (const z of [8, 15]) {
        const t = tileOf(lon, lat, z);
        const f = (await getTile(runTilePath(t))).features.find((x) => Number(x.properties.id) === b.segmentId)!;
        expect(f, `segment ${b.segmentId} at zoom ${z}`).toBeDefined();
        expect(f.properties.inCut).toBe(true);
        // Max-flow/min-cut: the arcs of the minimum cut are saturated.
        expect(Number(f.properties.utilisation)).toBeCloseTo(1, 5);
      }
    }
    // Far out, a road that carries flow but is neither major nor in the cut is left out.
    const minor = new Set(Object.entries(roadClassMinZoom).filter(([, min]) => min > 8).map(([c]) => c));
    for (const t of tilesCovering(bbox, 8)) {
      for (const f of (await getTile(runTilePath(t))).features) {
        if (minor.has(String(f.properties.roadClass))) expect(f.properties.inCut || Number(f.properties.shareOfCut) > 0, `road ${f.properties.id}`).toBeTruthy();
      }
    }
  });

  it('are served by road, and the choke points’ geometry in one small answer', async () => {
    const b = run.result!.bottlenecks.find((x) => x.inStaticCut)!;
    const road = roadResultAnswerSchema.parse((await viewer.agent.get(`/api/plans/${planId}/runs/${run.id}/roads/${b.segmentId}`).expect(200)).body).road!;
    const load = road[b.direction]!;
    expect(load.inStaticCut).toBe(true);
    expect(load.flowVehiclesPerHour).toBeCloseTo(b.capacityVehiclesPerHour, 6);
    expect(road.shareOfCut).toBeCloseTo(
      run.result!.bottlenecks.filter((x) => x.segmentId === b.segmentId).reduce((s, x) => s + x.shareOfCut, 0),
      5,
    );
    const none = roadResultAnswerSchema.parse((await viewer.agent.get(`/api/plans/${planId}/runs/${run.id}/roads/999999999`).expect(200)).body);
    expect(none.road).toBeNull();
    const geometry = segmentGeometrySchema.parse((await viewer.agent.get(`/api/plans/${planId}/runs/${run.id}/choke-point-geometry`).expect(200)).body);
    const ids = new Set([...run.result!.bottlenecks, ...run.result!.fixes].map((x) => x.segmentId));
    expect(new Set(geometry.segments.map((s) => s.id))).toEqual(ids);
    for (const s of geometry.segments) expect(s.coordinates.length).toBeGreaterThanOrEqual(2);
  });

  it('refuses more roads than the cap in one geometry request', async () => {
    const ids = Array.from({ length: 501 }, (_, i) => i + 1).join(',');
    await viewer.agent.get(`/api/plans/${planId}/segment-geometry?ids=${ids}`).expect(400);
  });
});

describe('results stored with every arc in them', () => {
  it('move their arcs into the per-road table when migrated', async () => {
    const statements = readFileSync(new URL('../../drizzle/0013_run_road_results.sql', import.meta.url), 'utf8').split('--> statement-breakpoint');
    // The data statements: the last three (insert, shares, drop the list).
    const data = statements.slice(-3);
    expect(data[0]).toMatch(/INSERT INTO "run_road_results"/);
    const [segment] = await allSegments();
    const oldResult = {
      ...run.result,
      arcs: [
        { segmentId: segment!.id, direction: 'forward', name: 'Old Road', roadClass: 'primary', capacityVehiclesPerHour: 1000, flowVehiclesPerHour: 800, utilisation: 0.8, inStaticCut: false },
        { segmentId: segment!.id, direction: 'backward', name: 'Old Road', roadClass: 'primary', capacityVehiclesPerHour: 500, flowVehiclesPerHour: 500, utilisation: 1, inStaticCut: true },
      ],
      bottlenecks: [
        { segmentId: segment!.id, direction: 'backward', name: 'Old Road', roadClass: 'primary', capacityVehiclesPerHour: 500, shareOfCut: 0.25, cutWindows: [[10, 40], [60, 70]], inStaticCut: true, gainPerExtraLaneVehiclesPerHour: 0 },
      ],
    };
    const { rows } = await ctx.pool.query<{ id: string }>(
      `INSERT INTO runs (plan_id, status, phase, progress, parameters, data_version, input_hash, result)
       SELECT plan_id, 'succeeded', 'done', 1, parameters, data_version, 'old-format', $2::jsonb FROM runs WHERE id = $1 RETURNING id`,
      [run.id, JSON.stringify(oldResult)],
    );
    const oldId = rows[0]!.id;
    for (const statement of data) await ctx.pool.query(statement);
    const migrated = await ctx.pool.query(`SELECT * FROM run_road_results WHERE run_id = $1`, [oldId]);
    expect(migrated.rows).toEqual([
      {
        run_id: oldId,
        segment_id: String(segment!.id),
        flow_forward: 800,
        flow_backward: 500,
        capacity_forward: 1000,
        capacity_backward: 500,
        utilisation: 1,
        cut_forward: false,
        cut_backward: true,
        share_of_cut: 0.25,
        limiting_minutes: 40,
      },
    ]);
    const stored = await ctx.pool.query(`SELECT result ? 'arcs' AS has FROM runs WHERE id = $1`, [oldId]);
    expect(stored.rows[0].has).toBe(false);
    // Runs stored in the new form are left as they were.
    const again = await ctx.pool.query(`SELECT count(*)::int AS n FROM run_road_results WHERE run_id = $1`, [run.id]);
    expect(again.rows[0].n).toBeGreaterThan(0);
  });
});

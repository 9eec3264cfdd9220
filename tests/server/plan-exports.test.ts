// The plan's inputs and a run's results leave through the API as GeoPackage, zipped Shapefile,
// KML and GeoJSON. GDAL's ogrinfo (Debian gdal-bin, run here) reads each file with the layers,
// counts and spatial reference meant; the inputs read back by Cutline's own import give the
// stored road layer — every segment's geometry within 1 cm (haversine), class, lanes, capacity
// override, closure and name — after a planner's edits; the caution and identity ride along.
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { unzipSync } from 'fflate';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { CAUTION_LINE } from '../../shared/api/caution';
import type { UnitSystem } from '../../shared/api/units';
import { roadInputsMapping } from '../../shared/format/inputs-export';
import { importRoadLayerUpload } from '../../server/import/import-road-layer';
import { writeExport } from '../../server/export/write-export';
import { writeExportFile } from '../../server/export/write-export-in-worker';
import { planInputsBundle } from '../../server/services/plan-inputs-export';
import { tool } from '../shared/gis/reference-tools';
import { demoPlanId, insertDemoRun } from './support/demo-run';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './support/test-app';

vi.setConfig({ testTimeout: 120_000 });

let ctx: TestContext;
let planner: SignedInAgent;
let admin: SignedInAgent;
let planId: string;
let dir: string;

type DbSegment = { id: number; coordinates: [number, number][]; road_class: string; lanes_forward: number | null; lanes_backward: number | null; name: string | null; closed: boolean; cap: number | null; oneway: boolean; length_meters: number };

beforeAll(async () => {
  ctx = await createTestContext();
  planner = await signInAs(ctx.app, 'planner');
  admin = await signInAs(ctx.app, 'admin');
  planId = await demoPlanId(ctx.db, ctx.demoOrganizationId);
  dir = mkdtempSync(join(tmpdir(), 'cutline-api-export-'));
  // A planner's edits: one road closed, one with its own capacity per lane and more lanes.
  const ids = (await ctx.pool.query<{ id: string }>(`SELECT s.id FROM road_segments s JOIN road_layers l ON l.id = s.layer_id WHERE l.plan_id = $1 AND l.active AND NOT s.oneway ORDER BY s.id LIMIT 2`, [planId])).rows.map((r) => r.id);
  await planner.agent.patch(`/api/plans/${planId}/segments/${ids[0]}`).set('x-csrf-token', planner.csrf).send({ closed: true }).expect(200);
  await planner.agent.patch(`/api/plans/${planId}/segments/${ids[1]}`).set('x-csrf-token', planner.csrf).send({ capacityOverrideVehPerHourPerLane: 1350, lanesForward: 3, lanesBackward: 2 }).expect(200);
});
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

async function setUnits(unitSystem: UnitSystem): Promise<void> {
  await admin.agent.put('/api/settings/organization').set('x-csrf-token', admin.csrf).send({ unitSystem, timeZone: null }).expect(200);
}

async function download(path: string): Promise<{ bytes: Buffer; type: string; disposition: string }> {
  const res = await planner.agent
    .get(`/api/plans/${planId}/${path}`)
    .buffer(true)
    .parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    })
    .expect(200);
  return { bytes: res.body as Buffer, type: String(res.headers['content-type']), disposition: String(res.headers['content-disposition']) };
}

function saved(name: string, bytes: Uint8Array): string {
  const path = join(dir, name);
  writeFileSync(path, bytes);
  return path;
}

function layerBlock(info: string, layer: string): string {
  const start = info.indexOf(`Layer name: ${layer}\n`);
  expect(start, `ogrinfo lists layer ${layer}`).toBeGreaterThanOrEqual(0);
  const next = info.indexOf('Layer name: ', start + 1);
  return info.slice(start, next < 0 ? undefined : next);
}

async function dbSegments(): Promise<DbSegment[]> {
  const { rows } = await ctx.pool.query(
    `SELECT s.id::int, ST_AsGeoJSON(s.geom, 15) AS g, s.road_class, s.lanes_forward, s.lanes_backward, s.name, s.closed, s.capacity_override_veh_per_hour_per_lane AS cap, s.oneway, s.length_meters
       FROM road_segments s JOIN road_layers l ON l.id = s.layer_id WHERE l.plan_id = $1 AND l.active ORDER BY s.id`,
    [planId],
  );
  return rows.map((r) => ({ ...r, coordinates: JSON.parse(r.g).coordinates }));
}

async function dbCount(table: 'zones' | 'shelters'): Promise<number> {
  return (await ctx.pool.query(`SELECT count(*)::int AS n FROM ${table} WHERE plan_id = $1`, [planId])).rows[0].n;
}

const rad = Math.PI / 180;
/** Haversine distance on the mean Earth radius 6,371,008.8 m (IUGG), metres. */
function haversine(a: number[], b: number[]): number {
  const h = Math.sin(((b[1]! - a[1]!) * rad) / 2) ** 2 + Math.cos(a[1]! * rad) * Math.cos(b[1]! * rad) * Math.sin(((b[0]! - a[0]!) * rad) / 2) ** 2;
  return 2 * 6_371_008.8 * Math.asin(Math.sqrt(h));
}

const ends = (c: number[][]) => `${c[0]![0]!.toFixed(6)},${c[0]![1]!.toFixed(6)}>${c.at(-1)![0]!.toFixed(6)},${c.at(-1)![1]!.toFixed(6)}/${c.length}`;

/** The file read back by the import is the stored road layer: geometry within 1 cm, class, lanes, capacity, closure, name. */
async function expectRoundTrip(bytes: Uint8Array, fileName: string, system: UnitSystem, layer?: string): Promise<void> {
  const stored = await dbSegments();
  const back = await importRoadLayerUpload(bytes, { propertyMapping: roadInputsMapping(system), ...(layer ? { source: { layer } } : {}) }, fileName);
  expect(back.segments.length).toBe(stored.length);
  const byEnds = new Map(back.segments.map((s) => [ends(s.coordinates), s]));
  let worst = 0;
  for (const s of stored) {
    const b = byEnds.get(ends(s.coordinates));
    expect(b, `segment ${s.id} read back`).toBeDefined();
    s.coordinates.forEach((p, i) => (worst = Math.max(worst, haversine(p, b!.coordinates[i]!))));
    const a = b!.attributes;
    expect([a.roadClass, a.lanesForward, a.lanesBackward, a.oneway, a.name, a.closed, a.capacityOverrideVehPerHourPerLane]).toEqual([s.road_class, s.lanes_forward, s.lanes_backward, s.oneway, s.name, s.closed, s.cap]);
  }
  expect(worst).toBeLessThan(0.01);
  expect(back.segments.filter((x) => x.attributes.closed)).toHaveLength(1);
  expect(back.segments.filter((x) => x.attributes.capacityOverrideVehPerHourPerLane === 1350)).toHaveLength(1);
}

describe("the plan's inputs", () => {
  it('GeoPackage: ogrinfo reads roads, zones and shelters in EPSG:4326 with the stored counts, and the caution; read back it is the stored layer', async () => {
    await setUnits('metric');
    const { bytes, type, disposition } = await download('export/plan-inputs.gpkg');
    expect(type).toContain('application/geopackage+sqlite3');
    expect(disposition).toMatch(/plan-inputs\.gpkg/);
    const path = saved('inputs.gpkg', bytes);
    const info = tool('ogrinfo', ['-ro', '-so', '-al', path]);
    const stored = await dbSegments();
    expect(layerBlock(info, 'roads')).toContain(`Feature Count: ${stored.length}`);
    expect(layerBlock(info, 'roads')).toMatch(/ID\["EPSG",4326\]|AUTHORITY\["EPSG","4326"\]/);
    expect(layerBlock(info, 'roads')).toContain('speed_kmh: Real');
    expect(layerBlock(info, 'zones')).toContain(`Feature Count: ${await dbCount('zones')}`);
    expect(layerBlock(info, 'shelters')).toContain(`Feature Count: ${await dbCount('shelters')}`);
    const meta = tool('ogrinfo', ['-ro', '-al', '-q', path, 'cutline_export']);
    expect(meta).toContain(`value (String) = ${CAUTION_LINE}`);
    expect(meta).toContain('value (String) = Veltmoor river crossings');
    await expectRoundTrip(bytes, 'inputs.gpkg', 'metric', 'roads');
  });

  it('zipped Shapefile: a .prj and a UTF-8 .cpg per layer and the read-me with the caution; read back it is the stored layer', async () => {
    const { bytes } = await download('export/plan-inputs.zip');
    const files = unzipSync(bytes);
    expect(Object.keys(files)).toEqual(expect.arrayContaining(['roads.shp', 'roads.shx', 'roads.dbf', 'roads.prj', 'roads.cpg', 'zones.shp', 'shelters.shp', 'cutline-export.txt']));
    expect(new TextDecoder().decode(files['cutline-export.txt'])).toContain(`caution: ${CAUTION_LINE}`);
    const info = tool('ogrinfo', ['-ro', '-so', '-al', `/vsizip/${saved('inputs.zip', bytes)}`]);
    expect(layerBlock(info, 'roads')).toContain(`Feature Count: ${(await dbSegments()).length}`);
    expect(layerBlock(info, 'zones')).toContain('Geometry: Polygon');
    await expectRoundTrip(bytes, 'inputs.zip', 'metric', 'roads');
  });

  it('GeoJSON per layer, lengths and speeds in the organisation\'s units (US customary: ft and mph), each column saying its unit', async () => {
    await setUnits('us-customary');
    try {
      const { bytes } = await download('export/roads.geojson');
      const json = JSON.parse(bytes.toString('utf8'));
      expect(json.cutline.caution).toBe(CAUTION_LINE);
      expect(json.cutline.plan).toBe('Veltmoor river crossings');
      expect(json.cutline_columns.length_ft).toMatch(/\(ft\)$/);
      expect(json.cutline_columns.speed_mph).toMatch(/\(mph\)$/);
      const stored = new Map((await dbSegments()).map((s) => [s.id, s]));
      for (const f of json.features) {
        // 1 ft = 0.3048 m exactly (international foot, 1959).
        expect(f.properties.length_ft).toBeCloseTo(stored.get(f.properties.seg_id)!.length_meters / 0.3048, 6);
        expect(f.properties).not.toHaveProperty('length_m');
      }
      await expectRoundTrip(bytes, 'roads.geojson', 'us-customary');
      const zones = JSON.parse((await download('export/zones.geojson')).bytes.toString('utf8'));
      expect(zones.features).toHaveLength(await dbCount('zones'));
      const shelters = JSON.parse((await download('export/shelters.geojson')).bytes.toString('utf8'));
      expect(shelters.features).toHaveLength(await dbCount('shelters'));
      expect(shelters.cutline.caution).toBe(CAUTION_LINE);
    } finally {
      await setUnits('metric');
    }
  });

  it('a big file is written in a worker thread, to the same files as at once', async () => {
    const bundle = await planInputsBundle(ctx.db, ctx.demoOrganizationId, planId, ctx.config.BRIEFING_TIME_ZONE);
    const inThread = unzipSync(await writeExportFile({ format: 'shp.zip', bundle }, { inlineRows: 0 }));
    const atOnce = unzipSync(await writeExport('shp.zip', bundle));
    // The zip's own entry times may differ by a second; what it holds may not.
    expect(Object.keys(inThread).sort()).toEqual(Object.keys(atOnce).sort());
    for (const name of Object.keys(atOnce)) expect(Buffer.from(inThread[name]!).equals(Buffer.from(atOnce[name]!)), name).toBe(true);
  });
});

describe("a run's results", () => {
  let runId: string;
  let curveSteps: number;
  beforeAll(async () => {
    const run = await insertDemoRun(ctx.db, planId, ctx.userIds['planner@cutline.example'] ?? null);
    runId = run.runId;
    curveSteps = run.result.curve.deliveredVehicles.length;
  });

  it('GeoPackage: roads with flows, zones, shelters, the curve and the caution with the run\'s identity, as ogrinfo reads them', async () => {
    const { bytes, disposition } = await download(`runs/${runId}/export/results.gpkg`);
    expect(disposition).toMatch(/results\.gpkg/);
    const path = saved('results.gpkg', bytes);
    const info = tool('ogrinfo', ['-ro', '-so', '-al', path]);
    const roads = layerBlock(info, 'roads');
    expect(roads).toContain('Geometry: Line String');
    for (const f of ['flow_fwd: Real', 'util: Real', 'cut_share: Real', 'limit_min: Real', 'limit_stp: Integer']) expect(roads).toContain(f);
    expect(layerBlock(info, 'zones')).toContain(`Feature Count: ${await dbCount('zones')}`);
    expect(layerBlock(info, 'shelters')).toContain(`Feature Count: ${await dbCount('shelters')}`);
    expect(layerBlock(info, 'curve')).toContain(`Feature Count: ${curveSteps}`);
    const meta = tool('ogrinfo', ['-ro', '-al', '-q', path, 'cutline_export']);
    expect(meta).toContain(`value (String) = ${CAUTION_LINE}`);
    expect(meta).toContain(`value (String) = ${runId}`);
    expect(meta).toContain('value (String) = 300'); // the run's time step, seconds
  });

  it('KML: a folder per table, the caution and the run in the document description', async () => {
    const { bytes, type } = await download(`runs/${runId}/export/results.kml`);
    expect(type).toContain('application/vnd.google-earth.kml+xml');
    const text = bytes.toString('utf8');
    expect(text).toContain(`caution: ${CAUTION_LINE}`);
    expect(text).toContain(`run_id: ${runId}`);
    const info = tool('ogrinfo', ['-ro', '-so', '-al', saved('results.kml', bytes)]);
    expect(layerBlock(info, 'zones')).toContain(`Feature Count: ${await dbCount('zones')}`);
    expect(layerBlock(info, 'shelters')).toContain(`Feature Count: ${await dbCount('shelters')}`);
    const roads = (await ctx.pool.query(`SELECT count(*)::int AS n FROM run_road_results WHERE run_id = $1`, [runId])).rows[0].n;
    expect(roads).toBeGreaterThan(0);
    expect(layerBlock(info, 'roads')).toContain(`Feature Count: ${roads}`);
  });

  it('GeoJSON of the arcs: each direction with its flow, and the road\'s share of the cut and minutes in it', async () => {
    const json = JSON.parse((await download(`runs/${runId}/export/arcs.geojson`)).bytes.toString('utf8'));
    expect(json.cutline.caution).toBe(CAUTION_LINE);
    const { rows } = await ctx.pool.query(`SELECT segment_id::int AS id, share_of_cut, limiting_minutes FROM run_road_results WHERE run_id = $1`, [runId]);
    const stored = new Map(rows.map((r) => [r.id, r]));
    expect(rows.some((r) => r.share_of_cut > 0)).toBe(true);
    for (const f of json.features) {
      expect(f.properties.roadShareOfCut).toBe(stored.get(f.properties.segmentId)!.share_of_cut);
      expect(f.properties.roadLimitingMinutes).toBe(stored.get(f.properties.segmentId)!.limiting_minutes);
    }
  });

  it('a run without a result has no file to give', async () => {
    const { rows } = await ctx.pool.query(`INSERT INTO runs (plan_id, status, parameters, data_version) SELECT plan_id, 'queued', parameters, data_version FROM runs WHERE id = $1 RETURNING id`, [runId]);
    await planner.agent.get(`/api/plans/${planId}/runs/${rows[0].id}/export/results.gpkg`).expect(409);
  });
});

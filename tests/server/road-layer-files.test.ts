// Each kind of file a planner brings, imported through the API (the import route and its job)
// into the real database: the
// demo town, a real OpenStreetMap extract, GIS data without shared vertices, and a broken file.
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, signInAs, countRows, type SignedInAgent, type TestContext } from './support/test-app';
import { importedRoadLayer, importRefused } from './support/import-jobs';

const root = path.resolve(import.meta.dirname, '../..');
const file = (p: string) => fs.readFileSync(path.join(root, p));

let ctx: TestContext;
let planner: SignedInAgent;

async function newPlan(name: string): Promise<string> {
  return (await planner.agent.post('/api/plans').set('x-csrf-token', planner.csrf).send({ name }).expect(201)).body.id;
}

const upload = (planId: string, bytes: Buffer, fileName: string, options?: object) => importedRoadLayer(planner, planId, bytes, fileName, options ? { options } : {});

async function stored(layerId: number) {
  const { rows } = await ctx.pool.query(
    `SELECT count(*)::int AS segments,
            count(*) FILTER (WHERE oneway)::int AS oneway,
            sum(CASE WHEN oneway THEN 1 ELSE 2 END)::int AS arcs,
            (SELECT count(*)::int FROM road_nodes WHERE layer_id = $1) AS nodes,
            max(abs(ST_Length(geom::geography) - length_meters)) AS worst_length_gap
     FROM road_segments WHERE layer_id = $1`,
    [layerId],
  );
  return rows[0];
}

beforeAll(async () => {
  ctx = await createTestContext({}, { withRunWorker: true });
  planner = await signInAs(ctx.app, 'planner');
});
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

describe('road files through the import route and its job', () => {
  it('the demo town: every segment and node stored, arcs as reported', async () => {
    const planId = await newPlan('Demo roads');
    const layer = await upload(planId, file('server/seed/demo-town/roads.geojson'), 'roads.geojson');
    const db = await stored(layer.id);
    expect(db.segments).toBe(layer.report.segmentCount);
    expect(db.nodes).toBe(layer.report.nodeCount);
    expect(db.arcs).toBe(layer.report.arcCount);
    // The footway and the river line of the demo file are dropped and counted.
    expect(layer.report.dropped.length).toBeGreaterThan(0);
    // Lengths: our haversine along the vertices against PostGIS's geodesic length on the
    // WGS84 spheroid (a different formula; within 0.5 % is the expected gap, from memory).
    expect(db.worst_length_gap).toBeLessThan(5);
  });

  it('a real OpenStreetMap extract (West Oakland, © OpenStreetMap contributors, ODbL; from Debian python-osmnx-doc)', async () => {
    const planId = await newPlan('West Oakland');
    const layer = await upload(planId, file('tests/fixtures/osm/West-Oakland.osm.bz2'), 'West-Oakland.osm.bz2');
    expect(layer.report.sourceFormat).toBe('osmXml');
    // 23 drivable ways (residential, service, secondary, unclassified), as counted from the
    // file in tests/shared/geo/west-oakland.test.ts.
    expect(layer.report.kept.reduce((n: number, k: { features: number }) => n + k.features, 0)).toBe(23);
    const db = await stored(layer.id);
    expect(db.segments).toBe(layer.report.segmentCount);
    expect(db.oneway).toBeGreaterThan(0);
    expect(layer.report.components[0].shareOfLength).toBeGreaterThan(0.98);
  });

  it('GIS data without shared vertices, with a property mapping', async () => {
    const planId = await newPlan('GIS');
    const mapping = JSON.parse(file('tests/fixtures/geo/gis-no-shared-vertices.mapping.json').toString());
    const options = 'propertyMapping' in mapping ? mapping : { propertyMapping: mapping };
    const layer = await upload(planId, file('tests/fixtures/geo/gis-no-shared-vertices.geojson'), 'streets.geojson', options);
    expect(layer.report.splitAtCrossings).toBe(true);
    expect(layer.report.crossingsJoined).toBeGreaterThan(0);
    expect(layer.report.crossingsOnDifferentLayers).toBeGreaterThan(0);
    expect((await stored(layer.id)).segments).toBe(layer.report.segmentCount);
  });

  it('a deliberately broken file: every bad feature named, nothing half-saved', async () => {
    const planId = await newPlan('Broken');
    const tables = ['road_layers', 'road_nodes', 'road_segments'];
    const counts = async () => [...(await Promise.all(tables.map((t) => countRows(ctx, t)))), (await ctx.pool.query("SELECT count(*)::int AS n FROM audit_events WHERE action NOT LIKE 'import.%'")).rows[0].n];
    const before = await counts();
    const failure = await importRefused(planner, planId, 'road-layer', file('tests/fixtures/geo/broken-roads.geojson'), 'broken.geojson');
    expect(failure.code).toBe('badFeatures');
    expect(failure.badFeatures.length).toBeGreaterThan(1);
    for (const bad of failure.badFeatures) expect(bad.problem.length).toBeGreaterThan(5);
    expect(await counts()).toEqual(before);
    expect((await planner.agent.get(`/api/plans/${planId}/road-layer`).expect(200)).body.layer).toBeNull();
  });

  it('a second upload replaces the active layer and keeps the first for old runs', async () => {
    const planId = await newPlan('Twice');
    const first = await upload(planId, file('tests/fixtures/osm/West-Oakland.osm.bz2'), 'a.osm.bz2');
    const second = await upload(planId, file('server/seed/demo-town/roads.geojson'), 'b.geojson');
    expect((await planner.agent.get(`/api/plans/${planId}/road-layer`)).body.layer.id).toBe(second.id);
    expect((await stored(first.id)).segments).toBe(first.segmentCount);
  });
});

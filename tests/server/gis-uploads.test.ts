// County GIS files through the API into the real database: a zipped Shapefile in a state-plane
// CRS with the planner's mapping, its schema read for the mapping step, shelters and zones
// from CSV (imported as jobs); and hostile files of each new format refused readably by their
// import job with no row written.
import { join } from 'node:path';
import { strToU8, unzipSync, zipSync } from 'fflate';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { fileSchemaSchema } from '../../shared/api/road-import';
import { tool, westOaklandWorkspace, zipFolder } from '../shared/gis/reference-tools';
import { expectReadableFailure } from './support/readable-refusal';
import { imported, importedRoadLayer, importRefused } from './support/import-jobs';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './support/test-app';

// Each import's job starts a reading thread, which loads the readers (slow on a busy machine).
vi.setConfig({ testTimeout: 120_000 });

let ctx: TestContext;
let planner: SignedInAgent;
let planId: string;
let shpZip: Uint8Array;

beforeAll(async () => {
  ctx = await createTestContext({}, { withRunWorker: true });
  planner = await signInAs(ctx.app, 'planner');
  planId = (await planner.agent.post('/api/plans').set('x-csrf-token', planner.csrf).send({ name: 'County files' }).expect(201)).body.id;
  const w = westOaklandWorkspace();
  const dir = join(w.dir, 'shp');
  tool('ogr2ogr', ['-q', '-f', 'ESRI Shapefile', '-lco', 'ENCODING=UTF-8', '-t_srs', 'EPSG:2227', dir, w.osm, 'lines', '-nln', 'centerlines'], { env: w.env });
  shpZip = zipFolder(dir);
});
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

function post(path: string, bytes: Uint8Array, fileName: string) {
  return planner.agent.post(`/api/plans/${planId}/${path}`).set('x-csrf-token', planner.csrf).attach('file', Buffer.from(bytes), fileName);
}

async function writable(): Promise<Record<string, unknown>> {
  const { rows } = await ctx.pool.query(`SELECT (SELECT count(*) FROM road_layers)::int AS layers, (SELECT count(*) FROM road_segments)::int AS segments,
    (SELECT count(*) FROM zones)::int AS zones, (SELECT count(*) FROM shelters)::int AS shelters, (SELECT count(*) FROM audit_events WHERE action NOT LIKE 'import.%')::int AS audit,
    (SELECT sum(data_version) FROM plans)::int AS versions`);
  return rows[0];
}

describe('a county Shapefile', () => {
  it('the schema read names the fields, samples, CRS and extent, and writes nothing', async () => {
    const before = await writable();
    const res = await post('file-schema', shpZip, 'centerlines.zip').expect(200);
    const schema = fileSchemaSchema.parse(res.body);
    expect(schema.format).toBe('shapefile');
    expect(schema.sourceCrs?.name).toBe('NAD_1983_StatePlane_California_III_FIPS_0403_Feet');
    expect(schema.fields.find((f) => f.name === 'highway')?.samples).toContain('residential');
    expect(schema.geometryTypes['LineString']).toBe(schema.featureCount);
    // West Oakland's bounds (PROVENANCE.md: −122.30258…−122.29825, 37.80615…37.80914) lie inside the extent of its ways.
    const [w, s, e, n] = schema.extent!;
    expect(w).toBeLessThan(-122.30258);
    expect(e).toBeGreaterThan(-122.29825);
    expect(s).toBeLessThan(37.80615);
    expect(n).toBeGreaterThan(37.80914);
    expect(await writable()).toEqual(before);
  });

  it('imports with the mapping and keeps the source CRS on the layer', async () => {
    const options = { propertyMapping: { roadClass: 'highway', name: 'name', lanes: 'lanes', oneway: 'oneway' } };
    const layer = await importedRoadLayer(planner, planId, shpZip, 'centerlines.zip', { options });
    expect(layer.report.sourceFormat).toBe('shapefile');
    expect(layer.report.sourceCrs.name).toBe('NAD_1983_StatePlane_California_III_FIPS_0403_Feet');
    expect(layer.segmentCount).toBe(layer.report.segmentCount);
    const again = (await planner.agent.get(`/api/plans/${planId}/road-layer`).expect(200)).body.layer;
    expect(again.report.sourceCrs.name).toBe('NAD_1983_StatePlane_California_III_FIPS_0403_Feet');
  });
});

describe('shelters and zones from CSV with the planner’s columns', () => {
  it('shelters in state-plane feet with a capacity column', async () => {
    const csv = 'SITE_NAME,X_COORD,Y_COORD,CAP_PERS\nArmory Hall,6050000,2115000,240\nNorth School,6051500,2116200,180\n';
    const plan = (await planner.agent.post('/api/plans').set('x-csrf-token', planner.csrf).send({ name: 'CSV shelters' }).expect(201)).body.id;
    await imported(planner, plan, 'shelters', strToU8(csv), 'shelters.csv', {
      options: { source: { crs: 'EPSG:2227', xColumn: 'X_COORD', yColumn: 'Y_COORD' }, fields: { name: 'SITE_NAME', capacityPersons: 'CAP_PERS' } },
    });
    const shelters = (await planner.agent.get(`/api/plans/${plan}/shelters`).expect(200)).body.shelters;
    expect(shelters.map((s: { name: string; capacityPersons: number }) => [s.name, s.capacityPersons])).toEqual([
      ['Armory Hall', 240],
      ['North School', 180],
    ]);
  });
  it('zones as points with a population and a participation in percent', async () => {
    const csv = 'ZONE,lon,lat,POP,PART_PCT\nWard A,-122.300,37.807,1200,80\n';
    const plan = (await planner.agent.post('/api/plans').set('x-csrf-token', planner.csrf).send({ name: 'CSV zones' }).expect(201)).body.id;
    await imported(planner, plan, 'zones', strToU8(csv), 'zones.csv', { options: { fields: { name: 'ZONE', population: 'POP', participationRate: 'PART_PCT' } } });
    const zones = (await planner.agent.get(`/api/plans/${plan}/zones`).expect(200)).body.zones;
    expect(zones).toHaveLength(1);
    expect(zones[0]).toMatchObject({ name: 'Ward A', population: 1200, participationRate: 0.8 });
    expect(zones[0].geometry.type).toBe('Polygon');
  });
});

/** A zip whose .shp inflates (by its headers) to `declared` bytes: built small, then its sizes set as a bomb's are. */
function zipBomb(declared: number): Uint8Array {
  const zip = zipSync({ 'r.shp': new Uint8Array(1024 * 1024), 'r.dbf': new Uint8Array(10) }, { level: 9 });
  const view = new DataView(zip.buffer, zip.byteOffset, zip.byteLength);
  for (let i = 0; i + 4 <= zip.length; i += 1) {
    const signature = view.getUint32(i, true);
    const name = (offset: number) => String.fromCharCode(zip[offset]!, zip[offset + 1]!, zip[offset + 2]!, zip[offset + 3]!, zip[offset + 4]!);
    if (signature === 0x04034b50 && name(i + 30) === 'r.shp') view.setUint32(i + 22, declared, true);
    if (signature === 0x02014b50 && name(i + 46) === 'r.shp') view.setUint32(i + 24, declared, true);
  }
  return zip;
}

describe('hostile files of the new formats: refused readably by their import job, nothing written', () => {
  const entries = () => unzipSync(shpZip);
  const cases: ['road-layer' | 'zones' | 'shelters', string, () => Uint8Array, string][] = [
    ['road-layer', 'a truncated zip', () => shpZip.subarray(0, Math.floor(shpZip.length / 2)), 'roads.zip'],
    ['road-layer', 'a .shp without a .dbf', () => { const e = entries(); delete e['centerlines.dbf']; return zipSync(e); }, 'roads.zip'],
    ['road-layer', 'a wrong .prj', () => { const e = entries(); e['centerlines.prj'] = strToU8('PROJCS["nothing"'); return zipSync(e); }, 'roads.zip'],
    ['road-layer', 'a GeoPackage that is not SQLite', () => strToU8('SQLite format 3\u0000' + 'x'.repeat(200)), 'roads.gpkg'],
    ['road-layer', 'a zip bomb (declaring 600 MB inside a few kilobytes)', () => zipBomb(600 * 1024 * 1024), 'roads.zip'],
    ['road-layer', 'KML with entities', () => strToU8('<?xml version="1.0"?><!DOCTYPE kml [<!ENTITY a "aaaa"><!ENTITY b "&a;&a;&a;">]><kml><Document><name>&b;</name></Document></kml>'), 'roads.kml'],
    ['road-layer', 'a PBF cut short', () => Uint8Array.from([0, 0, 0, 14, 0x0a, 9, ...strToU8('OSMHeader'), 0x18, 0x7f]), 'roads.osm.pbf'],
    ['zones', 'a truncated zip', () => shpZip.subarray(0, 1000), 'zones.zip'],
    ['shelters', 'a KMZ with entities', () => zipSync({ 'doc.kml': strToU8('<!DOCTYPE kml [<!ENTITY x SYSTEM "file:///etc/passwd">]><kml/>') }), 'shelters.kmz'],
  ];
  it.each(cases)('%s: %s', async (kind, _what, bytes, fileName) => {
    const before = await writable();
    const failure = await importRefused(planner, planId, kind, bytes(), fileName);
    expectReadableFailure(failure, `${kind} ${fileName}`);
    expect(failure.message.startsWith(fileName)).toBe(true);
    expect(await writable()).toEqual(before);
  });
});

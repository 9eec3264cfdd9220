// The West Oakland OpenStreetMap extract (tests/fixtures/osm/PROVENANCE.md) written by GDAL's
// ogr2ogr (Debian gdal-bin, run here) as a county would send it — a zipped Shapefile in
// EPSG:2227 (California zone III, US survey feet), a GeoPackage in EPSG:26910 (UTM 10N), a
// GeoJSON with a `crs` member, a KML — and by osmium-tool as OSM PBF: each imports to the
// same nodes, segments and total length (within 0.1 %) as the OSM XML itself.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it, vi } from 'vitest';

vi.setConfig({ testTimeout: 60_000 });
import type { PropertyMapping } from '../../../shared/api/road-import';
import type { RoadGraph } from '../../../shared/geo/build-road-graph';
import { importRoadLayer, importRoadLayerUpload } from '../../../server/import/import-road-layer';
import { tool, westOaklandBz2, westOaklandWorkspace, zipFolder } from './reference-tools';

// GDAL's OSM driver gives the tags as fields of these names (osmconf.ini in reference-tools.ts).
const mapping: PropertyMapping = { roadClass: 'highway', classValues: {}, onewayValues: {}, name: 'name', lanes: 'lanes', oneway: 'oneway', speed: 'maxspeed', speedUnit: 'kmh', bridge: 'bridge', tunnel: 'tunnel', layer: 'layer' };
// OpenStreetMap ways meet at shared nodes; GIS copies of them keep those vertices, so no crossing is split.
const options = { propertyMapping: mapping, splitAtCrossings: false };

const reference = importRoadLayer(westOaklandBz2, {}, 'West-Oakland.osm.bz2');
let w: ReturnType<typeof westOaklandWorkspace>;

function ogr(args: string[]): void {
  tool('ogr2ogr', ['-q', ...args], { env: w.env });
}

function expectSameNetwork(n: RoadGraph): void {
  expect(n.nodes.length).toBe(reference.nodes.length);
  expect(n.segments.length).toBe(reference.segments.length);
  expect(Math.abs(n.report.totalLengthMeters - reference.report.totalLengthMeters) / reference.report.totalLengthMeters).toBeLessThan(0.001);
  expect(n.report.arcCount).toBe(reference.report.arcCount);
}

beforeAll(() => {
  w = westOaklandWorkspace();
});

describe('West Oakland through ogr2ogr and osmium', () => {
  it('the reference: the OSM XML has 40 nodes and 47 segments', () => {
    // Counted independently in west-oakland.test.ts; restated so a change there shows here.
    expect([reference.nodes.length, reference.segments.length]).toEqual([40, 47]);
  });

  it('zipped Shapefile in EPSG:2227 (.prj in ESRI WKT, .cpg UTF-8)', async () => {
    const dir = join(w.dir, 'shp2227');
    ogr(['-f', 'ESRI Shapefile', '-lco', 'ENCODING=UTF-8', '-t_srs', 'EPSG:2227', dir, w.osm, 'lines', '-nln', 'roads']);
    const n = await importRoadLayerUpload(zipFolder(dir), options, 'roads.zip');
    expectSameNetwork(n);
    expect(n.report.sourceFormat).toBe('shapefile');
    expect(n.report.sourceCrs?.name).toBe('NAD_1983_StatePlane_California_III_FIPS_0403_Feet');
  });

  it('GeoPackage in EPSG:26910', async () => {
    const file = join(w.dir, 'roads26910.gpkg');
    ogr(['-f', 'GPKG', '-t_srs', 'EPSG:26910', file, w.osm, 'lines', '-nln', 'roads']);
    const n = await importRoadLayerUpload(readFileSync(file), options, 'roads.gpkg');
    expectSameNetwork(n);
    expect(n.report.sourceCrs).toMatchObject({ epsg: 26910, name: 'NAD83 / UTM zone 10N' });
  });

  it('GeoJSON with a crs member naming EPSG:2227 as an OGC URN', async () => {
    const file = join(w.dir, 'roads2227.geojson');
    ogr(['-f', 'GeoJSON', '-lco', 'RFC7946=NO', '-t_srs', 'EPSG:2227', file, w.osm, 'lines']);
    expect(JSON.parse(readFileSync(file, 'utf8')).crs.properties.name).toBe('urn:ogc:def:crs:EPSG::2227');
    const n = await importRoadLayerUpload(readFileSync(file), options, 'roads.geojson');
    expectSameNetwork(n);
    expect(n.report.sourceCrs?.epsg).toBe(2227);
  });

  it('KML (always WGS84)', async () => {
    const file = join(w.dir, 'roads.kml');
    ogr(['-f', 'KML', file, w.osm, 'lines']);
    const n = await importRoadLayerUpload(readFileSync(file), options, 'roads.kml');
    expectSameNetwork(n);
    expect(n.report.sourceFormat).toBe('kml');
  });

  it('OSM PBF written by osmium', async () => {
    const file = join(w.dir, 'West-Oakland.osm.pbf');
    tool('osmium', ['cat', w.osm, '-o', file, '--overwrite']);
    const n = await importRoadLayerUpload(readFileSync(file), {}, 'West-Oakland.osm.pbf');
    expect(n.report.sourceFormat).toBe('osmPbf');
    expect(n.nodes).toEqual(reference.nodes);
    expect(n.segments).toEqual(reference.segments);
  });

  it('the network command reads the same zipped Shapefile with a mapping file (the upload form\'s mapping)', async () => {
    const dir = join(w.dir, 'cli');
    ogr(['-f', 'ESRI Shapefile', '-t_srs', 'EPSG:2227', dir, w.osm, 'lines', '-nln', 'roads']);
    const { writeFileSync } = await import('node:fs');
    const zip = join(w.dir, 'cli.zip');
    writeFileSync(zip, zipFolder(dir));
    const mappingFile = join(w.dir, 'mapping.json');
    writeFileSync(mappingFile, JSON.stringify({ roads: mapping }));
    const out = JSON.parse(tool(process.execPath, ['--import', 'tsx', 'server/cli/road-summary.ts', zip, '--mapping', mappingFile, '--no-split-crossings']));
    expect([out.format, out.nodes, out.segments, out.arcs]).toEqual(['shapefile', reference.nodes.length, reference.segments.length, reference.report.arcCount]);
  });

  it('a projected Shapefile without its .prj is refused, naming EPSG:2227 among the codes its extent suggests', async () => {
    const dir = join(w.dir, 'noprj');
    ogr(['-f', 'ESRI Shapefile', '-t_srs', 'EPSG:2227', dir, w.osm, 'lines', '-nln', 'roads']);
    const files = zipFolder(dir);
    const { unzipSync, zipSync } = await import('fflate');
    const entries = unzipSync(files);
    delete entries['roads.prj'];
    const error = await importRoadLayerUpload(zipSync(entries), options, 'roads.zip').catch((e: unknown) => e);
    expect((error as { failure: { code: string; message: string } }).failure.code).toBe('wrongCrs');
    expect((error as { failure: { message: string } }).failure.message).toMatch(/does not say which coordinate system/);
    expect((error as { failure: { message: string } }).failure.message).toContain('EPSG:2227');
    // The planner's answer lets it in.
    expectSameNetwork(await importRoadLayerUpload(zipSync(entries), { ...options, source: { crs: 'EPSG:2227' } }, 'roads.zip'));
  });
});

// The plan's inputs written as GeoPackage, zipped Shapefile, KML and GeoJSON, checked two ways:
// GDAL's ogrinfo (Debian gdal-bin, run here) reads every file with the layers, feature counts,
// fields and spatial reference we meant; and each file read back by Cutline's own import gives
// the road layer it came from — every segment's geometry within 1 cm (haversine), its class,
// lanes, capacity and name — for the West Oakland OpenStreetMap extract
// (tests/fixtures/osm/PROVENANCE.md) with a few planner's edits on top.
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { unzipSync } from 'fflate';
import * as shapefile from 'shapefile';
import { beforeAll, describe, expect, it, vi } from 'vitest';
import type { NetworkSegment } from '../../../shared/api/road-attributes';
import type { RoadGraph } from '../../../shared/geo/build-road-graph';
import { defaultCapacityTable } from '../../../shared/model/capacity-defaults';
import type { ExportBundle } from '../../../shared/format/export-tables';
import { roadInputsMapping, roadInputsTable, shelterInputsTable, zoneInputsTable, type RoadInput } from '../../../shared/format/inputs-export';
import type { UnitSystem } from '../../../shared/api/units';
import { importRoadLayer, importRoadLayerUpload } from '../../../server/import/import-road-layer';
import { readZonesUpload } from '../../../server/import/import-zones-and-shelters';
import { writeGeoJson } from '../../../server/export/write-geojson';
import { writeGeoPackage } from '../../../server/export/write-geopackage';
import { writeKml } from '../../../server/export/write-kml';
import { writeShapefileZip } from '../../../server/export/write-shapefile-zip';
import { tool, westOaklandBz2 } from '../gis/reference-tools';

vi.setConfig({ testTimeout: 60_000 });

const table = defaultCapacityTable();
let graph: RoadGraph;
let roads: RoadInput[];
let dir: string;

// Invented places for the check (not the demo town): a zone with a hole, a zone in two parts, two shelters.
const zones = [
  {
    id: 1, name: 'Harbour flats', population: 1200, participationRate: 0.9, personsPerVehicle: 2.5, departureCurve: { kind: 'allAtOnce' as const },
    // RFC 7946 §3.1.6 order (outer ring counter-clockwise, hole clockwise): the Shapefile writer must turn both.
    geometry: { type: 'Polygon' as const, coordinates: [
      [[-122.303, 37.806], [-122.298, 37.806], [-122.298, 37.809], [-122.303, 37.809], [-122.303, 37.806]] as [number, number][],
      [[-122.301, 37.807], [-122.301, 37.808], [-122.300, 37.808], [-122.300, 37.807], [-122.301, 37.807]] as [number, number][],
    ] },
  },
  {
    id: 2, name: 'Yard row', population: 300, participationRate: 1, personsPerVehicle: 2, departureCurve: { kind: 'uniform' as const, durationHours: 2 },
    geometry: { type: 'MultiPolygon' as const, coordinates: [
      [[[-122.31, 37.80], [-122.309, 37.80], [-122.309, 37.801], [-122.31, 37.80]]] as [number, number][][],
      [[[-122.308, 37.80], [-122.307, 37.80], [-122.307, 37.801], [-122.308, 37.80]]] as [number, number][][],
    ] },
  },
];
const shelters = [
  { id: 7, name: 'Grain hall', capacityPersons: 400, lon: -122.2995, lat: 37.8085 },
  { id: 8, name: 'East exit', capacityPersons: null, lon: -122.297, lat: 37.807 },
];

function bundle(system: UnitSystem): ExportBundle {
  return {
    identity: [['caution', 'A planning aid, not an order.'], ['contents', 'Plan inputs'], ['plan', 'Check plan']],
    tables: [roadInputsTable(roads, table, system), zoneInputsTable(zones), shelterInputsTable(shelters)],
  };
}

function file(name: string, bytes: Uint8Array | string): string {
  const path = join(dir, name);
  writeFileSync(path, bytes);
  return path;
}

/** ogrinfo's summary of every layer (-so -al), read-only. */
function ogrinfo(source: string): string {
  return tool('ogrinfo', ['-ro', '-so', '-al', source]);
}

/** One layer's block of an ogrinfo summary. */
function layerBlock(info: string, layer: string): string {
  const start = info.indexOf(`Layer name: ${layer}\n`);
  expect(start, `ogrinfo lists layer ${layer}`).toBeGreaterThanOrEqual(0);
  const next = info.indexOf('Layer name: ', start + 1);
  return info.slice(start, next < 0 ? undefined : next);
}

const rad = Math.PI / 180;
/** Haversine distance on the mean Earth radius 6,371,008.8 m (IUGG), metres. */
function haversine(a: [number, number], b: [number, number]): number {
  const dLat = (b[1] - a[1]) * rad;
  const dLon = (b[0] - a[0]) * rad;
  const h = Math.sin(dLat / 2) ** 2 + Math.cos(a[1] * rad) * Math.cos(b[1] * rad) * Math.sin(dLon / 2) ** 2;
  return 2 * 6_371_008.8 * Math.asin(Math.sqrt(h));
}

// Two roads may join the same two junctions: their vertex counts tell them apart here.
const key = (c: [number, number][]) => `${c[0]![0].toFixed(6)},${c[0]![1].toFixed(6)}>${c.at(-1)![0].toFixed(6)},${c.at(-1)![1].toFixed(6)}/${c.length}`;

/** Every original segment has one read back with the same ends, vertices within 1 cm, class, lanes, capacity and name. */
function expectSameRoads(back: RoadGraph): void {
  expect(back.segments.length).toBe(roads.length);
  const byEnds = new Map<string, NetworkSegment>(back.segments.map((s) => [key(s.coordinates), s]));
  let worst = 0;
  for (const r of roads) {
    const s = byEnds.get(key(r.coordinates));
    expect(s, `segment ${r.id} read back`).toBeDefined();
    expect(s!.coordinates.length).toBe(r.coordinates.length);
    r.coordinates.forEach((p, i) => (worst = Math.max(worst, haversine(p, s!.coordinates[i]!))));
    const a = r.attributes;
    const b = s!.attributes;
    expect([b.roadClass, b.lanesForward, b.lanesBackward, b.oneway, b.name, b.closed, b.capacityOverrideVehPerHourPerLane, b.bridge, b.tunnel, b.layer]).toEqual([
      a.roadClass, a.lanesForward, a.lanesBackward, a.oneway, a.name, a.closed, a.capacityOverrideVehPerHourPerLane, a.bridge, a.tunnel, a.layer,
    ]);
    if (a.speedKmh === null) expect(b.speedKmh).toBeNull();
    else expect(b.speedKmh).toBeCloseTo(a.speedKmh, 9);
  }
  expect(worst).toBeLessThan(0.01);
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'cutline-export-'));
  graph = importRoadLayer(westOaklandBz2, {}, 'West-Oakland.osm.bz2');
  roads = graph.segments.map((s, i) => ({ id: 100 + i, coordinates: s.coordinates, lengthMeters: s.lengthMeters, sourceId: s.sourceId, attributes: { ...s.attributes } }));
  // A planner's edits: a closure, a capacity override, a lane change on a two-way road, a speed
  // entered in mph, and a name that needs UTF-8.
  roads[0]!.attributes.closed = true;
  roads[1]!.attributes.capacityOverrideVehPerHourPerLane = 1234.5;
  const twoWay = roads.find((r) => !r.attributes.oneway)!;
  twoWay.attributes.lanesForward = 3;
  twoWay.attributes.lanesBackward = 2;
  twoWay.attributes.name = 'Quai Bérénice – Øster Allé';
  roads[3]!.attributes.speedKmh = 35 * 1.609344;
});

describe('the plan inputs as files', () => {
  it('the edits are there to check (a closure, an override, lanes, a UTF-8 name, a speed)', () => {
    expect(roads.length).toBe(47);
    expect(roads.some((r) => r.attributes.closed)).toBe(true);
    expect(roads.some((r) => r.attributes.name === 'Quai Bérénice – Øster Allé' && r.attributes.lanesForward === 3)).toBe(true);
  });

  it('GeoPackage: ogrinfo reads three layers in EPSG:4326 with their counts and fields, and the metadata table', async () => {
    const path = file('inputs.gpkg', await writeGeoPackage(bundle('us-customary')));
    const info = ogrinfo(path);
    const r = layerBlock(info, 'roads');
    expect(r).toContain('Geometry: Line String');
    expect(r).toContain('Feature Count: 47');
    expect(r).toMatch(/ID\["EPSG",4326\]|AUTHORITY\["EPSG","4326"\]/);
    for (const f of ['seg_id: Integer', 'name: String', 'road_class: String', 'oneway: Integer(Boolean)', 'lanes_fwd: Integer', 'speed_mph: Real', 'cap_lane: Real', 'cap_fwd: Real', 'closed: Integer(Boolean)', 'length_ft: Real']) {
      expect(r).toContain(f);
    }
    const z = layerBlock(info, 'zones');
    expect(z).toContain('Geometry: Multi Polygon');
    expect(z).toContain('Feature Count: 2');
    const s = layerBlock(info, 'shelters');
    expect(s).toContain('Geometry: Point');
    expect(s).toContain('Feature Count: 2');
    const m = layerBlock(info, 'cutline_export');
    expect(m).toContain('Geometry: None');
    expect(m).toContain('Feature Count: 3');
    // The caution itself, as GDAL reads the row.
    const rows = tool('ogrinfo', ['-ro', '-al', '-q', path, 'cutline_export']);
    expect(rows).toContain('value (String) = A planning aid, not an order.');
    // The column's unit, from gpkg_data_columns (GeoPackage Schema extension) through GDAL's SQLite dialect.
    expect(tool('ogrinfo', ['-ro', '-q', path, '-sql', "SELECT description FROM gpkg_data_columns WHERE table_name='roads' AND column_name='speed_mph'"])).toContain('(mph)');
  });

  it('GeoPackage: read back by the import (layer roads) it is the same road layer, within 1 cm', async () => {
    const bytes = await writeGeoPackage(bundle('us-customary'));
    expectSameRoads(await importRoadLayerUpload(bytes, { propertyMapping: roadInputsMapping('us-customary'), source: { layer: 'roads' } }, 'inputs.gpkg'));
  });

  it('zipped Shapefile: ogrinfo reads each layer with its .prj as EPSG:4326 and its UTF-8 text', () => {
    const zip = writeShapefileZip(bundle('metric'));
    const names = Object.keys(unzipSync(zip)).sort();
    expect(names).toEqual(['cutline-export.txt', ...['roads', 'shelters', 'zones'].flatMap((n) => ['cpg', 'dbf', 'prj', 'shp', 'shx'].map((e) => `${n}.${e}`))].sort());
    const path = file('inputs.zip', zip);
    const info = ogrinfo(`/vsizip/${path}`);
    const r = layerBlock(info, 'roads');
    expect(r).toContain('Geometry: Line String');
    expect(r).toContain('Feature Count: 47');
    expect(r).toMatch(/GEOGCRS\["WGS 84"|GEOGCS\["WGS 84"|GEOGCS\["GCS_WGS_1984"/);
    for (const f of ['seg_id: Integer64', 'name: String', 'road_class: String', 'oneway: String (1.0)', 'speed_kmh: Real', 'cap_lane: Real', 'length_m: Real']) expect(r).toContain(f);
    expect(layerBlock(info, 'zones')).toContain('Geometry: Polygon');
    expect(layerBlock(info, 'zones')).toContain('Feature Count: 2');
    expect(layerBlock(info, 'shelters')).toContain('Geometry: Point');
    // The UTF-8 name as GDAL reads it (the .cpg tells it the encoding).
    expect(tool('ogrinfo', ['-ro', '-q', `/vsizip/${path}`, 'roads', '-where', 'lanes_fwd = 3'])).toContain('Quai Bérénice – Øster Allé');
    // The caution rides in the read-me beside the layers.
    expect(new TextDecoder().decode(unzipSync(zip)['cutline-export.txt'])).toMatch(/^caution: A planning aid/);
  });

  it('zipped Shapefile: the `shapefile` reader sees one record per road (not one multi-part record) and polygon rings turned as the specification asks', async () => {
    const files = unzipSync(writeShapefileZip(bundle('metric')));
    const read = await shapefile.read(files['roads.shp']!.slice().buffer, files['roads.dbf']!.slice().buffer, { encoding: 'utf-8' });
    expect(read.features.length).toBe(47);
    expect(read.features.every((f) => f.geometry.type === 'LineString')).toBe(true);
    const zonesBack = await shapefile.read(files['zones.shp']!.slice().buffer, files['zones.dbf']!.slice().buffer);
    // The `shapefile` reader turns clockwise rings into outer rings and counter-clockwise ones into holes
    // (ESRI Shapefile Technical Description, 1998: "the vertices of a polygon's outer ring are in clockwise order").
    expect(zonesBack.features[0]!.geometry).toMatchObject({ type: 'Polygon' });
    expect((zonesBack.features[0]!.geometry as { coordinates: unknown[] }).coordinates.length).toBe(2);
    expect(zonesBack.features[1]!.geometry.type).toBe('MultiPolygon');
  });

  it('zipped Shapefile: read back by the import (layer roads) it is the same road layer, within 1 cm', async () => {
    const zip = writeShapefileZip(bundle('metric'));
    expectSameRoads(await importRoadLayerUpload(zip, { propertyMapping: roadInputsMapping('metric'), source: { layer: 'roads' } }, 'inputs.zip'));
  });

  it('GeoJSON: the caution and each column\'s unit ride as foreign members; read back it is the same road layer', async () => {
    const b = bundle('us-customary');
    const text = writeGeoJson(b, b.tables[0]!);
    const json = JSON.parse(text);
    expect(json.cutline.caution).toMatch(/planning aid/);
    expect(json.cutline_columns.speed_mph).toMatch(/\(mph\)$/);
    const info = ogrinfo(file('roads.geojson', text));
    expect(layerBlock(info, 'roads')).toContain('Feature Count: 47');
    expectSameRoads(await importRoadLayerUpload(new TextEncoder().encode(text), { propertyMapping: roadInputsMapping('us-customary') }, 'roads.geojson'));
  });

  it('KML: ogrinfo reads a folder per table and the document carries the caution; read back the roads are the same', async () => {
    const kml = writeKml(bundle('metric'));
    expect(kml).toMatch(/<Document>\s*<name>Plan inputs<\/name>\s*<description>caution: A planning aid/);
    const info = ogrinfo(file('inputs.kml', kml));
    expect(layerBlock(info, 'roads')).toContain('Feature Count: 47');
    expect(layerBlock(info, 'zones')).toContain('Feature Count: 2');
    expect(layerBlock(info, 'shelters')).toContain('Feature Count: 2');
    const roadsOnly = writeKml({ ...bundle('metric'), tables: [bundle('metric').tables[0]!] });
    expectSameRoads(await importRoadLayerUpload(new TextEncoder().encode(roadsOnly), { propertyMapping: roadInputsMapping('metric') }, 'roads.kml'));
  });

  it('zones read back from the GeoPackage keep their population and shape', async () => {
    const bytes = await writeGeoPackage(bundle('metric'));
    const back = await readZonesUpload(bytes, { source: { layer: 'zones' }, fields: { name: 'name', population: 'population', participationRate: 'share_out', personsPerVehicle: 'pers_veh' } }, 'inputs.gpkg');
    expect(back.map((z) => [z.attributes.name, z.attributes.population, z.attributes.participationRate, z.attributes.personsPerVehicle, z.attributes.departureCurve])).toEqual(
      zones.map((z) => [z.name, z.population, z.participationRate, z.personsPerVehicle, z.departureCurve]),
    );
    // The GeoPackage column is MULTIPOLYGON: the zone with a hole comes back as one polygon of two rings.
    expect(back[0]!.geometry.coordinates.flat(2)).toEqual(zones[0]!.geometry.coordinates.flat(1));
    expect(back[1]!.geometry).toEqual(zones[1]!.geometry);
  });
});

// Broken and hostile files for each new reader: each is refused with a RoadImportError whose
// message names the file and what is wrong (nothing is returned, so nothing can be saved; the
// API test tests/server/hostile-gis-uploads.test.ts checks that no row is written).
// Refusals that suggest EPSG codes try every projected system of the EPSG index: seconds.
vi.setConfig({ testTimeout: 60_000 });
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { strToU8, unzipSync, zipSync } from 'fflate';
import { beforeAll, describe, expect, it, vi } from 'vitest';
import { importRoadLayerUpload } from '../../../server/import/import-road-layer';
import { readSheltersUpload } from '../../../server/import/import-zones-and-shelters';
import { RoadImportError } from '../../../shared/geo/road-import-error';
import { tool, westOaklandWorkspace, zipFolder } from './reference-tools';

const mapping = { roadClass: 'highway', classValues: {}, onewayValues: {}, speedUnit: 'kmh' as const };

async function refusal(p: Promise<unknown>): Promise<{ code: string; message: string }> {
  const e = await p.then(
    () => undefined,
    (error: unknown) => error,
  );
  expect(e, 'the file was taken').toBeInstanceOf(RoadImportError);
  return (e as RoadImportError).failure;
}

let shpZip: Uint8Array;
let gpkg: Uint8Array;
let pbf: Uint8Array;

beforeAll(() => {
  const w = westOaklandWorkspace();
  const dir = join(w.dir, 'shp');
  tool('ogr2ogr', ['-q', '-f', 'ESRI Shapefile', '-lco', 'ENCODING=UTF-8', '-t_srs', 'EPSG:2227', dir, w.osm, 'lines', '-nln', 'roads'], { env: w.env });
  shpZip = zipFolder(dir);
  tool('ogr2ogr', ['-q', '-f', 'GPKG', '-t_srs', 'EPSG:26910', join(w.dir, 'r.gpkg'), w.osm, 'lines', '-nln', 'roads'], { env: w.env });
  gpkg = readFileSync(join(w.dir, 'r.gpkg'));
  tool('osmium', ['cat', w.osm, '-o', join(w.dir, 'r.osm.pbf'), '--overwrite']);
  pbf = readFileSync(join(w.dir, 'r.osm.pbf'));
});

describe('zipped Shapefiles', () => {
  it('a truncated zip', async () => {
    for (const cut of [0.3, 0.6, 0.95]) {
      const f = await refusal(importRoadLayerUpload(shpZip.subarray(0, Math.floor(shpZip.length * cut)), { propertyMapping: mapping }, 'roads.zip'));
      expect(f.code).toBe('unreadableFile');
      expect(f.message).toMatch(/^roads\.zip: the zip archive is corrupt or cut short/);
    }
  });
  it('a .shp without its .dbf', async () => {
    const entries = unzipSync(shpZip);
    delete entries['roads.dbf'];
    const f = await refusal(importRoadLayerUpload(zipSync(entries), { propertyMapping: mapping }, 'roads.zip'));
    expect(f.message).toMatch(/roads\.shp has no roads\.dbf beside it/);
  });
  it('a .dbf without its .shp', async () => {
    const entries = unzipSync(shpZip);
    delete entries['roads.shp'];
    expect((await refusal(importRoadLayerUpload(zipSync(entries), { propertyMapping: mapping }, 'roads.zip'))).message).toMatch(/holds a \.dbf table but no \.shp/);
  });
  it('a .prj that is not WKT', async () => {
    const entries = unzipSync(shpZip);
    entries['roads.prj'] = strToU8('this is not a projection');
    const f = await refusal(importRoadLayerUpload(zipSync(entries), { propertyMapping: mapping }, 'roads.zip'));
    expect(f.code).toBe('wrongCrs');
    expect(f.message).toMatch(/not WKT/);
  });
  it('a .prj that says WGS84 for coordinates in feet', async () => {
    const entries = unzipSync(shpZip);
    entries['roads.prj'] = strToU8('GEOGCS["GCS_WGS_1984",DATUM["D_WGS_1984",SPHEROID["WGS_1984",6378137.0,298.257223563]],PRIMEM["Greenwich",0.0],UNIT["Degree",0.0174532925199433]]');
    const f = await refusal(importRoadLayerUpload(zipSync(entries), { propertyMapping: mapping }, 'roads.zip'));
    expect(f.code).toBe('wrongCrs');
    expect(f.message).toMatch(/declared wrongly/);
    expect(f.message).toContain('EPSG:2227');
  });
  it('a .shp cut short inside the zip', async () => {
    const entries = unzipSync(shpZip);
    entries['roads.shp'] = entries['roads.shp']!.subarray(0, 300);
    const f = await refusal(importRoadLayerUpload(zipSync(entries), { propertyMapping: mapping }, 'roads.zip'));
    expect(f.code).toBe('unreadableFile');
  });
  it('a zip bomb: refused from the sizes it declares, before anything is inflated', { timeout: 30_000 }, async () => {
    const bomb = zipSync({ 'roads.shp': new Uint8Array(24 * 1024 * 1024), 'roads.dbf': new Uint8Array(16) }, { level: 1 });
    expect(bomb.length).toBeLessThan(200_000);
    const f = await refusal(importRoadLayerUpload(bomb, { propertyMapping: mapping }, 'roads.zip', { maxExpandedBytes: 8 * 1024 * 1024 }));
    expect(f.message).toMatch(/expands to more than 8 MB/);
  });
  it('a zip with several Shapefiles asks which layer', async () => {
    const entries = unzipSync(shpZip);
    for (const ext of ['shp', 'dbf', 'prj', 'shx', 'cpg']) entries[`other.${ext}`] = entries[`roads.${ext}`]!;
    const f = await refusal(importRoadLayerUpload(zipSync(entries), { propertyMapping: mapping }, 'roads.zip'));
    expect(f.message).toMatch(/holds 2 Shapefiles \(other, roads\); choose one layer/);
  });
});

describe('GeoPackage', () => {
  it('a file that is not SQLite', async () => {
    const f = await refusal(importRoadLayerUpload(strToU8('SQLite format 2\u0000 not really'), {}, 'roads.gpkg'));
    expect(f.code).toBe('unreadableFile');
  });
  it('an SQLite database cut short', async () => {
    const f = await refusal(importRoadLayerUpload(gpkg.subarray(0, 5000), { propertyMapping: mapping }, 'roads.gpkg'));
    expect(f.message).toMatch(/^roads\.gpkg: /);
  });
  it('a layer that is not there', async () => {
    const f = await refusal(importRoadLayerUpload(gpkg, { propertyMapping: mapping, source: { layer: 'streets' } }, 'roads.gpkg'));
    expect(f.message).toMatch(/no layer "streets" in the GeoPackage; it holds roads/);
  });
});

describe('KML', () => {
  const kml = (body: string) => strToU8(`<?xml version="1.0"?>${body}<kml xmlns="http://www.opengis.net/kml/2.2"><Document><Placemark><name>&lol;</name><LineString><coordinates>0.5,0.5 0.501,0.5</coordinates></LineString></Placemark></Document></kml>`);
  it('entity declarations (billion laughs, external entities) are refused before parsing', async () => {
    for (const doctype of ['<!DOCTYPE kml [<!ENTITY lol "lol"><!ENTITY lol2 "&lol;&lol;&lol;&lol;">]>', '<!DOCTYPE kml [<!ENTITY lol SYSTEM "file:///etc/passwd">]>']) {
      const f = await refusal(importRoadLayerUpload(kml(doctype), {}, 'roads.kml'));
      expect(f.message).toMatch(/declares a document type or entities/);
    }
  });
  it('KML that is not well-formed', async () => {
    const f = await refusal(importRoadLayerUpload(strToU8('<kml><Document><Placemark></Document></kml>'), {}, 'roads.kml'));
    expect(f.message).toMatch(/not well-formed XML/);
  });
  it('a KMZ without a .kml inside', async () => {
    const f = await refusal(importRoadLayerUpload(zipSync({ 'readme.txt': strToU8('hello') }), {}, 'roads.kmz'));
    expect(f.message).toMatch(/neither a Shapefile .* nor a KML document/);
  });
});

describe('OSM PBF', () => {
  it('cut short anywhere: refused, never a partial network', async () => {
    for (const cut of [20, 100, Math.floor(pbf.length / 2), pbf.length - 1]) {
      const f = await refusal(importRoadLayerUpload(pbf.subarray(0, cut), {}, 'roads.osm.pbf'));
      expect(f.message).toMatch(/^roads\.osm\.pbf: .*(cut short|corrupt)/);
    }
  });
  it('a corrupt compressed block', async () => {
    const broken = Uint8Array.from(pbf);
    for (let i = 200; i < 260; i += 1) broken[i] = 0x55;
    expect((await refusal(importRoadLayerUpload(broken, {}, 'roads.osm.pbf'))).code).toBe('unreadableFile');
  });
});

describe('CSV', () => {
  it('rows whose coordinates are not numbers are listed by spreadsheet row', async () => {
    const csv = 'name,longitude,latitude,capacity\nHall,-122.3,37.8,200\nSchool,west,37.8,100\nGym,,,50\n';
    const f = await refusal(readSheltersUpload(strToU8(csv), { fields: { capacityPersons: 'capacity' } }, 'shelters.csv'));
    expect(f.code).toBe('badFeatures');
    expect((await refusal(importRoadLayerUpload(strToU8(csv.split('\n').slice(0, 2).join('\n')), {}, 'shelters.csv'))).message).toMatch(/roads need lines/);
  });
  it('x/y in feet without a coordinate system: refused with the codes the extent suggests', async () => {
    const csv = 'name,x,y,capacity\nHall,6050000,2115000,200\nSchool,6051000,2116000,100\n';
    const f = await refusal(readSheltersUpload(strToU8(csv), {}, 'shelters.csv'));
    expect(f.code).toBe('wrongCrs');
    expect(f.message).toContain('EPSG:2227');
    // With the code, they are read and reprojected (cs2cs EPSG:2227 → EPSG:4269: 6050000 2115000 ftUS is 37.81° N, 122.30° W).
    const shelters = await readSheltersUpload(strToU8(csv), { source: { crs: 'EPSG:2227' }, fields: { capacityPersons: 'capacity' } }, 'shelters.csv');
    expect(shelters.map((s) => s.attributes)).toEqual([
      { name: 'Hall', capacityPersons: 200 },
      { name: 'School', capacityPersons: 100 },
    ]);
    expect(shelters[0]!.coordinates[0]).toBeCloseTo(-122.3, 1);
    expect(shelters[0]!.coordinates[1]).toBeCloseTo(37.81, 1);
  });
});

// Uploads that must fail, and fail whole: every bad feature listed with its index, id and
// problem; a declared or evident non-WGS84 CRS named as such; unreadable files named.
import { readFileSync } from 'node:fs';
import { gzipSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import type { ImportFailure } from '../../../shared/api/road-import';
import { importFailureSchema } from '../../../shared/api/road-import';
import { buildRoadGraph, RoadImportError } from '../../../shared/geo';
import { importRoadLayer } from '../../../server/import/import-road-layer';

const fixture = (name: string) => readFileSync(new URL(`../../fixtures/${name}`, import.meta.url));

function failure(run: () => unknown): ImportFailure {
  try {
    run();
  } catch (error) {
    expect(error).toBeInstanceOf(RoadImportError);
    const f = (error as RoadImportError).failure;
    expect(importFailureSchema.parse(f)).toEqual(f);
    return f;
  }
  throw new Error('expected the import to fail');
}

describe('bad features', () => {
  it('lists every malformed feature of a file, not just the first, and keeps none', () => {
    const f = failure(() => importRoadLayer(fixture('geo/broken-roads.geojson'), {}, 'broken-roads.geojson'));
    expect(f.code).toBe('badFeatures');
    expect(f.badFeatures.map((b) => [b.index, b.id])).toEqual([
      [1, 'one-position'],
      [2, 'text-coordinate'],
      [3, 'latitude-100'],
      [4, 'curve'],
      [5, 'not-a-feature'],
      [6, 'empty-multi'],
    ]);
    expect(f.badFeatures.map((b) => b.problem)).toEqual([
      'a line needs at least two positions',
      'position 1 is not [longitude, latitude]: ["0.5","0.5"]',
      'position 1 [0.5,100] is outside longitude/latitude range',
      'unknown geometry type "CircularString"',
      'not a GeoJSON Feature (type must be "Feature")',
      'MultiLineString has no coordinates',
    ]);
  });
});

describe('coordinate reference systems', () => {
  it('rejects a declared projected CRS by name', () => {
    const f = failure(() => importRoadLayer(fixture('geo/projected-declared.geojson')));
    expect(f.code).toBe('wrongCrs');
    expect(f.message).toContain('urn:ogc:def:crs:EPSG::3857');
    expect(f.message).toContain('WGS84');
  });

  it('recognises undeclared projected coordinates (metres) and says so', () => {
    const f = failure(() => importRoadLayer(fixture('geo/projected-undeclared.geojson')));
    expect(f.code).toBe('wrongCrs');
    expect(f.message).toMatch(/projected coordinate system/);
  });

  it('accepts the WGS84 names (CRS84, EPSG:4326)', () => {
    const line = { type: 'Feature', properties: { highway: 'residential' }, geometry: { type: 'LineString', coordinates: [[0, 0], [0.001, 0]] } };
    for (const name of ['urn:ogc:def:crs:OGC:1.3:CRS84', 'EPSG:4326', 'urn:ogc:def:crs:EPSG::4326']) {
      expect(buildRoadGraph({ type: 'FeatureCollection', crs: { type: 'name', properties: { name } }, features: [line] }).segments).toHaveLength(1);
    }
  });
});

describe('unreadable and empty files', () => {
  const cases: [string, Uint8Array, RegExp][] = [
    ['empty', Buffer.from('  \n'), /empty/],
    ['not JSON', Buffer.from('{ "type": "FeatureCollection", '), /not valid JSON/],
    ['a single Feature', Buffer.from('{"type":"Feature","geometry":null,"properties":{}}'), /FeatureCollection/],
    ['plain text', Buffer.from('hello'), /not GeoJSON, OpenStreetMap XML or OpenStreetMap JSON/],
    ['XML that is not OSM', Buffer.from('<?xml version="1.0"?><gpx><trk/></gpx>'), /not an OpenStreetMap XML file/],
    ['truncated OSM XML', Buffer.from('<osm version="0.6"><node id="1" lat="0" lon="0"/><way id="2"><nd ref="1"/>'), /ends inside/],
    ['a bad number in OSM XML', Buffer.from('<osm><node id="1" lat="north" lon="0"/></osm>'), /lat is not a number/],
    ['corrupt bzip2', Buffer.from('BZh91AY&SYgarbage-garbage-garbage'), /bzip2 data is corrupt/],
  ];
  for (const [what, bytes, message] of cases) {
    it(`fails ${what} as unreadableFile`, () => {
      const f = failure(() => importRoadLayer(bytes, {}, 'upload'));
      expect(f.code).toBe('unreadableFile');
      expect(f.message).toMatch(message);
    });
  }

  it('fails a layer with no drivable road as noDrivableRoads', () => {
    const path = { type: 'FeatureCollection', features: [{ type: 'Feature', properties: { highway: 'footway' }, geometry: { type: 'LineString', coordinates: [[0, 0], [0.001, 0]] } }] };
    expect(failure(() => importRoadLayer(Buffer.from(JSON.stringify(path)))).code).toBe('noDrivableRoads');
  });

  it('reads gzip-compressed uploads too', () => {
    const demo = fixture('../../server/seed/demo-town/roads.geojson');
    expect(importRoadLayer(gzipSync(demo)).segments).toEqual(importRoadLayer(demo).segments);
  });
});

// Reprojection (server/import/gis/crs.ts: proj4 with epsg-index definitions) against outside
// references: the worked examples of IOGP/EPSG Guidance Note 7-2 and PROJ's cs2cs.
import proj4 from 'proj4';
import { describe, expect, it, vi } from 'vitest';

vi.setConfig({ testTimeout: 60_000 });
import { crsFromEpsg, crsFromName, crsFromWkt, epsgCodeOfName, suggestEpsgCodes } from '../../../server/import/gis/crs';
import { RoadImportError } from '../../../shared/geo/road-import-error';
import { tool } from './reference-tools';

/** Distance between two longitude/latitude points that are millimetres apart, metres (local plane on WGS84). */
function metersApart(a: [number, number], b: [number, number]): number {
  const lat = (a[1] * Math.PI) / 180;
  const mPerDegLat = 111132.954 - 559.822 * Math.cos(2 * lat);
  const mPerDegLon = (Math.PI / 180) * 6378137 * Math.cos(lat) / Math.sqrt(1 - 0.00669438 * Math.sin(lat) ** 2);
  return Math.hypot((a[0] - b[0]) * mPerDegLon, (a[1] - b[1]) * mPerDegLat);
}

const US_FOOT = 1200 / 3937;

describe('EPSG Guidance Note 7-2 worked examples (IOGP Publication 373-7-2)', () => {
  // §3.2.1.1 Lambert Conic Conformal (2SP), EPSG method 9802: NAD27 / Texas South Central.
  // Clarke 1866; standard parallels 28°23'N and 30°17'N; false origin 27°50'N 99°00'W, FE 2,000,000 ftUS.
  // φ 28°30'00"N, λ 96°00'00"W ⇄ E 2,963,503.91 ftUS, N 254,759.80 ftUS.
  const lccWkt =
    'PROJCS["GN7-2 LCC 2SP example",GEOGCS["NAD27",DATUM["GN7-2 example datum A",SPHEROID["Clarke 1866",6378206.4,294.978698213898]],PRIMEM["Greenwich",0],UNIT["degree",0.0174532925199433]],' +
    'PROJECTION["Lambert_Conformal_Conic_2SP"],PARAMETER["standard_parallel_1",28.3833333333333],PARAMETER["standard_parallel_2",30.2833333333333],PARAMETER["latitude_of_origin",27.8333333333333],' +
    'PARAMETER["central_meridian",-99],PARAMETER["false_easting",2000000],PARAMETER["false_northing",0],UNIT["US survey foot",0.304800609601219]]';
  // §3.5.3.1 Transverse Mercator, EPSG method 9807: OSGB 1936 / British National Grid.
  // Airy 1830; origin 49°N 2°W, k0 0.9996012717, FE 400,000 m, FN −100,000 m.
  // φ 50°30'00"N, λ 00°30'00"E ⇄ E 577,274.99 m, N 69,740.49 m.
  // The datums get neutral names: proj4 would otherwise apply its own shift for a datum it
  // knows by name (OSGB 1936), and the examples are of the projections alone.
  const tmWkt =
    'PROJCS["GN7-2 TM example",GEOGCS["OSGB 1936",DATUM["GN7-2 example datum B",SPHEROID["Airy 1830",6377563.396,299.3249646]],PRIMEM["Greenwich",0],UNIT["degree",0.0174532925199433]],' +
    'PROJECTION["Transverse_Mercator"],PARAMETER["latitude_of_origin",49],PARAMETER["central_meridian",-2],PARAMETER["scale_factor",0.9996012717],PARAMETER["false_easting",400000],PARAMETER["false_northing",-100000],UNIT["metre",1]]';

  const cases = [
    { name: 'Lambert Conic Conformal (2SP)', wkt: lccWkt, lonLat: [-96, 28.5] as [number, number], en: [2963503.91, 254759.8], unit: US_FOOT, tolerance: 0.005 },
    // proj4 (and cs2cs, 577,274.9838) give an easting 5.3 mm below the published 577,274.99: GN 7-2's
    // series for TM differs at that level; within 1 cm, and within 1 mm of cs2cs (below).
    { name: 'Transverse Mercator', wkt: tmWkt, lonLat: [0.5, 50.5] as [number, number], en: [577274.99, 69740.49], unit: 1, tolerance: 0.01 },
  ];
  for (const c of cases) {
    it(`${c.name}: the forward result equals the published easting/northing (±${c.tolerance} of the unit)`, () => {
      const { crs } = crsFromWkt(c.wkt, 'example');
      // Geographic on the same ellipsoid: the example is a map projection, no datum shift.
      const geographic = crs.definition.replace(/PROJCS\["[^"]*",(GEOGCS\[.*?\]\]),PROJECTION.*$/, '$1]').replace(/\]\]\]$/, ']]');
      const [e, n] = proj4(geographic, crs.definition).forward(c.lonLat);
      expect(Math.abs(e! - c.en[0]!)).toBeLessThanOrEqual(c.tolerance);
      expect(Math.abs(n! - c.en[1]!)).toBeLessThanOrEqual(c.tolerance);
    });
    it(`${c.name}: the reverse of the published easting/northing is the published point, within the published rounding`, () => {
      const { toWgs84 } = crsFromWkt(c.wkt, 'example');
      const lonLat = toWgs84!(c.en[0]!, c.en[1]!);
      // E and N are published to 0.01 of their unit: up to 0.005 unit off on each axis (plus the TM series difference above).
      const rounding = Math.SQRT2 * c.tolerance * c.unit;
      expect(metersApart(lonLat, c.lonLat)).toBeLessThanOrEqual(rounding + 0.001);
    });
  }
});

describe("PROJ's cs2cs (Debian proj-bin) on state-plane and UTM points, to 1 mm", () => {
  // Projected → the system's own geographic CRS (NAD83, NAD83(HARN), WGS84) longitude/latitude. proj4 takes NAD83 = WGS84
  // (towgs84 0), as PROJ's null transformation does; the comparison stays on each system's own datum.
  const systems: { epsg: number; geographic: number; points: [number, number][] }[] = [
    { epsg: 2227, geographic: 4269, points: [[6050000, 2115000], [6200000, 2000000], [5950000, 2300000]] }, // California III, ftUS
    { epsg: 2229, geographic: 4269, points: [[6480000, 1840000], [6600000, 1900000]] }, // California V, ftUS
    { epsg: 2263, geographic: 4269, points: [[985000, 200000], [1050000, 250000]] }, // New York Long Island, ftUS
    { epsg: 2881, geographic: 4152, points: [[750000, 560000], [900000, 700000]] }, // Florida East (HARN), ftUS
    { epsg: 26910, geographic: 4269, points: [[561000, 4185000], [500000, 4500000], [700000, 5200000]] }, // UTM 10N
    { epsg: 32618, geographic: 4326, points: [[585000, 4511000], [300000, 4000000]] }, // WGS 84 / UTM 18N
    { epsg: 32755, geographic: 4326, points: [[320000, 5810000]] }, // WGS 84 / UTM 55S
  ];
  for (const s of systems) {
    it(`EPSG:${s.epsg}`, () => {
      const { toWgs84, crs } = crsFromEpsg(s.epsg, 'test');
      expect(crs.epsg).toBe(s.epsg);
      const input = s.points.map((p) => `${p[0]} ${p[1]}`).join('\n') + '\n';
      // EPSG geographic systems are latitude, longitude in cs2cs's output.
      const out = tool('cs2cs', ['-f', '%.12f', `EPSG:${s.epsg}`, `EPSG:${s.geographic}`], { input });
      const reference = out.trim().split('\n').map((line) => {
        const [lat, lon] = line.trim().split(/\s+/).map(Number);
        return [lon!, lat!] as [number, number];
      });
      expect(reference).toHaveLength(s.points.length);
      s.points.forEach((p, i) => {
        expect(metersApart(toWgs84!(p[0], p[1]), reference[i]!)).toBeLessThan(0.001);
      });
    });
  }
});

describe('CRS names and refusals', () => {
  it('reads EPSG codes in the forms files use, old OGC URNs included', () => {
    expect(epsgCodeOfName('EPSG:2227')).toBe(2227);
    expect(epsgCodeOfName('urn:ogc:def:crs:EPSG::26910')).toBe(26910);
    expect(epsgCodeOfName('urn:ogc:def:crs:EPSG:6.6:2227')).toBe(2227);
    expect(epsgCodeOfName('http://www.opengis.net/def/crs/EPSG/0/3857')).toBe(3857);
    expect(epsgCodeOfName('urn:ogc:def:crs:OGC:1.3:CRS84')).toBe(4326);
    expect(epsgCodeOfName('NAD83 / California zone 3')).toBeUndefined();
  });
  it('refuses an unknown code, a grid-shift datum and a name that is no code, as wrongCrs', () => {
    for (const f of [() => crsFromEpsg(999999, 'f'), () => crsFromEpsg(26710, 'f'), () => crsFromName('Lambert', 'f'), () => crsFromWkt('hello', 'f')]) {
      let error: unknown;
      try {
        f();
      } catch (e) {
        error = e;
      }
      expect(error).toBeInstanceOf(RoadImportError);
      expect((error as RoadImportError).failure.code).toBe('wrongCrs');
    }
  });
  it('suggests the state-plane zone for an extent in California zone III feet', () => {
    // West Oakland in EPSG:2227 (from cs2cs): about x 6,045,000…6,052,000, y 2,113,000…2,118,000 ftUS.
    const codes = suggestEpsgCodes([6045000, 2113000, 6052000, 2118000], 40).map((s) => s.code);
    expect(codes).toContain(2227);
  });
});

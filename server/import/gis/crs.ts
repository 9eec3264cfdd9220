// Coordinate reference systems of uploaded files: resolve what a file declares (an EPSG code,
// an OGC URN, the WKT of a .prj or a GeoPackage) to a proj4 transform into WGS84
// longitude/latitude, and suggest EPSG codes when a file looks projected but says nothing.
// Definitions come from epsg-index (offline, one JSON per code); transforms from proj4.
import { createRequire } from 'node:module';
import proj4 from 'proj4';
import type { SourceCrs } from '../../../shared/api/road-import';
import { RoadImportError } from '../../../shared/geo/road-import-error';

const require = createRequire(import.meta.url);

export interface EpsgEntry {
  code: string;
  kind: string;
  name: string;
  wkt: string;
  proj4: string;
  /** [north, west, south, east] of the area of use, degrees. */
  bbox: [number, number, number, number] | null;
}

const WGS84 = '+proj=longlat +datum=WGS84 +no_defs';

/** The epsg-index entry of a code, or undefined when the index has none. */
export function epsgEntry(code: number): EpsgEntry | undefined {
  if (!Number.isInteger(code) || code <= 0 || code > 999_999) return undefined;
  try {
    return require(`epsg-index/s/${code}.json`) as EpsgEntry;
  } catch {
    return undefined;
  }
}

/**
 * An EPSG code from the ways files name a CRS: `EPSG:2227`, `urn:ogc:def:crs:EPSG::2227`,
 * `urn:ogc:def:crs:EPSG:6.6:2227` (the old versioned URN), `http://www.opengis.net/def/crs/EPSG/0/2227`,
 * and the OGC names of WGS84 longitude/latitude (CRS84), which are EPSG:4326 with the axes
 * in GeoJSON's order.
 */
export function epsgCodeOfName(name: string): number | undefined {
  const n = name.trim().toLowerCase();
  if (/(^|[:/])crs84$/.test(n)) return 4326;
  const m =
    /^epsg:(\d+)$/.exec(n) ??
    /^urn:ogc:def:crs:epsg:[\d.]*:(\d+)$/.exec(n) ??
    /^https?:\/\/www\.opengis\.net\/def\/crs\/epsg\/[\d.]+\/(\d+)$/.exec(n);
  return m ? Number(m[1]) : undefined;
}

/** The EPSG code a WKT names for itself (its last AUTHORITY / ID), if any. */
export function epsgCodeOfWkt(wkt: string): number | undefined {
  const wkt1 = [...wkt.matchAll(/AUTHORITY\s*\[\s*"EPSG"\s*,\s*"?(\d+)"?\s*\]/gi)];
  const wkt2 = [...wkt.matchAll(/\bID\s*\[\s*"EPSG"\s*,\s*(\d+)\s*\]/gi)];
  const last = wkt1.at(-1) ?? wkt2.at(-1);
  return last ? Number(last[1]) : undefined;
}

function wktName(wkt: string): string {
  return /^\s*\w+\s*\[\s*"([^"]*)"/.exec(wkt)?.[1] ?? 'unnamed coordinate system';
}

/** Longitude/latitude on WGS84 or a datum that proj4 treats as equal to it within a metre. */
function isGeographicWgs84Like(epsg: number | null): boolean {
  return epsg === 4326 || epsg === 4269 || epsg === 4258 || epsg === 4617;
}

export interface CrsTransform {
  crs: SourceCrs;
  /** null when the source is WGS84 longitude/latitude already. */
  toWgs84: ((x: number, y: number) => [number, number]) | null;
}

function converter(definition: string, label: string): (x: number, y: number) => [number, number] {
  let forward: (p: [number, number]) => number[];
  try {
    const c = proj4(definition, WGS84);
    forward = (p) => c.forward(p);
    forward([0, 0]);
  } catch (error) {
    throw new RoadImportError('wrongCrs', `${label}: the coordinate system cannot be used for reprojection (${String((error as Error).message ?? error)}); reproject the file to WGS84 (EPSG:4326) or a common EPSG system and upload it again`);
  }
  return (x, y) => {
    const out = forward([x, y]);
    return [out[0]!, out[1]!];
  };
}

/** A transform for an EPSG code. @throws RoadImportError `wrongCrs` for a code we do not know. */
export function crsFromEpsg(code: number, label: string): CrsTransform {
  const entry = epsgEntry(code);
  if (!entry || !entry.proj4) {
    throw new RoadImportError('wrongCrs', `${label}: EPSG:${code} is not a coordinate system this server knows; reproject the file to WGS84 (EPSG:4326) and upload it again`);
  }
  if (/\+nadgrids=/.test(entry.proj4) && !/\+nadgrids=@null/.test(entry.proj4)) {
    throw new RoadImportError('wrongCrs', `${label}: EPSG:${code} (${entry.name}) needs a datum-shift grid that this server does not hold; reproject the file to NAD83, WGS84 or a UTM zone on them and upload it again`);
  }
  const crs: SourceCrs = { epsg: code, name: entry.name, definition: entry.proj4 };
  return { crs, toWgs84: isGeographicWgs84Like(code) ? null : converter(entry.proj4, label) };
}

/**
 * A transform for a WKT (a Shapefile's .prj, a GeoPackage's spatial reference). When the WKT
 * names an EPSG code we know, that code's definition is used (GDAL's .prj files are ESRI WKT,
 * which proj4 reads, but the EPSG definition is the reference); otherwise the WKT itself.
 */
export function crsFromWkt(wkt: string, label: string): CrsTransform {
  const text = wkt.trim();
  if (text === '') throw new RoadImportError('wrongCrs', `${label}: the coordinate system definition is empty`);
  const code = epsgCodeOfWkt(text);
  if (code !== undefined && epsgEntry(code)?.proj4) return crsFromEpsg(code, label);
  const name = wktName(text);
  if (/^\s*GEOG(CS|CRS)\s*\[/i.test(text) && /WGS[ _]?(19)?84|GRS[ _]?1980|NAD[ _]?(19)?83/i.test(text)) {
    return { crs: { epsg: null, name, definition: text }, toWgs84: null };
  }
  if (!/^\s*(PROJCS|GEOGCS|PROJCRS|GEOGCRS|GEODCRS|BASEGEOGCRS)\s*\[/i.test(text)) {
    throw new RoadImportError('wrongCrs', `${label}: the coordinate system definition is not WKT (it begins ${JSON.stringify(text.slice(0, 40))})`);
  }
  return { crs: { epsg: null, name, definition: text }, toWgs84: converter(text, label) };
}

/** A CRS name as a file gives it (GeoJSON's `crs` member, a planner's answer). */
export function crsFromName(name: string, label: string): CrsTransform {
  const code = epsgCodeOfName(name);
  if (code === undefined) {
    throw new RoadImportError('wrongCrs', `${label}: the coordinate system "${name.slice(0, 80)}" is not an EPSG code; name it as EPSG:NNNN (or an OGC URN) or reproject the file to WGS84 (EPSG:4326)`);
  }
  return crsFromEpsg(code, label);
}

export type Extent = [minX: number, minY: number, maxX: number, maxY: number];

/** True when an extent cannot be longitude/latitude. */
export function looksProjected(extent: Extent): boolean {
  const [minX, minY, maxX, maxY] = extent;
  return minX < -180 || maxX > 180 || minY < -90 || maxY > 90;
}

let allEntries: EpsgEntry[] | null = null;
// Building six thousand converters is most of a suggestion's cost (seconds): keep them per thread.
const inverses = new Map<string, proj4.Converter | null>();

/** A CRS name without its datum realisation: "NAD83(HARN) / California zone 3 (ftUS)" → "NAD83 / California zone 3 (ftUS)". */
function withoutRealisation(name: string): string {
  return name.replace(/\((HARN|NSRS2007|2011|CSRS|CSRS98|CORS96|MA11|PA11|FBN|HPGN)\)/g, '');
}

/**
 * EPSG codes whose area of use holds the extent when it is read in that system: every corner
 * and the centre land inside the code's bounding box. Smallest areas of use first (a
 * state-plane zone before a UTM zone before a continental system); one code per system and datum, without its later realisations (HARN,
 * NSRS2007, 2011), and EPSG codes only. A projected extent alone cannot tell apart zones that
 * share their false origin (UTM zones, California's six): the list is a question for the
 * planner, never a guess.
 */
export function suggestEpsgCodes(extent: Extent, limit = 8): { code: number; name: string }[] {
  allEntries ??= Object.values(require('epsg-index/all.json') as Record<string, EpsgEntry>);
  const [minX, minY, maxX, maxY] = extent;
  const probes: [number, number][] = [
    [minX, minY],
    [maxX, maxY],
    [minX, maxY],
    [maxX, minY],
    [(minX + maxX) / 2, (minY + maxY) / 2],
  ];
  const found: { code: number; name: string; area: number }[] = [];
  const seen = new Set<string>();
  for (const e of allEntries) {
    if (e.kind !== 'CRS-PROJCRS' || !e.proj4 || !e.bbox || Number(e.code) >= 32768 || /\+nadgrids=|\+geoidgrids=/.test(e.proj4)) continue;
    const key = withoutRealisation(e.name);
    if (seen.has(key) && key !== e.name) continue;
    const [north, west, south, east] = e.bbox;
    if (west > east) continue; // areas across the antimeridian: not worth the special case here
    let inverse = inverses.get(e.code);
    if (inverse === undefined) {
      try {
        inverse = proj4(e.proj4, WGS84);
      } catch {
        inverse = null;
      }
      inverses.set(e.code, inverse);
    }
    if (inverse === null) continue;
    let fits = true;
    for (const p of probes) {
      let lonLat: number[];
      try {
        lonLat = inverse.forward(p);
      } catch {
        fits = false;
        break;
      }
      const [lon, lat] = lonLat as [number, number];
      if (!Number.isFinite(lon) || !Number.isFinite(lat) || lon < west || lon > east || lat < south || lat > north) {
        fits = false;
        break;
      }
    }
    if (fits) {
      seen.add(key);
      found.push({ code: Number(e.code), name: e.name, area: (north - south) * (east - west) });
    }
  }
  return found
    .sort((a, b) => a.area - b.area || a.code - b.code)
    .slice(0, limit)
    .map(({ code, name }) => ({ code, name }));
}

/** The refusal for a projected-looking file that names no CRS. */
export function undeclaredProjectedError(label: string, extent: Extent): RoadImportError {
  const suggestions = suggestEpsgCodes(extent);
  let list = suggestions.length > 0 ? ` Codes whose area of use fits its extent: ${suggestions.map((s) => `EPSG:${s.code} (${s.name})`).join('; ')}.` : '';
  // Eastings 166,000…834,000 m and northings up to 9,330,000 m are what every UTM zone produces;
  // the zone itself cannot be told from the numbers.
  if (extent[0] >= 160_000 && extent[2] <= 840_000 && extent[1] >= 0 && extent[3] <= 9_400_000) {
    list += ' The numbers also fit a UTM zone (metres): EPSG:326NN for WGS 84 or EPSG:269NN for NAD83 north of the equator, EPSG:327NN south, NN the zone.';
  }
  return new RoadImportError(
    'wrongCrs',
    `${label}: the coordinates (x ${extent[0].toFixed(0)}…${extent[2].toFixed(0)}, y ${extent[1].toFixed(0)}…${extent[3].toFixed(0)}) are not longitude/latitude, ` +
      `and the file does not say which coordinate system they are in.${list} Choose the file's coordinate system (EPSG code) and upload it again, or add its .prj.`,
  );
}

// Export tables → one zip of Shapefiles: per layer a .shp, .shx and .dbf, a .prj (EPSG:4326 in
// ESRI's WKT) and a .cpg saying UTF-8; a table without geometry is a lone .dbf (which GIS
// tools open as a table); and `cutline-export.txt` with the caution, the run's identity and each
// column's meaning and unit, since a .dbf has no room for them (10-character field names).
//
// Written here to the ESRI Shapefile Technical Description (July 1998) and the dBASE III record
// layout rather than with @mapbox/shp-write 0.4.3: that package writes all LineStrings of a file
// as one multi-part record (its open issue #117), stores text one UTF-16 code unit per byte (so
// no .cpg could honestly say UTF-8), and concatenates coordinate arrays quadratically, which a
// county's roads cannot afford. GDAL's ogrinfo and the `shapefile` reader check what this writes
// (tests/shared/export/).
import type { Geometry, Position } from 'geojson';
import { zipSync } from 'fflate';
import { columnLine, type ExportBundle, type ExportColumn, type ExportTable, type ExportValue } from '../../shared/format/export-tables';

/** EPSG:4326 as ESRI writes it in a .prj (what GDAL writes for a WGS 84 Shapefile). */
export const WGS84_PRJ =
  'GEOGCS["GCS_WGS_1984",DATUM["D_WGS_1984",SPHEROID["WGS_1984",6378137.0,298.257223563]],PRIMEM["Greenwich",0.0],UNIT["Degree",0.0174532925199433]]';

const SHAPE_TYPE = { point: 1, line: 3, polygon: 5 } as const;
const NULL_SHAPE = 0;
const encoder = new TextEncoder();

type Parts = Position[][];

/** The rings or lines of a geometry; polygon rings oriented as the specification asks:
 *  outer rings clockwise, holes counter-clockwise (x east, y north). */
function partsOf(g: Geometry): Parts {
  switch (g.type) {
    case 'LineString':
      return [g.coordinates];
    case 'MultiLineString':
      return g.coordinates;
    case 'Polygon':
      return orient(g.coordinates);
    case 'MultiPolygon':
      return g.coordinates.flatMap(orient);
    default:
      throw new Error(`a ${g.type} cannot be written as lines or rings`);
  }
}

/** Twice the signed area (shoelace): positive when counter-clockwise. */
function signedArea(ring: Position[]): number {
  let a = 0;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) a += (ring[j]![0]! - ring[i]![0]!) * (ring[j]![1]! + ring[i]![1]!);
  return a;
}

function orient(rings: Position[][]): Parts {
  return rings.map((ring, i) => {
    const clockwise = signedArea(ring) < 0;
    return (i === 0) === clockwise ? ring : [...ring].reverse();
  });
}

type Bounds = [number, number, number, number];

function grow(b: Bounds, p: Position): void {
  if (p[0]! < b[0]) b[0] = p[0]!;
  if (p[1]! < b[1]) b[1] = p[1]!;
  if (p[0]! > b[2]) b[2] = p[0]!;
  if (p[1]! > b[3]) b[3] = p[1]!;
}

const emptyBounds = (): Bounds => [Infinity, Infinity, -Infinity, -Infinity];

function header(view: DataView, shapeType: number, lengthBytes: number, b: Bounds): void {
  view.setInt32(0, 9994, false);
  view.setInt32(24, lengthBytes / 2, false);
  view.setInt32(28, 1000, true);
  view.setInt32(32, shapeType, true);
  const finite = Number.isFinite(b[0]);
  for (let i = 0; i < 4; i++) view.setFloat64(36 + 8 * i, finite ? b[i]! : 0, true);
}

/** The .shp and .shx of one layer. */
function writeShapes(table: ExportTable): { shp: Uint8Array; shx: Uint8Array } {
  const shapeType = SHAPE_TYPE[table.geometry!];
  const records: ({ kind: 'null' } | { kind: 'point'; p: Position } | { kind: 'parts'; parts: Parts; points: number })[] = table.rows.map((r) => {
    if (r.geometry === null) return { kind: 'null' };
    if (table.geometry === 'point') {
      if (r.geometry.type !== 'Point') throw new Error(`a ${r.geometry.type} in a point layer`);
      return { kind: 'point', p: r.geometry.coordinates };
    }
    const parts = partsOf(r.geometry);
    return { kind: 'parts', parts, points: parts.reduce((n, p) => n + p.length, 0) };
  });
  const contentBytes = records.map((r) => (r.kind === 'null' ? 4 : r.kind === 'point' ? 20 : 44 + 4 * r.parts.length + 16 * r.points));
  const shpLength = 100 + contentBytes.reduce((n, c) => n + 8 + c, 0);
  const shxLength = 100 + 8 * records.length;
  const shp = new Uint8Array(shpLength);
  const shx = new Uint8Array(shxLength);
  const sv = new DataView(shp.buffer);
  const xv = new DataView(shx.buffer);
  const all = emptyBounds();
  let at = 100;
  records.forEach((r, i) => {
    xv.setInt32(100 + 8 * i, at / 2, false);
    xv.setInt32(104 + 8 * i, contentBytes[i]! / 2, false);
    sv.setInt32(at, i + 1, false);
    sv.setInt32(at + 4, contentBytes[i]! / 2, false);
    const c = at + 8;
    if (r.kind === 'null') sv.setInt32(c, NULL_SHAPE, true);
    else if (r.kind === 'point') {
      sv.setInt32(c, shapeType, true);
      sv.setFloat64(c + 4, r.p[0]!, true);
      sv.setFloat64(c + 12, r.p[1]!, true);
      grow(all, r.p);
    } else {
      const b = emptyBounds();
      for (const part of r.parts) for (const p of part) grow(b, p);
      grow(all, [b[0], b[1]]);
      grow(all, [b[2], b[3]]);
      sv.setInt32(c, shapeType, true);
      for (let k = 0; k < 4; k++) sv.setFloat64(c + 4 + 8 * k, b[k]!, true);
      sv.setInt32(c + 36, r.parts.length, true);
      sv.setInt32(c + 40, r.points, true);
      let index = 0;
      let p = c + 44 + 4 * r.parts.length;
      r.parts.forEach((part, k) => {
        sv.setInt32(c + 44 + 4 * k, index, true);
        index += part.length;
        for (const pos of part) {
          sv.setFloat64(p, pos[0]!, true);
          sv.setFloat64(p + 8, pos[1]!, true);
          p += 16;
        }
      });
    }
    at += 8 + contentBytes[i]!;
  });
  header(sv, shapeType, shpLength, all);
  header(xv, shapeType, shxLength, all);
  return { shp, shx };
}

/** UTF-8 bytes of a text, cut at a character boundary to at most `max` bytes. */
function utf8(text: string, max: number): Uint8Array {
  const bytes = encoder.encode(text);
  if (bytes.length <= max) return bytes;
  let end = max;
  while (end > 0 && (bytes[end]! & 0xc0) === 0x80) end--;
  return bytes.subarray(0, end);
}

type DbfField = { column: ExportColumn; type: 'C' | 'N' | 'L'; length: number; decimals: number };

const REAL_LENGTH = 24;
const REAL_DECIMALS = 9;

function dbfFields(table: ExportTable): DbfField[] {
  return table.columns.map((column, i) => {
    if (column.type === 'boolean') return { column, type: 'L', length: 1, decimals: 0 };
    if (column.type === 'integer') return { column, type: 'N', length: 18, decimals: 0 };
    if (column.type === 'real') return { column, type: 'N', length: REAL_LENGTH, decimals: REAL_DECIMALS };
    let longest = 1;
    for (const r of table.rows) {
      const v = r.values[i];
      if (v !== null && v !== undefined) longest = Math.max(longest, Math.min(254, encoder.encode(String(v)).length));
    }
    return { column, type: 'C', length: longest, decimals: 0 };
  });
}

function cell(f: DbfField, v: ExportValue): Uint8Array {
  const out = new Uint8Array(f.length).fill(0x20);
  if (v === null || v === undefined) {
    if (f.type === 'L') out[0] = 0x3f; // '?': not set
    return out;
  }
  if (f.type === 'L') {
    out[0] = v ? 0x54 : 0x46; // T / F
    return out;
  }
  if (f.type === 'N') {
    const n = Number(v);
    let text = f.decimals === 0 ? String(Math.round(n)) : n.toFixed(f.decimals);
    if (text.length > f.length) text = n.toPrecision(f.length - 7); // never reached for road, zone or run figures
    out.set(encoder.encode(text), f.length - text.length);
    return out;
  }
  out.set(utf8(String(v), f.length));
  return out;
}

/** dBASE III table: 32-byte header, 32-byte field descriptors, 0x0D, records, 0x1A. */
export function writeDbf(table: ExportTable): Uint8Array {
  const fields = dbfFields(table);
  const headerLength = 32 + 32 * fields.length + 1;
  const recordLength = 1 + fields.reduce((n, f) => n + f.length, 0);
  const out = new Uint8Array(headerLength + recordLength * table.rows.length + 1);
  const view = new DataView(out.buffer);
  const today = new Date();
  out[0] = 0x03;
  out[1] = today.getUTCFullYear() - 1900;
  out[2] = today.getUTCMonth() + 1;
  out[3] = today.getUTCDate();
  view.setUint32(4, table.rows.length, true);
  view.setUint16(8, headerLength, true);
  view.setUint16(10, recordLength, true);
  fields.forEach((f, i) => {
    const at = 32 + 32 * i;
    out.set(encoder.encode(f.column.name), at);
    out[at + 11] = f.type.charCodeAt(0);
    out[at + 16] = f.length;
    out[at + 17] = f.decimals;
  });
  out[headerLength - 1] = 0x0d;
  let at = headerLength;
  for (const r of table.rows) {
    out[at++] = 0x20; // not deleted
    fields.forEach((f, i) => {
      out.set(cell(f, r.values[i] ?? null), at);
      at += f.length;
    });
  }
  out[at] = 0x1a;
  return out;
}

/** The read-me beside the layers: caution and identity, then each layer's columns with units. */
export function shapefileReadMe(bundle: ExportBundle): string {
  const lines = [...bundle.identity.map(([k, v]) => `${k}: ${v}`), ''];
  for (const t of bundle.tables) {
    lines.push(`${t.name}${t.geometry ? '.shp' : '.dbf'}: ${t.title} (${t.rows.length} rows; coordinates WGS 84 longitude/latitude, EPSG:4326; text UTF-8)`);
    for (const c of t.columns) lines.push(`  ${columnLine(c)}`);
    lines.push('');
  }
  return lines.join('\r\n');
}

export function writeShapefileZip(bundle: ExportBundle): Uint8Array {
  const files: Record<string, Uint8Array> = { 'cutline-export.txt': encoder.encode(shapefileReadMe(bundle)) };
  for (const t of bundle.tables) {
    files[`${t.name}.dbf`] = writeDbf(t);
    files[`${t.name}.cpg`] = encoder.encode('UTF-8');
    if (t.geometry === null) continue;
    const { shp, shx } = writeShapes(t);
    files[`${t.name}.shp`] = shp;
    files[`${t.name}.shx`] = shx;
    files[`${t.name}.prj`] = encoder.encode(WGS84_PRJ);
  }
  return zipSync(files, { level: 6 });
}

// A GeoPackage (OGC 12-128r18: an SQLite file) → one feature table's features in the table's
// own spatial reference, read with sql.js (SQLite compiled to WebAssembly: no native build).
// Only SELECTs on the gpkg_* tables and the chosen table run; geometry blobs are the
// GeoPackage binary header followed by WKB, decoded by wkx.
import { createRequire } from 'node:module';
import type { Feature, Geometry } from 'geojson';
import initSqlJs, { type Database, type SqlJsStatic, type SqlValue } from 'sql.js';
import wkx from 'wkx';
import { RoadImportError } from '../../../shared/geo/road-import-error';
import { crsFromEpsg, crsFromName, crsFromWkt, type CrsTransform } from './crs';
import type { RawGisLayer } from './read-shapefile-zip';

const require = createRequire(import.meta.url);
let sqlJs: Promise<SqlJsStatic> | null = null;

/** sql.js, loaded once per thread from the package's own .wasm file. */
export function loadSqlJs(): Promise<SqlJsStatic> {
  sqlJs ??= initSqlJs({ locateFile: () => require.resolve('sql.js/dist/sql-wasm.wasm') });
  return sqlJs;
}

export const SQLITE_MAGIC = [...'SQLite format 3'].map((c) => c.charCodeAt(0)).concat(0);

function quoteIdentifier(name: string): string {
  return `"${name.replaceAll('"', '""')}"`;
}

function rows(db: Database, sql: string, params: SqlValue[] = []): Record<string, SqlValue>[] {
  const stmt = db.prepare(sql);
  try {
    stmt.bind(params);
    const out: Record<string, SqlValue>[] = [];
    while (stmt.step()) out.push(stmt.getAsObject());
    return out;
  } finally {
    stmt.free();
  }
}

/** The WKB inside a GeoPackage geometry blob, or null for an empty geometry. */
export function wkbOfGeoPackageBlob(blob: Uint8Array): Uint8Array | null {
  if (blob.length < 8 || blob[0] !== 0x47 || blob[1] !== 0x50) throw new Error('not a GeoPackage geometry (no "GP" header)');
  const flags = blob[3]!;
  if (flags & 0x10) return null;
  const envelope = (flags >> 1) & 0x07;
  const envelopeBytes = [0, 32, 48, 48, 64][envelope];
  if (envelopeBytes === undefined) throw new Error(`bad envelope indicator ${envelope}`);
  return blob.subarray(8 + envelopeBytes);
}

export interface GeoPackageOptions {
  label: string;
  layer?: string | undefined;
  crs?: string | undefined;
  maxFeatures: number;
}

/** @throws RoadImportError `unreadableFile` | `wrongCrs` */
export async function readGeoPackage(bytes: Uint8Array, o: GeoPackageOptions): Promise<RawGisLayer> {
  if (!SQLITE_MAGIC.every((b, i) => bytes[i] === b)) {
    throw new RoadImportError('unreadableFile', `${o.label}: not a GeoPackage (a GeoPackage is an SQLite database, and this file does not begin like one)`);
  }
  const SQL = await loadSqlJs();
  let db: Database;
  try {
    db = new SQL.Database(bytes);
  } catch (error) {
    throw new RoadImportError('unreadableFile', `${o.label}: the SQLite database cannot be opened (${String((error as Error).message ?? error)})`);
  }
  try {
    let tables: Record<string, SqlValue>[];
    try {
      tables = rows(
        db,
        `SELECT c.table_name AS t, g.column_name AS col, g.srs_id AS srs
           FROM gpkg_contents c JOIN gpkg_geometry_columns g ON g.table_name = c.table_name
          WHERE c.data_type = 'features' ORDER BY c.table_name`,
      );
    } catch (error) {
      throw new RoadImportError('unreadableFile', `${o.label}: an SQLite database but not a GeoPackage, or a damaged one (${String((error as Error).message ?? error)})`);
    }
    const layers = tables.map((t) => String(t['t']));
    if (layers.length === 0) throw new RoadImportError('unreadableFile', `${o.label}: the GeoPackage has no feature tables`);
    if (o.layer !== undefined && !layers.includes(o.layer)) {
      throw new RoadImportError('unreadableFile', `${o.label}: no layer ${JSON.stringify(o.layer)} in the GeoPackage; it holds ${layers.join(', ')}`);
    }
    if (o.layer === undefined && layers.length > 1) {
      throw new RoadImportError('unreadableFile', `${o.label}: the GeoPackage holds ${layers.length} feature tables (${layers.join(', ')}); choose one layer`);
    }
    const chosen = tables[o.layer === undefined ? 0 : layers.indexOf(o.layer)]!;
    const layer = String(chosen['t']);
    const geometryColumn = String(chosen['col']);
    const srsId = Number(chosen['srs']);

    let transform: CrsTransform | null = null;
    if (o.crs) transform = crsFromName(o.crs, o.label);
    else if (srsId > 0) {
      const srs = rows(db, 'SELECT organization AS org, organization_coordsys_id AS code, definition AS def FROM gpkg_spatial_ref_sys WHERE srs_id = ?', [srsId])[0];
      if (!srs) throw new RoadImportError('wrongCrs', `${o.label}: layer ${layer} refers to spatial reference ${srsId}, which the GeoPackage does not define`);
      const org = String(srs['org'] ?? '').toUpperCase();
      transform = org === 'EPSG' ? crsFromEpsg(Number(srs['code']), o.label) : crsFromWkt(String(srs['def'] ?? ''), o.label);
    }
    // srs_id 0 and -1 are the specification's "undefined geographic / Cartesian": no CRS stated.

    const count = Number(rows(db, `SELECT count(*) AS n FROM ${quoteIdentifier(layer)}`)[0]?.['n'] ?? 0);
    if (count > o.maxFeatures) {
      throw new RoadImportError('unreadableFile', `${o.label}: layer ${layer} has ${count} features, more than an import can read (${o.maxFeatures}); split the area into smaller files`);
    }
    const features: Feature[] = [];
    const stmt = db.prepare(`SELECT * FROM ${quoteIdentifier(layer)}`);
    try {
      while (stmt.step()) {
        const row = stmt.getAsObject();
        const blob = row[geometryColumn];
        const properties: Record<string, unknown> = {};
        for (const [k, v] of Object.entries(row)) {
          // Binary columns other than the geometry carry nothing a road, zone or shelter reads.
          if (k !== geometryColumn && !(v instanceof Uint8Array)) properties[k] = v;
        }
        let geometry: Geometry | null = null;
        if (blob instanceof Uint8Array) {
          try {
            const wkb = wkbOfGeoPackageBlob(blob);
            geometry = wkb ? (wkx.Geometry.parse(Buffer.from(wkb)).toGeoJSON() as Geometry) : null;
          } catch (error) {
            geometry = { type: 'unreadable', reason: String((error as Error).message ?? error) } as unknown as Geometry;
          }
        }
        features.push({ type: 'Feature', geometry: geometry as Geometry, properties });
      }
    } finally {
      stmt.free();
    }
    return { collection: { type: 'FeatureCollection', features }, transform, layers, layer };
  } finally {
    db.close();
  }
}

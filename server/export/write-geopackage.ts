// Export tables → a GeoPackage (OGC 12-128r18, GeoPackage Encoding Standard, written as version 1.3): an SQLite file
// written with sql.js (the reader's SQLite, WebAssembly: no native build). It holds the core
// tables (gpkg_spatial_ref_sys with the three required rows, gpkg_contents,
// gpkg_geometry_columns), one feature table per layer in EPSG:4326 whose geometries are the
// GeoPackage binary header (§2.1.3: "GP", version 0, flags, srs_id, envelope) followed by WKB
// (wkx), plain tables as `attributes`, each column's meaning and unit in gpkg_data_columns (the
// Schema extension, §F.9), and the caution with the run's identity in the attributes table
// `cutline_export`.
import type { Geometry } from 'geojson';
import type { Database, SqlValue } from 'sql.js';
import wkx from 'wkx';
import { columnLine, type ExportBundle, type ExportTable } from '../../shared/format/export-tables';
import { loadSqlJs } from '../import/gis/read-geopackage';

/** The WKT of EPSG:4326 as GDAL writes it into gpkg_spatial_ref_sys (OGC WKT 1). */
const WGS84_WKT =
  'GEOGCS["WGS 84",DATUM["WGS_1984",SPHEROID["WGS 84",6378137,298.257223563,AUTHORITY["EPSG","7030"]],AUTHORITY["EPSG","6326"]],' +
  'PRIMEM["Greenwich",0,AUTHORITY["EPSG","8901"]],UNIT["degree",0.0174532925199433,AUTHORITY["EPSG","9122"]],' +
  'AXIS["Latitude",NORTH],AXIS["Longitude",EAST],AUTHORITY["EPSG","4326"]]';

const CORE_TABLES = `
CREATE TABLE gpkg_spatial_ref_sys (srs_name TEXT NOT NULL, srs_id INTEGER NOT NULL PRIMARY KEY, organization TEXT NOT NULL,
  organization_coordsys_id INTEGER NOT NULL, definition TEXT NOT NULL, description TEXT);
CREATE TABLE gpkg_contents (table_name TEXT NOT NULL PRIMARY KEY, data_type TEXT NOT NULL, identifier TEXT UNIQUE,
  description TEXT DEFAULT '', last_change DATETIME NOT NULL DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')),
  min_x DOUBLE, min_y DOUBLE, max_x DOUBLE, max_y DOUBLE, srs_id INTEGER,
  CONSTRAINT fk_gc_r_srs_id FOREIGN KEY (srs_id) REFERENCES gpkg_spatial_ref_sys(srs_id));
CREATE TABLE gpkg_geometry_columns (table_name TEXT NOT NULL, column_name TEXT NOT NULL, geometry_type_name TEXT NOT NULL,
  srs_id INTEGER NOT NULL, z TINYINT NOT NULL, m TINYINT NOT NULL,
  CONSTRAINT pk_geom_cols PRIMARY KEY (table_name, column_name), CONSTRAINT uk_gc_table_name UNIQUE (table_name),
  CONSTRAINT fk_gc_tn FOREIGN KEY (table_name) REFERENCES gpkg_contents(table_name),
  CONSTRAINT fk_gc_srs FOREIGN KEY (srs_id) REFERENCES gpkg_spatial_ref_sys (srs_id));
CREATE TABLE gpkg_extensions (table_name TEXT, column_name TEXT, extension_name TEXT NOT NULL, definition TEXT NOT NULL,
  scope TEXT NOT NULL, CONSTRAINT ge_tce UNIQUE (table_name, column_name, extension_name));
CREATE TABLE gpkg_data_columns (table_name TEXT NOT NULL, column_name TEXT NOT NULL, name TEXT, title TEXT, description TEXT,
  mime_type TEXT, constraint_name TEXT, CONSTRAINT pk_gdc PRIMARY KEY (table_name, column_name), CONSTRAINT gdc_tn UNIQUE (table_name, name));
CREATE TABLE gpkg_data_column_constraints (constraint_name TEXT NOT NULL, constraint_type TEXT NOT NULL, value TEXT,
  min NUMERIC, min_is_inclusive BOOLEAN, max NUMERIC, max_is_inclusive BOOLEAN, description TEXT,
  CONSTRAINT gdcc_ntv UNIQUE (constraint_name, constraint_type, value));
`;

const SQL_TYPE = { integer: 'INTEGER', real: 'DOUBLE', text: 'TEXT', boolean: 'BOOLEAN' } as const;
const GEOMETRY_TYPE = { line: 'LINESTRING', polygon: 'MULTIPOLYGON', point: 'POINT' } as const;

function quote(name: string): string {
  return `"${name.replaceAll('"', '""')}"`;
}

type Envelope = [number, number, number, number];

function envelopeOf(g: Geometry, into: Envelope): Envelope {
  const visit = (c: unknown): void => {
    if (typeof (c as number[])[0] === 'number') {
      const [x, y] = c as [number, number];
      if (x < into[0]) into[0] = x;
      if (x > into[1]) into[1] = x;
      if (y < into[2]) into[2] = y;
      if (y > into[3]) into[3] = y;
    } else for (const part of c as unknown[]) visit(part);
  };
  if ('coordinates' in g) visit(g.coordinates);
  return into;
}

const emptyEnvelope = (): Envelope => [Infinity, -Infinity, Infinity, -Infinity];

/** GeoPackage binary (§2.1.3): little-endian header with an [minx, maxx, miny, maxy] envelope, then WKB. */
export function geoPackageBlob(g: Geometry, srsId: number): Uint8Array {
  const wkb = wkx.Geometry.parseGeoJSON(g).toWkb();
  const [minX, maxX, minY, maxY] = envelopeOf(g, emptyEnvelope());
  const out = new Uint8Array(8 + 32 + wkb.length);
  const view = new DataView(out.buffer);
  out[0] = 0x47; // 'G'
  out[1] = 0x50; // 'P'
  out[2] = 0; // version 1
  out[3] = 0b0000_0011; // standard binary, not empty, envelope indicator 1, little-endian
  view.setInt32(4, srsId, true);
  view.setFloat64(8, minX, true);
  view.setFloat64(16, maxX, true);
  view.setFloat64(24, minY, true);
  view.setFloat64(32, maxY, true);
  out.set(wkb, 40);
  return out;
}

/** A zone may be a Polygon or a MultiPolygon; the column is MULTIPOLYGON, so one Polygon becomes a MultiPolygon of one. */
function forColumn(table: ExportTable, g: Geometry): Geometry {
  return table.geometry === 'polygon' && g.type === 'Polygon' ? { type: 'MultiPolygon', coordinates: [g.coordinates] } : g;
}

function sqlValue(v: unknown, type: keyof typeof SQL_TYPE): SqlValue {
  if (v === null || v === undefined) return null;
  if (type === 'boolean') return v ? 1 : 0;
  return v as SqlValue;
}

function writeTable(db: Database, t: ExportTable): void {
  const columns = t.columns.map((c) => `${quote(c.name)} ${SQL_TYPE[c.type]}`);
  const geometry = t.geometry === null ? [] : [`geom ${GEOMETRY_TYPE[t.geometry]}`];
  db.run(`CREATE TABLE ${quote(t.name)} (fid INTEGER PRIMARY KEY AUTOINCREMENT NOT NULL, ${[...geometry, ...columns].join(', ')})`);
  const names = [...(t.geometry === null ? [] : ['geom']), ...t.columns.map((c) => c.name)];
  const insert = db.prepare(`INSERT INTO ${quote(t.name)} (${names.map(quote).join(', ')}) VALUES (${names.map(() => '?').join(', ')})`);
  const extent = emptyEnvelope();
  try {
    for (const row of t.rows) {
      const values: SqlValue[] = t.columns.map((c, i) => sqlValue(row.values[i], c.type));
      if (t.geometry !== null) {
        const g = row.geometry === null ? null : forColumn(t, row.geometry);
        if (g) envelopeOf(g, extent);
        values.unshift(g ? geoPackageBlob(g, 4326) : null);
      }
      insert.run(values);
    }
  } finally {
    insert.free();
  }
  const bounded = Number.isFinite(extent[0]);
  db.run('INSERT INTO gpkg_contents (table_name, data_type, identifier, description, min_x, min_y, max_x, max_y, srs_id) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)', [
    t.name,
    t.geometry === null ? 'attributes' : 'features',
    t.name,
    t.title,
    bounded ? extent[0] : null,
    bounded ? extent[2] : null,
    bounded ? extent[1] : null,
    bounded ? extent[3] : null,
    t.geometry === null ? null : 4326,
  ]);
  if (t.geometry !== null) db.run('INSERT INTO gpkg_geometry_columns VALUES (?, ?, ?, 4326, 0, 0)', [t.name, 'geom', GEOMETRY_TYPE[t.geometry]]);
  for (const c of t.columns) {
    db.run('INSERT INTO gpkg_data_columns (table_name, column_name, name, title, description) VALUES (?, ?, ?, ?, ?)', [
      t.name,
      c.name,
      c.name,
      c.unit ? `${c.name} (${c.unit})` : c.name,
      columnLine(c),
    ]);
  }
}

export async function writeGeoPackage(bundle: ExportBundle): Promise<Uint8Array> {
  const SQL = await loadSqlJs();
  const db = new SQL.Database();
  try {
    // "GPKG" and version 1.3.0 (§1.1.1.1.1): nothing here needs 1.4, and Debian's GDAL warns on 1.4 files.
    db.run('PRAGMA application_id = 1196444487');
    db.run('PRAGMA user_version = 10300');
    db.run('BEGIN');
    db.exec(CORE_TABLES);
    db.run('INSERT INTO gpkg_spatial_ref_sys VALUES (?, ?, ?, ?, ?, ?)', ['Undefined cartesian SRS', -1, 'NONE', -1, 'undefined', 'undefined cartesian coordinate reference system']);
    db.run('INSERT INTO gpkg_spatial_ref_sys VALUES (?, ?, ?, ?, ?, ?)', ['Undefined geographic SRS', 0, 'NONE', 0, 'undefined', 'undefined geographic coordinate reference system']);
    db.run('INSERT INTO gpkg_spatial_ref_sys VALUES (?, ?, ?, ?, ?, ?)', ['WGS 84 geodetic', 4326, 'EPSG', 4326, WGS84_WKT, 'longitude/latitude coordinates in decimal degrees on the WGS 84 spheroid']);
    db.run("INSERT INTO gpkg_extensions VALUES ('gpkg_data_columns', NULL, 'gpkg_schema', 'http://www.geopackage.org/spec/#extension_schema', 'read-write')");
    db.run("INSERT INTO gpkg_extensions VALUES ('gpkg_data_column_constraints', NULL, 'gpkg_schema', 'http://www.geopackage.org/spec/#extension_schema', 'read-write')");
    for (const t of bundle.tables) writeTable(db, t);
    writeTable(db, {
      name: 'cutline_export',
      title: 'The caution, and which plan, run and assumptions the data come from',
      geometry: null,
      columns: [
        { name: 'key', type: 'text', unit: null, description: 'what the value is' },
        { name: 'value', type: 'text', unit: null, description: 'the value' },
      ],
      rows: bundle.identity.map(([k, v]) => ({ geometry: null, values: [k, v] })),
    });
    db.run('COMMIT');
    return db.export();
  } finally {
    db.close();
  }
}

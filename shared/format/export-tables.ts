// What an export holds, before any file format: named tables of rows, each row with an optional
// WGS84 geometry and one value per column, and the identity (caution, plan, run, assumptions)
// as key–value pairs. Every writer (GeoJSON, GeoPackage, zipped Shapefile, KML) takes this one
// shape, so the same columns, units and caution reach every format.
import type { Geometry } from 'geojson';

export type ExportValue = string | number | boolean | null;

export type ExportColumn = {
  /** At most 10 ASCII characters (a Shapefile's .dbf field name limit), lower case. */
  name: string;
  type: 'integer' | 'real' | 'text' | 'boolean';
  /** The unit of the values (e.g. "km/h", "ft", "veh/h"); null for counts, names and flags. */
  unit: string | null;
  description: string;
};

export type ExportRow = { geometry: Geometry | null; values: ExportValue[] };

export type ExportTable = {
  /** The layer's name in the file (Shapefile base name, GeoPackage table, KML folder). */
  name: string;
  title: string;
  /** The geometry every row has (polygonal covers Polygon and MultiPolygon); null for a plain table. */
  geometry: 'line' | 'polygon' | 'point' | null;
  columns: ExportColumn[];
  rows: ExportRow[];
};

export type ExportBundle = {
  /** identityEntries(...) of shared/model/export-identity.ts: the caution first. */
  identity: [string, string][];
  tables: ExportTable[];
};

/** A column together with how a row of the source gives its value. */
export type ExportField<R> = ExportColumn & { value: (row: R) => ExportValue };

export function field<R>(name: string, type: ExportColumn['type'], unit: string | null, description: string, value: (row: R) => ExportValue): ExportField<R> {
  return { name, type, unit, description, value };
}

/**
 * A table from source rows and its fields: the columns and each row's values come from one list,
 * so a column can never be listed apart from its value.
 */
export function tableOf<R>(
  head: Pick<ExportTable, 'name' | 'title' | 'geometry'>,
  fields: readonly ExportField<R>[],
  rows: readonly R[],
  geometryOf: (row: R) => Geometry | null,
): ExportTable {
  return {
    ...head,
    columns: fields.map(({ name, type, unit, description }) => ({ name, type, unit, description })),
    rows: rows.map((row) => ({ geometry: geometryOf(row), values: fields.map((f) => f.value(row)) })),
  };
}

/** "name: description (unit)" — how a column is described in metadata and read-me text. */
export function columnLine(c: ExportColumn): string {
  return `${c.name}: ${c.description}${c.unit ? ` (${c.unit})` : ''}`;
}

/** A row's values as properties keyed by column name. */
export function rowProperties(table: ExportTable, row: ExportRow): Record<string, ExportValue> {
  const out: Record<string, ExportValue> = {};
  table.columns.forEach((c, i) => (out[c.name] = row.values[i] ?? null));
  return out;
}

const FIELD_NAME = /^[a-z][a-z0-9_]{0,9}$/;

/** Throws when a table breaks the rules every writer relies on (a programming error, not input). */
export function checkTable(t: ExportTable): void {
  const seen = new Set<string>();
  for (const c of t.columns) {
    if (!FIELD_NAME.test(c.name)) throw new Error(`export column ${t.name}.${c.name}: at most 10 lower-case letters, digits or _`);
    if (seen.has(c.name)) throw new Error(`export column ${t.name}.${c.name} twice`);
    seen.add(c.name);
  }
  for (const r of t.rows) if (r.values.length !== t.columns.length) throw new Error(`export table ${t.name}: a row has ${r.values.length} values for ${t.columns.length} columns`);
}

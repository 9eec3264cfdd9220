// One export table → a GeoJSON FeatureCollection (RFC 7946, WGS 84): each row a Feature with
// the columns as properties, and two foreign members (§6.1) that GIS tools keep or ignore:
// `cutline` (the caution and the identity, as the run exports carry it) and `cutline_columns`
// (each column's meaning and unit).
import { columnLine, rowProperties, type ExportBundle, type ExportTable } from '../../shared/format/export-tables';

export function writeGeoJson(bundle: ExportBundle, table: ExportTable): string {
  const body = {
    type: 'FeatureCollection',
    cutline: Object.fromEntries(bundle.identity),
    cutline_columns: Object.fromEntries(table.columns.map((c) => [c.name, columnLine(c).slice(c.name.length + 2)])),
    features: table.rows.map((r) => ({ type: 'Feature', geometry: r.geometry, properties: rowProperties(table, r) })),
  };
  return JSON.stringify(body);
}

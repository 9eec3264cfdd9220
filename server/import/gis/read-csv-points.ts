// A CSV table of points (shelter lists, zones given as points with a population) → Point
// features, with papaparse. The position is in two columns: longitude/latitude, or x/y in a
// coordinate system named by the planner. Every other column becomes a property, as text.
import type { Feature } from 'geojson';
import Papa from 'papaparse';
import type { BadFeature } from '../../../shared/api/road-import';
import { RoadImportError } from '../../../shared/geo/road-import-error';
import { crsFromName } from './crs';
import type { RawGisLayer } from './read-shapefile-zip';

export interface CsvOptions {
  label: string;
  xColumn?: string | undefined;
  yColumn?: string | undefined;
  crs?: string | undefined;
  maxFeatures: number;
}

const X_NAMES = ['longitude', 'lon', 'lng', 'long', 'x', 'easting'];
const Y_NAMES = ['latitude', 'lat', 'y', 'northing'];

function findColumn(fields: string[], names: string[]): string | undefined {
  for (const n of names) {
    const hit = fields.find((f) => f.trim().toLowerCase() === n);
    if (hit !== undefined) return hit;
  }
  return undefined;
}

/** Columns of a CSV header, for the schema read. */
export function csvColumns(text: string): string[] {
  return Papa.parse<string[]>(text, { preview: 1 }).data[0] ?? [];
}

export function readCsvPoints(bytes: Uint8Array, o: CsvOptions): RawGisLayer & { rowProblems: BadFeature[] } {
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw new RoadImportError('unreadableFile', `${o.label}: the CSV file is not UTF-8 text; save it as CSV UTF-8 and upload it again`);
  }
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  const parsed = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: 'greedy' });
  const fields = parsed.meta.fields ?? [];
  const xColumn = o.xColumn ?? findColumn(fields, X_NAMES);
  const yColumn = o.yColumn ?? findColumn(fields, Y_NAMES);
  if (!xColumn || !yColumn || !fields.includes(xColumn) || !fields.includes(yColumn)) {
    throw new RoadImportError(
      'unreadableFile',
      `${o.label}: no position columns; name them longitude and latitude (or x and y with the coordinate system), or choose them. The columns are: ${fields.slice(0, 30).join(', ') || '(none)'}`,
    );
  }
  if (parsed.data.length > o.maxFeatures) throw new RoadImportError('unreadableFile', `${o.label}: more than ${o.maxFeatures} rows, more than an import can read`);
  const rowProblems: BadFeature[] = [];
  const features: Feature[] = [];
  for (const [index, row] of parsed.data.entries()) {
    const x = Number(String(row[xColumn] ?? '').trim().replace(',', '.'));
    const y = Number(String(row[yColumn] ?? '').trim().replace(',', '.'));
    const properties: Record<string, unknown> = {};
    for (const f of fields) if (f !== xColumn && f !== yColumn) properties[f] = row[f];
    if (String(row[xColumn] ?? '').trim() === '' || String(row[yColumn] ?? '').trim() === '' || !Number.isFinite(x) || !Number.isFinite(y)) {
      // Row numbers as a spreadsheet shows them: the header is row 1.
      rowProblems.push({ index, id: null, problem: `row ${index + 2}: ${xColumn}/${yColumn} are not numbers (${JSON.stringify(row[xColumn] ?? '')}, ${JSON.stringify(row[yColumn] ?? '')})` });
      features.push({ type: 'Feature', geometry: null as never, properties });
      continue;
    }
    features.push({ type: 'Feature', geometry: { type: 'Point', coordinates: [x, y] }, properties });
  }
  for (const e of parsed.errors.slice(0, 50)) {
    if (e.row !== undefined && e.code !== 'UndetectableDelimiter') rowProblems.push({ index: e.row, id: null, problem: `row ${e.row + 2}: ${e.message}` });
  }
  return {
    collection: { type: 'FeatureCollection', features },
    transform: o.crs ? crsFromName(o.crs, o.label) : null,
    layers: [],
    layer: 'csv',
    rowProblems,
  };
}

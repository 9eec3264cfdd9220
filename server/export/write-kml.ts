// Export tables → KML 2.2 (OGC 07-147r2) with @placemarkio/tokml: one Folder per table, a
// Placemark per row with its values as ExtendedData (an empty value is left out), the road or
// place name as the Placemark's name. The document's description holds the caution and the
// run's identity; each folder's description its columns with their units, and for a table
// without geometry (the curve) its rows as text, since KML has no plain tables.
import type { Feature } from 'geojson';
import { foldersToKML } from '@placemarkio/tokml';
import { columnLine, rowProperties, type ExportBundle, type ExportTable } from '../../shared/format/export-tables';

type Root = Parameters<typeof foldersToKML>[0];
type Folder = Extract<Root['children'][number], { type: 'folder' }>;

function escapeXml(text: string): string {
  return text.replaceAll('&', '&amp;').replaceAll('<', '&lt;').replaceAll('>', '&gt;');
}

/** Placemarks are written by tokml a few thousand at a time and joined: one tree of a county's
 *  roads takes minutes and gigabytes (measured: tests/bench/export/write-files.ts). */
const PLACEMARKS_PER_CALL = 2_000;

/** The inside of tokml's <Document> for these children. */
function documentBody(children: Root['children']): { head: string; body: string; tail: string } {
  const kml = foldersToKML({ type: 'root', children } as Root);
  const open = kml.indexOf('<Document>') + '<Document>'.length;
  const close = kml.lastIndexOf('</Document>');
  return { head: kml.slice(0, open), body: kml.slice(open, close), tail: kml.slice(close) };
}

function placemarksOf(features: Feature[]): string {
  const parts: string[] = [];
  for (let i = 0; i < features.length; i += PLACEMARKS_PER_CALL) parts.push(documentBody(features.slice(i, i + PLACEMARKS_PER_CALL) as Root['children']).body);
  return parts.join('');
}

/** One table as a Folder: its description, then its rows as Placemarks. */
function folderOf(t: ExportTable): string {
  const lines = [t.title, '', ...t.columns.map(columnLine)];
  if (t.geometry === null) {
    lines.push('', t.columns.map((c) => c.name).join('\t'));
    for (const r of t.rows) lines.push(r.values.map((v) => (v === null ? '' : String(v))).join('\t'));
  }
  const features: Feature[] =
    t.geometry === null
      ? []
      : t.rows
          .filter((r) => r.geometry !== null)
          .map((r) => {
            const properties: Record<string, unknown> = {};
            for (const [k, v] of Object.entries(rowProperties(t, r))) if (v !== null && v !== '') properties[k] = v;
            return { type: 'Feature', geometry: r.geometry!, properties };
          });
  const empty = documentBody([{ type: 'folder', meta: { name: t.name, description: lines.join('\n') }, children: [] } as unknown as Folder]).body;
  const end = empty.lastIndexOf('</Folder>');
  return empty.slice(0, end) + placemarksOf(features) + empty.slice(end);
}

export function writeKml(bundle: ExportBundle): string {
  const { head, tail } = documentBody([]);
  const name = bundle.identity.find(([k]) => k === 'contents')?.[1] ?? 'Cutline export';
  const description = bundle.identity.map(([k, v]) => `${k}: ${v}`).join('\n');
  // tokml writes no document-level name or description: they go first inside <Document>.
  return `${head}\n<name>${escapeXml(name)}</name>\n<description>${escapeXml(description)}</description>${bundle.tables.map(folderOf).join('')}${tail}`;
}

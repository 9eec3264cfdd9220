// A zipped Shapefile (.shp with its .dbf, and .prj/.cpg when present) → features in the
// file's own coordinates, its CRS transform, and the fields of its table. Geometry and the
// table are read by the `shapefile` package; the .prj decides the CRS, the .cpg the encoding.
import type { Feature, FeatureCollection, Geometry } from 'geojson';
import * as shapefile from 'shapefile';
import { RoadImportError } from '../../../shared/geo/road-import-error';
import { crsFromName, crsFromWkt, type CrsTransform } from './crs';
import { unzipBounded } from './unzip-bounded';

export interface RawGisLayer {
  /** Features in the source CRS, as read. */
  collection: FeatureCollection;
  /** Null when the file names no CRS. */
  transform: CrsTransform | null;
  /** Layers the file holds (several .shp in one archive, GeoPackage tables). */
  layers: string[];
  layer: string;
}

/** Code page names in .cpg files (GDAL, ArcGIS) → WHATWG encoding labels. */
export function encodingOfCpg(text: string): string | undefined {
  const t = text.trim().toLowerCase();
  if (t === '') return undefined;
  if (t === 'utf-8' || t === 'utf8' || t === '65001') return 'utf-8';
  const m = /^(?:ansi\s*|cp|windows-?)?(\d{3,5})$/.exec(t);
  if (m) {
    const n = Number(m[1]);
    if (n >= 1250 && n <= 1258) return `windows-${n}`;
    if (n >= 88591 && n <= 885916) return `iso-8859-${n - 88590}`;
    if (n === 866) return 'ibm866';
    if (n === 874) return 'windows-874';
    if (n === 932) return 'shift_jis';
    if (n === 936) return 'gbk';
    if (n === 949) return 'euc-kr';
    if (n === 950) return 'big5';
    return undefined;
  }
  try {
    return new TextDecoder(t).encoding;
  } catch {
    return undefined;
  }
}

export interface ShapefileOptions {
  label: string;
  layer?: string | undefined;
  crs?: string | undefined;
  encoding?: string | undefined;
  maxExpandedBytes: number;
  maxFeatures: number;
}

/** @throws RoadImportError `unreadableFile` | `wrongCrs` */
export async function readShapefileZip(bytes: Uint8Array, o: ShapefileOptions): Promise<RawGisLayer> {
  const { files } = unzipBounded(bytes, o.label, o.maxExpandedBytes, (base) => /\.(shp|dbf|prj|cpg)$/.test(base));
  const layers = [...files.keys()].filter((n) => n.endsWith('.shp')).map((n) => n.slice(0, -4)).sort();
  if (layers.length === 0) {
    const dbfOnly = [...files.keys()].some((n) => n.endsWith('.dbf'));
    throw new RoadImportError('unreadableFile', `${o.label}: the zip archive holds no .shp file${dbfOnly ? ' (only a .dbf table)' : ''}; a Shapefile needs its .shp, .dbf and .prj together in one zip`);
  }
  const wanted = o.layer?.toLowerCase().replace(/\.shp$/, '');
  if (wanted !== undefined && !layers.includes(wanted)) {
    throw new RoadImportError('unreadableFile', `${o.label}: no layer ${JSON.stringify(o.layer)} in the archive; it holds ${layers.join(', ')}`);
  }
  if (wanted === undefined && layers.length > 1) {
    throw new RoadImportError('unreadableFile', `${o.label}: the archive holds ${layers.length} Shapefiles (${layers.join(', ')}); choose one layer`);
  }
  const layer = wanted ?? layers[0]!;
  const shp = files.get(`${layer}.shp`)!.bytes;
  const dbf = files.get(`${layer}.dbf`)?.bytes;
  if (!dbf) {
    throw new RoadImportError('unreadableFile', `${o.label}: ${layer}.shp has no ${layer}.dbf beside it, so its features have no attributes (road class, lanes, names); add the .dbf to the zip`);
  }
  const prj = files.get(`${layer}.prj`)?.bytes;
  const cpg = files.get(`${layer}.cpg`)?.bytes;
  const encoding = (cpg ? encodingOfCpg(new TextDecoder('latin1').decode(cpg)) : undefined) ?? o.encoding ?? 'windows-1252';

  // The planner's answer wins over the .prj: it is how a wrong or unreadable .prj is overcome.
  let transform: CrsTransform | null = null;
  const prjText = prj ? new TextDecoder('latin1').decode(prj) : '';
  if (o.crs) transform = crsFromName(o.crs, o.label);
  else if (prjText.trim() !== '') transform = crsFromWkt(prjText, `${o.label} (${layer}.prj)`);

  const features: Feature[] = [];
  try {
    const source = await shapefile.open(toArrayBuffer(shp), toArrayBuffer(dbf), { encoding });
    for (;;) {
      const r = await source.read();
      if (r.done) break;
      if (features.length >= o.maxFeatures) {
        throw new RoadImportError('unreadableFile', `${o.label}: more than ${o.maxFeatures} features, more than an import can read; split the area into smaller files`);
      }
      features.push({ type: 'Feature', geometry: r.value.geometry as Geometry, properties: r.value.properties ?? {} });
    }
  } catch (error) {
    if (error instanceof RoadImportError) throw error;
    throw new RoadImportError('unreadableFile', `${o.label}: ${layer}.shp or ${layer}.dbf is corrupt or cut short (${String((error as Error).message ?? error)})`);
  }
  return { collection: { type: 'FeatureCollection', features }, transform, layers, layer };
}

function toArrayBuffer(b: Uint8Array): ArrayBuffer {
  return b.buffer.slice(b.byteOffset, b.byteOffset + b.byteLength) as ArrayBuffer;
}

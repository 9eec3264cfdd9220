// KML and KMZ (a zip holding a .kml) → features, with @tmcw/togeojson over an @xmldom/xmldom
// document. KML coordinates are always WGS84 longitude/latitude (OGC 07-147r2 §6.2), so there
// is nothing to reproject. A document type declaration is refused before parsing: KML has no
// use for one, and entity declarations are how XML files expand or reach outside themselves.
import { kml } from '@tmcw/togeojson';
import { DOMParser } from '@xmldom/xmldom';
import type { Feature, Geometry } from 'geojson';
import { RoadImportError } from '../../../shared/geo/road-import-error';
import type { RawGisLayer } from './read-shapefile-zip';
import { unzipBounded } from './unzip-bounded';

export interface KmlOptions {
  label: string;
  maxExpandedBytes: number;
  maxFeatures: number;
}

function fail(label: string, message: string): never {
  throw new RoadImportError('unreadableFile', `${label}: ${message}`);
}

/** MultiGeometry comes out as a GeometryCollection: lines become one MultiLineString, so a road drawn in pieces stays one road. */
function simplify(g: Geometry | null): Geometry | null {
  if (!g || g.type !== 'GeometryCollection') return g;
  const parts = g.geometries.map(simplify);
  if (parts.length > 0 && parts.every((p) => p?.type === 'LineString' || p?.type === 'MultiLineString')) {
    return { type: 'MultiLineString', coordinates: parts.flatMap((p) => (p!.type === 'LineString' ? [p!.coordinates] : (p as { coordinates: number[][][] }).coordinates)) };
  }
  if (parts.length > 0 && parts.every((p) => p?.type === 'Polygon' || p?.type === 'MultiPolygon')) {
    return { type: 'MultiPolygon', coordinates: parts.flatMap((p) => (p!.type === 'Polygon' ? [p!.coordinates] : (p as { coordinates: number[][][][] }).coordinates)) };
  }
  return g;
}

export function readKmlText(bytes: Uint8Array, o: KmlOptions): RawGisLayer {
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    fail(o.label, 'the KML is not UTF-8 text');
  }
  if (/<!DOCTYPE|<!ENTITY/i.test(text)) fail(o.label, 'the KML declares a document type or entities, which KML never needs; remove the <!DOCTYPE …> declaration');
  let doc;
  try {
    doc = new DOMParser({
      onError: (level, message) => {
        if (level !== 'warning') throw new Error(message);
      },
    }).parseFromString(text, 'text/xml');
  } catch (error) {
    fail(o.label, `not well-formed XML (${String((error as Error).message ?? error).split('\n')[0]})`);
  }
  const root = doc.documentElement;
  if (!root || root.localName !== 'kml') fail(o.label, `not a KML document (the root element is <${root?.nodeName ?? 'none'}>, not <kml>)`);
  const collection = kml(doc);
  if (collection.features.length > o.maxFeatures) fail(o.label, `more than ${o.maxFeatures} placemarks, more than an import can read`);
  const features: Feature[] = collection.features.map((f) => ({ type: 'Feature', geometry: simplify(f.geometry) as Geometry, properties: f.properties ?? {}, ...(f.id !== undefined ? { id: f.id } : {}) }));
  return { collection: { type: 'FeatureCollection', features }, transform: null, layers: [], layer: 'kml' };
}

export function readKmz(bytes: Uint8Array, o: KmlOptions): RawGisLayer {
  const { files } = unzipBounded(bytes, o.label, o.maxExpandedBytes, (base) => base.endsWith('.kml'));
  // The KMZ convention: the first .kml, usually doc.kml, is the document.
  const entry = files.get('doc.kml') ?? [...files.values()][0];
  if (!entry) fail(o.label, 'the KMZ archive holds no .kml document');
  return readKmlText(entry.bytes, o);
}

// What an uploaded file holds, for the field-mapping step: format, layers, CRS, extent, fields
// with their types and sample values, geometry counts, and the first features for the preview
// map. Pure (readGisFile does the reading, within its bounds).
import type { Feature } from 'geojson';
import type { FileField, FileSchema, SourceReadOptions } from '../../../shared/api/road-import';
import { undeclaredProjectedError } from './crs';
import { readGisFile } from './read-gis-file';
import { extentOf } from './reproject';

export const PREVIEW_FEATURES = 300;
const MAX_DISTINCT = 1000;
const SAMPLES = 8;

function typeOf(v: unknown): 'number' | 'text' | 'boolean' | null {
  if (v === null || v === undefined || v === '') return null;
  if (typeof v === 'number' || typeof v === 'bigint') return 'number';
  if (typeof v === 'boolean') return 'boolean';
  return 'text';
}

export function describeFields(features: Feature[]): FileField[] {
  const fields = new Map<string, { types: Set<string>; values: Set<string>; capped: boolean; empty: number }>();
  for (const f of features) for (const key of Object.keys(f.properties ?? {})) if (!fields.has(key)) fields.set(key, { types: new Set(), values: new Set(), capped: false, empty: 0 });
  for (const f of features) {
    const p = f.properties ?? {};
    for (const [key, field] of fields) {
      const v = p[key];
      const t = typeOf(v);
      if (t === null) {
        field.empty += 1;
        continue;
      }
      field.types.add(t);
      if (field.values.size < MAX_DISTINCT) field.values.add(typeof v === 'object' ? JSON.stringify(v) : String(v));
      else if (!field.values.has(String(v))) field.capped = true;
    }
  }
  return [...fields.entries()].map(([name, f]) => ({
    name,
    type: f.types.size === 0 ? 'empty' : f.types.size > 1 ? 'mixed' : ([...f.types][0] as 'number' | 'text' | 'boolean'),
    samples: [...f.values].slice(0, SAMPLES).map((s) => s.slice(0, 80)),
    distinct: f.values.size,
    distinctCapped: f.capped,
    empty: f.empty,
  }));
}

/** @throws RoadImportError as readGisFile does (a file that cannot be read has no schema either). */
export async function readFileSchema(bytes: Uint8Array, source: SourceReadOptions = {}, fileName = 'upload'): Promise<FileSchema> {
  const reading = await readGisFile(bytes, { ...source, fileName });
  if (reading.kind === 'osm') {
    // OpenStreetMap files carry their own tags: nothing to map. Counts only.
    const ways = reading.osm.elements.filter((e) => e.type === 'way');
    const roads = ways.filter((w) => typeof w.tags?.['highway'] === 'string');
    return { fileName, format: reading.format, layers: [], layer: null, featureCount: ways.length, geometryTypes: { way: ways.length, 'way with highway': roads.length }, fields: [], sourceCrs: null, extent: null, preview: [] };
  }
  // The planner must name the CRS first: the refusal lists the codes the extent suggests.
  if (reading.undeclaredProjected) throw undeclaredProjectedError(fileName, reading.undeclaredProjected);
  const features = reading.collection.features;
  const geometryTypes: Record<string, number> = {};
  for (const f of features) {
    const t = f.geometry?.type ?? 'none';
    geometryTypes[t] = (geometryTypes[t] ?? 0) + 1;
  }
  const extent = extentOf(reading.collection);
  return {
    fileName,
    format: reading.format,
    layers: reading.layers,
    layer: reading.layer,
    featureCount: features.length,
    geometryTypes,
    fields: describeFields(features),
    sourceCrs: reading.sourceCrs,
    extent,
    preview: features.slice(0, PREVIEW_FEATURES).map((f, index) => ({
      index,
      geometry: f.geometry ? { type: f.geometry.type, coordinates: (f.geometry as { coordinates?: unknown }).coordinates ?? null } : null,
      properties: Object.fromEntries(Object.entries(f.properties ?? {}).map(([k, v]) => [k, typeof v === 'string' ? v.slice(0, 200) : v])),
    })),
  };
}

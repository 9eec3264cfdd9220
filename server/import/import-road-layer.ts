// The server's entry to road import: uploaded bytes (GeoJSON, OSM XML or OSM JSON, plain,
// .bz2 or .gz) → the built network, or a RoadImportError naming what is wrong. Pure apart
// from reading the file in importRoadLayerFile; nothing is saved here.
import { readFile } from 'node:fs/promises';
import type { ImportOptionsInput } from '../../shared/api/road-import';
import { buildRoadGraph, type RoadGraph } from '../../shared/geo/build-road-graph';
import { decodeUpload, parseJsonBytes } from './decode-upload';
import { osmToRoadFeatures } from './osm-to-road-features';
import { readOsmXml } from './read-osm-xml';

/**
 * @throws RoadImportError (`unreadableFile`, `wrongCrs`, `badFeatures`, `noDrivableRoads`)
 */
export function importRoadLayer(bytes: Uint8Array, options: ImportOptionsInput = {}, fileName = 'upload'): RoadGraph {
  const decoded = decodeUpload(bytes, fileName);
  if (decoded.kind === 'xml') {
    const { collection, context } = osmToRoadFeatures(readOsmXml(decoded.bytes));
    return buildRoadGraph(collection, options, { sourceFormat: 'osmXml', ...context });
  }
  const json = parseJsonBytes(decoded.bytes, fileName);
  if (json !== null && typeof json === 'object' && Array.isArray((json as { elements?: unknown }).elements)) {
    const { collection, context } = osmToRoadFeatures(json);
    return buildRoadGraph(collection, options, { sourceFormat: 'osmJson', ...context });
  }
  return buildRoadGraph(json, options, { sourceFormat: 'geojson' });
}

/** importRoadLayer for a file on disk (the CLI, the seed). */
export async function importRoadLayerFile(path: string, options: ImportOptionsInput = {}): Promise<RoadGraph> {
  return importRoadLayer(await readFile(path), options, path.split('/').pop() ?? path);
}

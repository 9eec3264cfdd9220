// The server's entry to road import: uploaded bytes → the built network, or a RoadImportError
// naming what is wrong. Pure apart from reading the file in importRoadLayerFile; nothing is
// saved here. `importRoadLayerUpload` reads every format (readGisFile); `importRoadLayer` is
// its synchronous subset for GeoJSON in WGS84 and OpenStreetMap XML/JSON (the seed, tests).
import { readFile } from 'node:fs/promises';
import type { ImportOptionsInput } from '../../shared/api/road-import';
import { buildRoadGraph, type RoadGraph } from '../../shared/geo/build-road-graph';
import { RoadImportError } from '../../shared/geo/road-import-error';
import { decodeUpload, parseJsonBytes } from './decode-upload';
import { readGisFile, withCrsQuestion, type GisReadOptions } from './gis/read-gis-file';
import { osmToRoadFeatures } from './osm-to-road-features';
import { readOsmXml } from './read-osm-xml';

/**
 * Any format Cutline reads: GeoJSON (with or without a `crs` member), zipped Shapefile,
 * GeoPackage, KML/KMZ, OpenStreetMap XML/JSON/PBF, each optionally .gz/.bz2 compressed.
 * Reprojected to WGS84; the source CRS is kept in the report.
 * @throws RoadImportError (`unreadableFile`, `wrongCrs`, `badFeatures`, `noDrivableRoads`)
 */
export async function importRoadLayerUpload(bytes: Uint8Array, options: ImportOptionsInput = {}, fileName = 'upload', limits: Pick<GisReadOptions, 'maxExpandedBytes' | 'maxFeatures'> = {}): Promise<RoadGraph> {
  const reading = await readGisFile(bytes, { ...options.source, ...limits, fileName });
  if (reading.kind === 'osm') {
    const { collection, context } = osmToRoadFeatures(reading.osm);
    return buildRoadGraph(collection, options, { sourceFormat: reading.format, ...context });
  }
  if (reading.format === 'csv') {
    throw new RoadImportError('unreadableFile', `${fileName}: a CSV table holds points; roads need lines (GeoJSON, Shapefile, GeoPackage, KML or OpenStreetMap)`);
  }
  return withCrsQuestion(reading, fileName, () => buildRoadGraph(reading.collection, options, { sourceFormat: reading.format, sourceCrs: reading.sourceCrs }));
}

/**
 * GeoJSON in WGS84 and OpenStreetMap XML/JSON, synchronously.
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

/** importRoadLayerUpload for a file on disk (the CLI, the seed). */
export async function importRoadLayerFile(path: string, options: ImportOptionsInput = {}): Promise<RoadGraph> {
  return importRoadLayerUpload(await readFile(path), options, path.split('/').pop() ?? path);
}

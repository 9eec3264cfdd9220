// Uploaded road features → lines with resolved attributes, plus what was dropped and why.
// Malformed geometry is collected per feature; the caller fails the whole import on it.
import type { BadFeature, DropReason, PropertyMapping } from '../api/road-import';
import type { LonLat, RoadClass, SegmentAttributes } from '../api/road-attributes';
import { failOnBadFeatures, geometryTypeName, preview, readFeatureCollection, readPosition } from './check-feature-collection';
import { readMappedProperties, tagsOf } from './read-mapped-properties';
import { readRoadTags, type RoadReading } from './read-road-tags';

export interface RoadLine {
  featureIndex: number;
  sourceId: string | null;
  attributes: SegmentAttributes;
  /** Positions in the travel direction of one-way roads, consecutive duplicates removed. */
  coordinates: LonLat[];
}

export interface RoadFeatureReading {
  featureCount: number;
  lines: RoadLine[];
  keptFeatures: Map<RoadClass, number>;
  /** key `${reason}\u0000${roadClass}` → features */
  dropped: Map<string, number>;
  /** key `${key}\u0000${value}` → features */
  unread: Map<string, number>;
}

function bump(map: Map<string, number>, key: string): void {
  map.set(key, (map.get(key) ?? 0) + 1);
}

type PartsOrProblem = { parts: LonLat[][] } | { drop: DropReason } | { problem: string; outOfRange: boolean };

function readLineParts(geometry: unknown): PartsOrProblem {
  if (geometry === null || geometry === undefined) return { drop: 'noGeometry' };
  if (typeof geometry !== 'object') return { problem: 'geometry is not an object', outOfRange: false };
  const g = geometry as { type?: unknown; coordinates?: unknown; notAFeature?: boolean };
  if (g.notAFeature) return { problem: 'not a GeoJSON Feature (type must be "Feature")', outOfRange: false };
  if (g.type === 'Point' || g.type === 'MultiPoint' || g.type === 'Polygon' || g.type === 'MultiPolygon' || g.type === 'GeometryCollection') {
    return { drop: 'notALine' };
  }
  if (g.type !== 'LineString' && g.type !== 'MultiLineString') return { problem: `unknown geometry type ${geometryTypeName(g)}`, outOfRange: false };
  const rawParts = g.type === 'LineString' ? [g.coordinates] : g.coordinates;
  if (!Array.isArray(rawParts) || rawParts.length === 0) return { problem: `${g.type} has no coordinates`, outOfRange: false };
  const parts: LonLat[][] = [];
  for (const [pi, raw] of rawParts.entries()) {
    const where = g.type === 'MultiLineString' ? `line ${pi}, ` : '';
    if (!Array.isArray(raw) || raw.length < 2) return { problem: `${where}a line needs at least two positions`, outOfRange: false };
    const line: LonLat[] = [];
    for (const [vi, p] of raw.entries()) {
      const pos = readPosition(p);
      if (pos === 'notAPosition') return { problem: `${where}position ${vi} is not [longitude, latitude]: ${preview(p)}`, outOfRange: false };
      if (pos === 'outOfRange') return { problem: `${where}position ${vi} ${preview(p)} is outside longitude/latitude range`, outOfRange: true };
      const last = line[line.length - 1];
      if (!last || last[0] !== pos[0] || last[1] !== pos[1]) line.push(pos);
    }
    parts.push(line);
  }
  return { parts };
}

/**
 * Reads a road FeatureCollection. Without a mapping, properties are OSM tags.
 * @throws RoadImportError `unreadableFile`, `wrongCrs`, or `badFeatures` listing every bad one.
 */
export function readRoadFeatures(input: unknown, mapping: PropertyMapping | null): RoadFeatureReading {
  const features = readFeatureCollection(input, 'Road layer', mapping?.id);
  const reading: RoadFeatureReading = {
    featureCount: features.length,
    lines: [],
    keptFeatures: new Map(),
    dropped: new Map(),
    unread: new Map(),
  };
  const bad: BadFeature[] = [];
  let outOfRange = 0;
  for (const f of features) {
    const geometry = readLineParts(f.geometry);
    if ('problem' in geometry) {
      bad.push({ index: f.index, id: f.id, problem: geometry.problem });
      if (geometry.outOfRange) outOfRange += 1;
      continue;
    }
    const road: RoadReading = mapping ? readMappedProperties(f.properties, mapping) : readRoadTags(tagsOf(f.properties));
    if ('drop' in geometry) {
      bump(reading.dropped, `${geometry.drop}\u0000${road.kind === 'keep' ? road.attributes.roadClass : road.roadClass}`);
      continue;
    }
    if (road.kind === 'drop') {
      bump(reading.dropped, `${road.reason}\u0000${road.roadClass}`);
      continue;
    }
    const parts = geometry.parts.filter((p) => p.length >= 2);
    if (parts.length === 0) {
      bump(reading.dropped, `zeroLength\u0000${road.attributes.roadClass}`);
      continue;
    }
    for (const u of road.unread) bump(reading.unread, `${u.key}\u0000${u.value}`);
    reading.keptFeatures.set(road.attributes.roadClass, (reading.keptFeatures.get(road.attributes.roadClass) ?? 0) + 1);
    for (const part of parts) {
      reading.lines.push({
        featureIndex: f.index,
        sourceId: f.id,
        attributes: road.attributes,
        coordinates: road.reverse ? part.slice().reverse() : part,
      });
    }
  }
  failOnBadFeatures('Road layer', bad, outOfRange, features.length);
  return reading;
}

// The built network and its import report as GeoJSON, for the map: segments as lines with
// their attributes, and the report's findings (dangling ends, joined ends, tiny segments,
// small components) as features a layer can colour by `finding`.
import type { Feature, FeatureCollection, LineString, Point } from 'geojson';
import type { ImportReport } from '../api/road-import';
import type { NetworkNode, NetworkSegment } from '../api/road-attributes';

export function segmentsToGeoJson(segments: readonly NetworkSegment[]): FeatureCollection<LineString> {
  return {
    type: 'FeatureCollection',
    features: segments.map((s, index) => ({
      type: 'Feature',
      id: index,
      properties: {
        segment: index,
        fromNode: s.fromNode,
        toNode: s.toNode,
        lengthMeters: s.lengthMeters,
        component: s.component,
        sourceId: s.sourceId,
        ...s.attributes,
      },
      geometry: { type: 'LineString', coordinates: s.coordinates.map(([lon, lat]) => [lon, lat]) },
    })),
  };
}

export type FindingKind = 'danglingEnd' | 'snappedEnd' | 'tinySegment' | 'smallComponent';

/**
 * One feature per finding. Small components are every component but the largest, drawn as
 * their segments. `detail` says what to show in a tooltip.
 */
export function reportFindingsToGeoJson(
  report: Pick<ImportReport, 'danglingEnds' | 'snappedEnds' | 'tinySegments' | 'components'>,
  network: { nodes: readonly NetworkNode[]; segments: readonly NetworkSegment[] },
): FeatureCollection<Point | LineString> {
  const features: Feature<Point | LineString>[] = [];
  const point = (finding: FindingKind, lon: number, lat: number, props: Record<string, unknown>) =>
    features.push({ type: 'Feature', properties: { finding, ...props }, geometry: { type: 'Point', coordinates: [lon, lat] } });
  const line = (finding: FindingKind, segment: number, props: Record<string, unknown>) =>
    features.push({
      type: 'Feature',
      properties: { finding, segment, ...props },
      geometry: { type: 'LineString', coordinates: network.segments[segment]!.coordinates.map(([lon, lat]) => [lon, lat]) },
    });
  for (const d of report.danglingEnds) point('danglingEnd', d.lon, d.lat, { node: d.node, detail: 'road ends here' });
  for (const s of report.snappedEnds) {
    point('snappedEnd', s.lon, s.lat, { node: s.node, ends: s.ends, movedMeters: s.movedMeters, detail: `${s.ends} end(s) joined, moved up to ${s.movedMeters.toFixed(1)} m` });
  }
  for (const t of report.tinySegments) line('tinySegment', t.segment, { lengthMeters: t.lengthMeters, detail: `${t.lengthMeters.toFixed(2)} m long` });
  const small = new Set(report.components.filter((c) => c.id !== 0).map((c) => c.id));
  network.segments.forEach((s, i) => {
    if (small.has(s.component)) line('smallComponent', i, { component: s.component, detail: `not connected to the main network (component ${s.component})` });
  });
  return { type: 'FeatureCollection', features };
}

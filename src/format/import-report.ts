// The import report as sections a planner reads top to bottom: what was kept, what was dropped
// and why, where defaults were applied, and the problems with a place on the map (dangling
// ends, snapped ends, separate parts of the network). Pure: the component only lists them.
import type { BadFeature, DropReason, ImportReport } from '@shared/api/road-import';
import { roadClassLooks } from '@/map/road-style';
import type { Bbox } from '@/map/viewport';
import { formatCount, formatShare } from '@shared/format/numbers';
import { screenLength } from './preferences';

export type ReportLocation = { kind: 'point'; lon: number; lat: number } | { kind: 'bbox'; bbox: Bbox };
export type ReportItem = { text: string; location?: ReportLocation; label?: string };
export type ReportSection = {
  key: string;
  title: string;
  severity: 'info' | 'warning';
  summary: string;
  items: ReportItem[];
  /** Items beyond those listed (long lists are cut to keep the panel usable). */
  more: number;
};

export const dropReasonWords: Record<DropReason, string> = {
  notDrivableClass: 'not for cars (footway, cycleway, steps…)',
  noRoadClass: 'no road class',
  unknownClass: 'class not recognised or mapped to drop',
  noMotorVehicles: 'closed to motor vehicles',
  area: 'drawn as an area',
  notALine: 'not a line',
  noGeometry: 'no geometry',
  reversibleOneway: 'direction changes with time',
  zeroLength: 'zero length',
};

const formatWords: Record<ImportReport['sourceFormat'], string> = {
  geojson: 'GeoJSON',
  osmXml: 'OpenStreetMap XML',
  osmJson: 'OpenStreetMap JSON',
  osmPbf: 'OpenStreetMap PBF',
  shapefile: 'Shapefile',
  geopackage: 'GeoPackage',
  kml: 'KML',
  csv: 'CSV',
};

const listLimit = 40;

function classLabel(roadClass: string): string {
  return roadClass in roadClassLooks ? roadClassLooks[roadClass as keyof typeof roadClassLooks].label : roadClass || '(none)';
}

function cut<T>(items: T[]): { items: T[]; more: number } {
  return { items: items.slice(0, listLimit), more: Math.max(0, items.length - listLimit) };
}

export function importSummary(report: ImportReport): string {
  return (
    `${formatCount(report.segmentCount)} segments and ${formatCount(report.nodeCount)} junctions ` +
    `(${screenLength(report.totalLengthMeters)} of road) from ${formatCount(report.featureCount)} features, ${formatWords[report.sourceFormat]}` +
    (report.sourceCrs ? `, reprojected from ${report.sourceCrs.epsg !== null ? `EPSG:${report.sourceCrs.epsg} ` : ''}(${report.sourceCrs.name}).` : '.')
  );
}

export function importReportSections(report: ImportReport): ReportSection[] {
  const sections: ReportSection[] = [];
  const plural = (n: number, one: string, many = `${one}s`) => `${formatCount(n)} ${n === 1 ? one : many}`;

  sections.push({
    key: 'kept',
    title: 'Kept, by road class',
    severity: 'info',
    summary: plural(report.kept.reduce((s, k) => s + k.segments, 0), 'segment'),
    items: [...report.kept]
      .sort((a, b) => b.lengthMeters - a.lengthMeters)
      .map((k) => ({ text: `${classLabel(k.roadClass)}: ${plural(k.segments, 'segment')}, ${screenLength(k.lengthMeters)}` })),
    more: 0,
  });

  if (report.dropped.length > 0) {
    sections.push({
      key: 'dropped',
      title: 'Left out',
      severity: 'info',
      summary: plural(report.dropped.reduce((s, d) => s + d.features, 0), 'feature'),
      items: report.dropped.map((d) => ({ text: `${classLabel(d.roadClass)}: ${plural(d.features, 'feature')}, ${dropReasonWords[d.reason]}` })),
      more: 0,
    });
  }

  const defaulted = report.defaultsApplied.filter((d) => d.lanes > 0 || d.speed > 0);
  if (defaulted.length > 0) {
    sections.push({
      key: 'defaults',
      title: 'Class defaults used',
      severity: 'info',
      summary: 'where the data gave no lanes or speed',
      items: defaulted.map((d) => ({ text: `${classLabel(d.roadClass)}: lanes on ${plural(d.lanes, 'segment')}, speed on ${plural(d.speed, 'segment')}` })),
      more: 0,
    });
  }

  if (report.unreadValues.length > 0) {
    sections.push({
      key: 'unread',
      title: 'Values that could not be read',
      severity: 'warning',
      summary: 'replaced by the class default',
      ...cut(report.unreadValues.map((u) => ({ text: `${u.key} = “${u.value}” on ${plural(u.features, 'feature')}` }))),
    });
  }

  if (report.waysCutAtMissingNodes.length > 0) {
    sections.push({
      key: 'missingNodes',
      title: 'Roads cut where the file lacks nodes',
      severity: 'warning',
      summary: plural(report.waysCutAtMissingNodes.length, 'way'),
      ...cut(report.waysCutAtMissingNodes.map((w) => ({ text: `${w.sourceId}: ${plural(w.missingNodeIds.length, 'missing node')}` }))),
    });
  }

  sections.push({
    key: 'crossings',
    title: 'Crossings',
    severity: 'info',
    summary: report.splitAtCrossings ? `${plural(report.crossingsJoined, 'crossing')} joined` : 'joined only at shared points',
    items: [
      { text: report.splitAtCrossings ? `Roads were split and joined where they cross: ${plural(report.crossingsJoined, 'crossing')}.` : 'Roads meet only where the file shares a point (OpenStreetMap style).' },
      { text: `${plural(report.crossingsOnDifferentLayers, 'crossing')} kept apart: bridge, tunnel or another layer.` },
    ],
    more: 0,
  });

  if (report.components.length > 1) {
    const [main, ...rest] = report.components;
    sections.push({
      key: 'components',
      title: 'Separate parts of the network',
      severity: 'warning',
      summary: `${formatCount(report.components.length)} parts; traffic cannot pass between them`,
      ...cut(
        [main!, ...rest].map((c, i) => ({
          text: `${i === 0 ? 'Main part' : `Part ${i + 1}`}: ${plural(c.segments, 'segment')}, ${formatShare(c.shareOfLength)} of the length`,
          location: { kind: 'bbox' as const, bbox: c.bbox },
          label: i === 0 ? 'Main part' : `Part ${i + 1}`,
        })),
      ),
    });
  }

  if (report.danglingEnds.length > 0) {
    sections.push({
      key: 'dangling',
      title: 'Dead ends',
      severity: 'warning',
      summary: `${plural(report.danglingEnds.length, 'road end')} joined to nothing within ${screenLength(report.snapToleranceMeters)}`,
      ...cut(report.danglingEnds.map((d, i) => ({ text: `Dead end ${i + 1} (junction ${d.node})`, location: { kind: 'point' as const, lon: d.lon, lat: d.lat }, label: `Dead end ${i + 1}` }))),
    });
  }

  if (report.snappedEnds.length > 0) {
    sections.push({
      key: 'snapped',
      title: 'Ends joined to a nearby road',
      severity: 'info',
      summary: `${plural(report.snappedEnds.length, 'end')} moved up to ${screenLength(report.snapToleranceMeters)}`,
      ...cut(
        report.snappedEnds.map((s, i) => ({
          text: `Joined end ${i + 1}: moved ${screenLength(s.movedMeters)}`,
          location: { kind: 'point' as const, lon: s.lon, lat: s.lat },
          label: `Joined end ${i + 1}`,
        })),
      ),
    });
  }

  if (report.tinySegments.length > 0) {
    sections.push({
      key: 'tiny',
      title: 'Very short segments',
      severity: 'info',
      summary: `${plural(report.tinySegments.length, 'segment')} under ${screenLength(report.tinySegmentMeters)}; sort the segment table by length to see them`,
      items: [],
      more: 0,
    });
  }
  return sections;
}

/** A refused file's bad features, one line each. */
export function badFeatureLines(badFeatures: readonly BadFeature[]): string[] {
  return badFeatures.map((f) => `Feature ${f.index + 1}${f.id ? ` (${f.id})` : ''}: ${f.problem}`);
}

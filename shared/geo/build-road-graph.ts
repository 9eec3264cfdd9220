// The front door of road import: a parsed GeoJSON FeatureCollection (from a GIS or from
// OpenStreetMap via osmtogeojson) → nodes, segments and a report of everything assumed.
import { importOptionsSchema, type DropReason, type ImportOptionsInput, type ImportReport } from '../api/road-import';
import { type NetworkNode, type NetworkSegment, type RoadClass } from '../api/road-attributes';
import { cutIntoSegments } from './cut-into-segments';
import { connectedComponents } from './road-graph-components';
import { readRoadFeatures } from './read-road-features';
import { RoadImportError } from './road-import-error';
import { joinDanglingEnds, snapDanglingEnds } from './snap-dangling-ends';
import { chooseCellMeters } from './spatial-grid';
import { splitAtCrossings } from './split-at-crossings';
import type { TopoLine } from './topology-lines';
import { LocalPlane, VertexStore } from './vertex-store';

export interface RoadGraph {
  /** Index = node id. */
  nodes: NetworkNode[];
  segments: NetworkSegment[];
  report: ImportReport;
}

export interface RoadSourceContext {
  sourceFormat: ImportReport['sourceFormat'];
  /** The coordinate system the file was reprojected from, if it was not WGS84. */
  sourceCrs?: ImportReport['sourceCrs'];
  /** Filled by the OSM reader: ways cut where they referenced nodes missing from the file. */
  waysCutAtMissingNodes?: ImportReport['waysCutAtMissingNodes'];
  /** Features the reader left out before conversion (e.g. OSM ways without `highway`);
   *  added to the report's dropped list and feature count. */
  preDropped?: ImportReport['dropped'];
}

function splitKey(key: string): [string, string] {
  const i = key.indexOf('\u0000');
  return [key.slice(0, i), key.slice(i + 1)];
}

/**
 * Builds the road network. Topology: a node wherever lines share a vertex or end; dangling
 * ends within the snap tolerance are joined to one another or to the nearest vertex; for GIS
 * data (by default GeoJSON uploads) roads are then split where they cross on the same layer;
 * finally remaining dangling ends are joined to the nearest vertex or edge. Lengths are turf's haversine
 * distances along the vertices.
 *
 * Runs in about O(V + E + P) for V vertices, E edges and P edge pairs sharing a grid cell.
 *
 * @throws RoadImportError `unreadableFile` | `wrongCrs` | `badFeatures` (every bad feature
 *   listed) | `noDrivableRoads`.
 */
export function buildRoadGraph(
  input: unknown,
  options: ImportOptionsInput = {},
  context: RoadSourceContext = { sourceFormat: 'geojson' },
): RoadGraph {
  const opts = importOptionsSchema.parse(options);
  const reading = readRoadFeatures(input, opts.propertyMapping);
  if (reading.lines.length === 0) {
    const dropped = [...reading.dropped.values()].reduce((a, b) => a + b, 0);
    throw new RoadImportError(
      'noDrivableRoads',
      `No drivable roads in ${reading.featureCount} features (${dropped} dropped: footways, other classes, points or areas).`,
    );
  }

  const plane = LocalPlane.around(reading.lines.map((l) => l.coordinates));
  const store = new VertexStore(plane);
  const lines: TopoLine[] = reading.lines.map((l) => ({
    verts: l.coordinates.map(([lon, lat]) => store.intern(lon, lat)),
    layer: l.attributes.layer,
  }));

  const edgeLengths: number[] = [];
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  for (const line of lines) for (let i = 0; i < line.verts.length; i += 1) {
    const v = line.verts[i]!;
    minX = Math.min(minX, store.x[v]!);
    maxX = Math.max(maxX, store.x[v]!);
    minY = Math.min(minY, store.y[v]!);
    maxY = Math.max(maxY, store.y[v]!);
    if (i > 0) {
      const u = line.verts[i - 1]!;
      edgeLengths.push(Math.hypot(store.x[v]! - store.x[u]!, store.y[v]! - store.y[u]!));
    }
  }
  const cellMeters = chooseCellMeters(edgeLengths, (maxX - minX) * (maxY - minY), Math.max(10, opts.snapToleranceMeters * 2));

  // OpenStreetMap ways share nodes at junctions; GIS layers often do not share vertices.
  const split = opts.splitAtCrossings ?? !context.sourceFormat.startsWith('osm');
  const tolerance = opts.snapToleranceMeters;
  const joinedEnds = joinDanglingEnds(lines, store, tolerance, cellMeters, split);
  const crossings = split ? splitAtCrossings(lines, store, cellMeters) : { joined: 0, onDifferentLayers: 0 };
  const snapped = [...joinedEnds, ...snapDanglingEnds(lines, store, tolerance, cellMeters)];
  const cut = cutIntoSegments(lines, store);
  if (cut.segments.length === 0) {
    throw new RoadImportError(
      'noDrivableRoads',
      `No drivable roads in ${reading.featureCount} features: every road collapsed to a point (zero length, or shorter than the ${tolerance} m snap tolerance).`,
    );
  }
  const { segmentComponent, components } = connectedComponents(cut.nodes, cut.segments);

  const segments: NetworkSegment[] = cut.segments.map((s, i) => {
    const line = reading.lines[s.line]!;
    return {
      fromNode: s.fromNode,
      toNode: s.toNode,
      coordinates: s.coordinates,
      lengthMeters: s.lengthMeters,
      attributes: { ...line.attributes },
      sourceFeatureIndex: line.featureIndex,
      sourceId: line.sourceId,
      component: segmentComponent[i]!,
    };
  });

  return {
    nodes: cut.nodes,
    segments,
    report: buildReport({ reading, segments, cut, components, crossings, snapped, store, split, opts, context }),
  };
}

interface ReportParts {
  reading: ReturnType<typeof readRoadFeatures>;
  segments: NetworkSegment[];
  cut: ReturnType<typeof cutIntoSegments>;
  components: ReturnType<typeof connectedComponents>['components'];
  crossings: { joined: number; onDifferentLayers: number };
  snapped: ReturnType<typeof snapDanglingEnds>;
  store: VertexStore;
  split: boolean;
  opts: ReturnType<typeof importOptionsSchema.parse>;
  context: RoadSourceContext;
}

function buildReport(p: ReportParts): ImportReport {
  const { reading, segments, cut, store, opts } = p;

  const keptFeatures = new Map<RoadClass, Set<number>>();
  const kept = new Map<RoadClass, { segments: number; lengthMeters: number }>();
  const defaults = new Map<RoadClass, { segments: number; lanes: number; speed: number }>();
  const degree = new Int32Array(cut.nodes.length);
  let arcCount = 0;
  let totalLengthMeters = 0;
  for (const s of segments) {
    const c = s.attributes.roadClass;
    if (!keptFeatures.has(c)) keptFeatures.set(c, new Set());
    keptFeatures.get(c)!.add(s.sourceFeatureIndex);
    const k = kept.get(c) ?? { segments: 0, lengthMeters: 0 };
    k.segments += 1;
    k.lengthMeters += s.lengthMeters;
    kept.set(c, k);
    const d = defaults.get(c) ?? { segments: 0, lanes: 0, speed: 0 };
    d.segments += 1;
    if (s.attributes.lanesForward === null || s.attributes.lanesBackward === null) d.lanes += 1;
    if (s.attributes.speedKmh === null) d.speed += 1;
    defaults.set(c, d);
    degree[s.fromNode]! += 1;
    degree[s.toNode]! += 1;
    arcCount += s.attributes.oneway ? 1 : 2;
    totalLengthMeters += s.lengthMeters;
  }

  // Features whose every line collapsed to a point while joining ends.
  const dropped = new Map(reading.dropped);
  let preDroppedFeatures = 0;
  for (const d of p.context.preDropped ?? []) {
    const key = `${d.reason}\u0000${d.roadClass}`;
    dropped.set(key, (dropped.get(key) ?? 0) + d.features);
    preDroppedFeatures += d.features;
  }
  const withSegments = new Set(segments.map((s) => s.sourceFeatureIndex));
  const collapsed = new Set<number>();
  for (const li of cut.collapsedLines) {
    const line = reading.lines[li]!;
    if (withSegments.has(line.featureIndex) || collapsed.has(line.featureIndex)) continue;
    collapsed.add(line.featureIndex);
    const key = `zeroLength\u0000${line.attributes.roadClass}`;
    dropped.set(key, (dropped.get(key) ?? 0) + 1);
  }

  const nodeOfVertex = new Map<number, number>();
  for (const [node, v] of cut.nodeVertex.entries()) nodeOfVertex.set(v, node);
  const snappedAt = new Map<number, ImportReport['snappedEnds'][number]>();
  for (const s of p.snapped) {
    const node = nodeOfVertex.get(store.find(s.vertex));
    if (node === undefined) continue;
    const n = cut.nodes[node]!;
    const entry = snappedAt.get(node);
    if (entry) {
      entry.ends += 1;
      entry.movedMeters = Math.max(entry.movedMeters, s.movedMeters);
    } else snappedAt.set(node, { node, lon: n.lon, lat: n.lat, ends: 1, movedMeters: s.movedMeters });
  }
  const snappedEnds = [...snappedAt.values()].sort((a, b) => a.node - b.node);

  const danglingEnds: ImportReport['danglingEnds'] = [];
  for (const [node, d] of degree.entries()) {
    if (d === 1) danglingEnds.push({ node, lon: cut.nodes[node]!.lon, lat: cut.nodes[node]!.lat });
  }

  const tinySegments: ImportReport['tinySegments'] = [];
  for (const [i, s] of segments.entries()) {
    if (s.lengthMeters < opts.tinySegmentMeters) tinySegments.push({ segment: i, lengthMeters: s.lengthMeters });
  }

  return {
    sourceFormat: p.context.sourceFormat,
    sourceCrs: p.context.sourceCrs ?? null,
    featureCount: reading.featureCount + preDroppedFeatures,
    nodeCount: cut.nodes.length,
    segmentCount: segments.length,
    arcCount,
    totalLengthMeters,
    kept: [...kept.entries()].map(([roadClass, k]) => ({
      roadClass,
      features: keptFeatures.get(roadClass)!.size,
      segments: k.segments,
      lengthMeters: k.lengthMeters,
    })),
    dropped: [...dropped.entries()]
      .map(([key, features]) => {
        const [reason, roadClass] = splitKey(key);
        return { roadClass, reason: reason as DropReason, features };
      })
      .sort((a, b) => b.features - a.features || a.roadClass.localeCompare(b.roadClass)),
    defaultsApplied: [...defaults.entries()].map(([roadClass, d]) => ({ roadClass, ...d })),
    unreadValues: [...reading.unread.entries()]
      .map(([key, features]) => {
        const [k, value] = splitKey(key);
        return { key: k, value, features };
      })
      .sort((a, b) => b.features - a.features),
    waysCutAtMissingNodes: p.context.waysCutAtMissingNodes ?? [],
    splitAtCrossings: p.split,
    crossingsJoined: p.crossings.joined,
    crossingsOnDifferentLayers: p.crossings.onDifferentLayers,
    snapToleranceMeters: opts.snapToleranceMeters,
    snappedEnds,
    danglingEnds,
    tinySegmentMeters: opts.tinySegmentMeters,
    tinySegments,
    components: p.components,
  };
}

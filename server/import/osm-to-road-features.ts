// OSM JSON → the road FeatureCollection the network builder reads, through osmtogeojson.
// Before converting: keep only ways with a `highway` tag (buildings and rivers are not
// roads; they are counted, not converted), drop relations (turn restrictions are not
// modelled), and cut ways where they reference nodes missing from the file, since
// osmtogeojson would join the remaining nodes with a straight line across the gap.
import type { FeatureCollection, Geometry } from 'geojson';
import osmtogeojson from 'osmtogeojson';
import type { ImportReport } from '../../shared/api/road-import';
import type { RoadSourceContext } from '../../shared/geo/build-road-graph';
import { RoadImportError } from '../../shared/geo/road-import-error';
import type { OsmElement, OsmJson, OsmNode, OsmWay } from './osm-json';

export interface OsmRoadFeatures {
  collection: FeatureCollection<Geometry>;
  context: Omit<RoadSourceContext, 'sourceFormat'>;
}

function isWay(e: OsmElement): e is OsmWay {
  return e.type === 'way';
}

/** @throws RoadImportError `unreadableFile` when the JSON has no `elements` list. */
export function osmToRoadFeatures(osm: unknown): OsmRoadFeatures {
  if (osm === null || typeof osm !== 'object' || !Array.isArray((osm as OsmJson).elements)) {
    throw new RoadImportError('unreadableFile', 'OpenStreetMap JSON: expected an object with an "elements" array');
  }
  const elements = (osm as OsmJson).elements;
  const position = new Map<number, OsmNode>();
  for (const e of elements) {
    if (e && e.type === 'node' && Number.isFinite(e.lat) && Number.isFinite(e.lon)) position.set(e.id, e);
  }

  const ways: OsmWay[] = [];
  const usedNodes = new Set<number>();
  const cut: ImportReport['waysCutAtMissingNodes'] = [];
  const preDropped = new Map<string, number>();
  let otherWays = 0;
  for (const e of elements) {
    if (!e || !isWay(e)) continue;
    const highway: unknown = e.tags?.['highway'];
    if (typeof highway !== 'string' || highway.trim() === '') {
      otherWays += 1;
      continue;
    }
    const refs = Array.isArray(e.nodes) ? e.nodes : [];
    // Overpass `out geom` carries positions with the ids; use them for nodes not listed.
    (Array.isArray(e.geometry) ? e.geometry : []).forEach((g, i) => {
      const id = refs[i];
      if (g && id !== undefined && !position.has(id)) position.set(id, { type: 'node', id, lat: g.lat, lon: g.lon });
    });
    const runs: number[][] = [[]];
    const missing: number[] = [];
    for (const ref of refs) {
      if (position.has(ref)) runs[runs.length - 1]!.push(ref);
      else {
        missing.push(ref);
        if (runs[runs.length - 1]!.length > 0) runs.push([]);
      }
    }
    if (missing.length > 0) cut.push({ sourceId: `way/${e.id}`, missingNodeIds: missing.map(String) });
    const pieces = runs.filter((r) => r.length >= 2);
    if (pieces.length === 0) {
      const key = `noGeometry\u0000${highway}`;
      preDropped.set(key, (preDropped.get(key) ?? 0) + 1);
      continue;
    }
    for (const nodes of pieces) {
      ways.push({ type: 'way', id: e.id, nodes, ...(e.tags ? { tags: e.tags } : {}) });
      for (const n of nodes) usedNodes.add(n);
    }
  }

  // Nodes go in without tags, so that traffic signals and crossings do not come out as
  // point features of their own.
  const nodes: OsmNode[] = [...usedNodes].map((id) => {
    const n = position.get(id)!;
    return { type: 'node', id, lat: n.lat, lon: n.lon };
  });
  const collection = osmtogeojson({ elements: [...nodes, ...ways] }, { polygonFeatures: () => false });

  const dropped: ImportReport['dropped'] = [...preDropped.entries()].map(([key, features]) => {
    const [reason, roadClass] = key.split('\u0000') as ['noGeometry', string];
    return { reason, roadClass, features };
  });
  if (otherWays > 0) dropped.push({ reason: 'noRoadClass', roadClass: '(none)', features: otherWays });
  return { collection, context: { waysCutAtMissingNodes: cut, preDropped: dropped } };
}

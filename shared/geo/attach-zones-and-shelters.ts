// Zones feed the network at the nodes inside them (or the nearest one); shelters and exits
// take vehicles at their nearest node. Either fails loudly when nothing is close enough.
import { bbox as turfBbox, booleanPointInPolygon, pointToPolygonDistance } from '@turf/turf';
import type { MultiPolygon, Polygon } from 'geojson';
import type { BadFeature } from '../api/road-import';
import type { ShelterAttachment, ZoneAttachment } from '../api/zone-shelter-attributes';
import { nearestNode, type NodeIndex } from './node-index';
import type { ShelterFeature } from './read-shelters';
import type { ZoneFeature } from './read-zones';
import { RoadImportError } from './road-import-error';

export interface AttachOptions {
  /** A zone with no node inside attaches to the nearest node at most this far, metres. */
  zoneMaxDistanceMeters?: number;
  /** A shelter or exit attaches to the nearest node at most this far, metres. */
  shelterMaxDistanceMeters?: number;
}

export const DEFAULT_ZONE_MAX_DISTANCE_METERS = 1000;
export const DEFAULT_SHELTER_MAX_DISTANCE_METERS = 500;

function nodesInside(index: NodeIndex, geometry: Polygon | MultiPolygon): number[] {
  const [minLon, minLat, maxLon, maxLat] = turfBbox(geometry);
  const g = index.grid;
  const ids = g.query(index.plane.x(minLon!), index.plane.y(minLat!), index.plane.x(maxLon!), index.plane.y(maxLat!));
  return ids
    .filter((v) => {
      const n = index.nodes[v]!;
      return index.localAccess[v] === 1 && n.lon >= minLon! && n.lon <= maxLon! && n.lat >= minLat! && n.lat <= maxLat! && booleanPointInPolygon([n.lon, n.lat], geometry);
    })
    .sort((a, b) => a - b);
}

/**
 * Entry nodes per zone: every node inside the polygon that a local road touches (motorway
 * nodes are left out: residents reach a motorway by its ramps). A zone with none attaches to
 * the single nearest such node within zoneMaxDistanceMeters of its boundary.
 * @throws RoadImportError `attachmentFailed` listing every zone that cannot attach.
 */
export function attachZones(index: NodeIndex, zones: readonly ZoneFeature[], options: AttachOptions = {}): ZoneAttachment[] {
  const maxMeters = options.zoneMaxDistanceMeters ?? DEFAULT_ZONE_MAX_DISTANCE_METERS;
  const bad: BadFeature[] = [];
  const out: ZoneAttachment[] = [];
  zones.forEach((zone, zoneIndex) => {
    const inside = nodesInside(index, zone.geometry);
    if (inside.length > 0) {
      out.push({ zoneIndex, entryNodes: inside, attachedBy: 'inside', distanceMeters: 0 });
      return;
    }
    // Nearest to the boundary: search from each vertex's neighbourhood, then measure to the
    // polygon itself.
    let best: { node: number; distanceMeters: number } | null = null;
    const rings = zone.geometry.type === 'Polygon' ? [zone.geometry.coordinates] : zone.geometry.coordinates;
    for (const poly of rings) for (const ring of poly) for (const p of ring) {
      const hit = nearestNode(index, [p[0]!, p[1]!], maxMeters, (v) => index.localAccess[v] === 1);
      if (!hit) continue;
      const n = index.nodes[hit.node]!;
      const d = Math.abs(pointToPolygonDistance([n.lon, n.lat], zone.geometry, { units: 'meters' }));
      if (!best || d < best.distanceMeters) best = { node: hit.node, distanceMeters: d };
    }
    if (!best) bad.push({ index: zone.index, id: zone.id, problem: `zone "${zone.attributes.name}" has no road node inside it or within ${maxMeters} m` });
    else out.push({ zoneIndex, entryNodes: [best.node], attachedBy: 'nearest', distanceMeters: best.distanceMeters });
  });
  if (bad.length > 0) throw new RoadImportError('attachmentFailed', `${bad.length} zone${bad.length === 1 ? '' : 's'} cannot be attached to the road network`, bad);
  return out;
}

/**
 * The node each shelter or exit takes vehicles at: the nearest one within
 * shelterMaxDistanceMeters. Shelters with a capacity use local-road nodes; unbounded exits
 * may sit on a motorway (that is where a study area is usually left).
 * @throws RoadImportError `attachmentFailed` listing every shelter with no node close enough.
 */
export function attachShelters(index: NodeIndex, shelters: readonly ShelterFeature[], options: AttachOptions = {}): ShelterAttachment[] {
  const maxMeters = options.shelterMaxDistanceMeters ?? DEFAULT_SHELTER_MAX_DISTANCE_METERS;
  const bad: BadFeature[] = [];
  const out: ShelterAttachment[] = [];
  shelters.forEach((shelter, shelterIndex) => {
    const exit = shelter.attributes.capacityPersons === null;
    const hit = nearestNode(index, shelter.coordinates, maxMeters, (v) => exit || index.localAccess[v] === 1);
    if (!hit) bad.push({ index: shelter.index, id: shelter.id, problem: `"${shelter.attributes.name}" has no road node within ${maxMeters} m` });
    else out.push({ shelterIndex, node: hit.node, distanceMeters: hit.distanceMeters });
  });
  if (bad.length > 0) throw new RoadImportError('attachmentFailed', `${bad.length} shelter${bad.length === 1 ? '' : 's'} or exit${bad.length === 1 ? '' : 's'} too far from any road`, bad);
  return out;
}

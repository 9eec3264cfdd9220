// Nearest-node search over the network's nodes on a grid, for attaching zones and shelters.
import { distance } from '@turf/turf';
import type { LonLat, NetworkNode, NetworkSegment, RoadClass } from '../api/road-attributes';
import { SpatialGrid } from './spatial-grid';
import { LocalPlane } from './vertex-store';

/** Classes people cannot drive onto from a house or a shelter's car park. */
const NO_LOCAL_ACCESS = new Set<RoadClass>(['motorway', 'motorway_link']);

export interface NodeIndex {
  plane: LocalPlane;
  grid: SpatialGrid;
  x: Float64Array;
  y: Float64Array;
  nodes: readonly NetworkNode[];
  /** 1 where some segment of a class with local access touches the node. */
  localAccess: Uint8Array;
  /** Component of each node (that of its segments). */
  component: Int32Array;
}

export function indexNodes(network: { nodes: readonly NetworkNode[]; segments: readonly Pick<NetworkSegment, 'fromNode' | 'toNode' | 'attributes' | 'component'>[] }, cellMeters = 250): NodeIndex {
  const { nodes, segments } = network;
  const plane = LocalPlane.around([nodes.map((n) => [n.lon, n.lat] as LonLat)]);
  const grid = new SpatialGrid(cellMeters);
  const x = new Float64Array(nodes.length);
  const y = new Float64Array(nodes.length);
  nodes.forEach((n, i) => {
    x[i] = plane.x(n.lon);
    y[i] = plane.y(n.lat);
    grid.insert(i, x[i]!, y[i]!, x[i]!, y[i]!);
  });
  const localAccess = new Uint8Array(nodes.length);
  const component = new Int32Array(nodes.length);
  for (const s of segments) {
    component[s.fromNode] = s.component;
    component[s.toNode] = s.component;
    if (!NO_LOCAL_ACCESS.has(s.attributes.roadClass)) {
      localAccess[s.fromNode] = 1;
      localAccess[s.toNode] = 1;
    }
  }
  return { plane, grid, x, y, nodes, localAccess, component };
}

/** Node ids whose grid cells meet the box around (lon, lat) ± radius (a superset). */
export function nodesNear(index: NodeIndex, lon: number, lat: number, radiusMeters: number): number[] {
  const px = index.plane.x(lon);
  const py = index.plane.y(lat);
  return index.grid.query(px - radiusMeters, py - radiusMeters, px + radiusMeters, py + radiusMeters);
}

/**
 * The nearest node passing `accept` within maxMeters (geodesic, turf), or null. Grows the
 * search square until a hit is no farther than its half-width, so the answer is exact.
 */
export function nearestNode(
  index: NodeIndex,
  at: LonLat,
  maxMeters: number,
  accept: (node: number) => boolean = () => true,
): { node: number; distanceMeters: number } | null {
  let radius = Math.min(maxMeters, index.grid.cellMeters);
  for (;;) {
    let best: { node: number; distanceMeters: number } | null = null;
    for (const v of nodesNear(index, at[0], at[1], radius)) {
      if (!accept(v)) continue;
      const n = index.nodes[v]!;
      const d = distance(at, [n.lon, n.lat], { units: 'meters' });
      if (d <= maxMeters && (!best || d < best.distanceMeters || (d === best.distanceMeters && v < best.node))) best = { node: v, distanceMeters: d };
    }
    // The plane is within a few per cent of turf near the data; 0.95 keeps the stop safe.
    if ((best && best.distanceMeters <= radius * 0.95) || radius >= maxMeters) return best;
    radius = Math.min(maxMeters, radius * 2);
  }
}

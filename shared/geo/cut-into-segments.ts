// Lines → nodes and segments: a node wherever a line ends or lines share a vertex; each
// segment runs between two consecutive nodes of one line.
import { distance } from '@turf/turf';
import type { LonLat, NetworkNode } from '../api/road-attributes';
import type { TopoLine } from './topology-lines';
import type { VertexStore } from './vertex-store';

export interface CutSegment {
  line: number;
  fromNode: number;
  toNode: number;
  coordinates: LonLat[];
  lengthMeters: number;
}

export interface CutResult {
  nodes: NetworkNode[];
  /** Node id → the vertex group it stands for. */
  nodeVertex: number[];
  segments: CutSegment[];
  /** Lines that shrank to a point (all their vertices joined into one). */
  collapsedLines: number[];
}

/** Geodesic length along the positions: turf's haversine distance, metres. */
export function pathLengthMeters(coordinates: readonly LonLat[]): number {
  let sum = 0;
  for (let i = 1; i < coordinates.length; i += 1) {
    sum += distance(coordinates[i - 1]!, coordinates[i]!, { units: 'meters' });
  }
  return sum;
}

/**
 * Cuts every line at its nodes. A segment that would start and end at the same node (a
 * loop that touches nothing else) is cut once more at its middle vertex, so each loop still
 * carries traffic both ways round rather than vanishing as a self-arc.
 */
export function cutIntoSegments(lines: readonly TopoLine[], store: VertexStore): CutResult {
  const paths: number[][] = lines.map((line) => {
    const out: number[] = [];
    for (const v of line.verts) {
      const r = store.find(v);
      if (out[out.length - 1] !== r) out.push(r);
    }
    return out;
  });
  const used = new Map<number, number>();
  for (const p of paths) for (const v of p) used.set(v, (used.get(v) ?? 0) + 1);
  const isNode = (p: number[], i: number) => i === 0 || i === p.length - 1 || (used.get(p[i]!) ?? 0) > 1;

  const nodeOf = new Map<number, number>();
  const nodes: NetworkNode[] = [];
  const nodeVertex: number[] = [];
  const node = (v: number) => {
    let id = nodeOf.get(v);
    if (id === undefined) {
      id = nodes.length;
      nodeOf.set(v, id);
      nodes.push({ lon: store.lon[v]!, lat: store.lat[v]! });
      nodeVertex.push(v);
    }
    return id;
  };

  const segments: CutSegment[] = [];
  const collapsedLines: number[] = [];
  const emit = (line: number, verts: number[]) => {
    const coordinates = verts.map((v) => store.position(v));
    segments.push({
      line,
      fromNode: node(verts[0]!),
      toNode: node(verts[verts.length - 1]!),
      coordinates,
      lengthMeters: pathLengthMeters(coordinates),
    });
  };
  for (const [li, p] of paths.entries()) {
    if (p.length < 2) {
      collapsedLines.push(li);
      continue;
    }
    let start = 0;
    for (let i = 1; i < p.length; i += 1) {
      if (!isNode(p, i)) continue;
      const piece = p.slice(start, i + 1);
      if (piece[0] === piece[piece.length - 1]) {
        const mid = piece.length >> 1; // ≥ 1 and < length − 1, since a loop has ≥ 3 vertices
        emit(li, piece.slice(0, mid + 1));
        emit(li, piece.slice(mid));
      } else {
        emit(li, piece);
      }
      start = i;
    }
  }
  return { nodes, nodeVertex, segments, collapsedLines };
}

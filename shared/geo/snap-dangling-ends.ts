// A road that stops just short of another (or just past it) is a digitising slip far more
// often than a real dead end. Ends used by one line only ("dangling") are joined to nearby
// ends, vertices or edges of other lines within the tolerance, in two passes around the
// crossing split (see buildRoadGraph):
//   1. before splitting: line ends within the tolerance of one another become one node (at
//      their centroid), and a lone dangling end joins the nearest vertex of another line;
//   2. after splitting: a dangling end joins the nearest vertex or edge point (an undershoot
//      becomes a T-junction, an overshoot's stub collapses onto the crossing).
// Joining ends first keeps a junction drawn as four slightly misplaced ends from being cut
// into slivers by the crossing search.
import { SpatialGrid } from './spatial-grid';
import { addInsertion, applyInsertions, indexEdges, normaliseLines, type Insertion, type TopoLine } from './topology-lines';
import type { VertexStore } from './vertex-store';

export interface SnappedEnd {
  /** The vertex the end now belongs to (its group's representative). */
  vertex: number;
  movedMeters: number;
}

function occurrences(lines: readonly TopoLine[], store: VertexStore): Map<number, number> {
  const count = new Map<number, number>();
  for (const line of lines) for (const v of line.verts) {
    const r = store.find(v);
    count.set(r, (count.get(r) ?? 0) + 1);
  }
  return count;
}

/**
 * Pass 1: line ends of different lines within `toleranceMeters` of one another (taken
 * transitively) become one vertex at their centroid; then each remaining dangling end joins
 * the nearest vertex of another line (snapDanglingEnds without edges). With `allEnds` (GIS
 * data, whose topology is not to be trusted) every line end takes part, as a GIS cluster
 * tolerance would have it; otherwise (OpenStreetMap, whose shared nodes are deliberate) only
 * dangling ends do. The two ends of one line are never joined to each other, so a short
 * road between two junctions keeps them apart.
 */
export function joinDanglingEnds(lines: TopoLine[], store: VertexStore, toleranceMeters: number, cellMeters: number, allEnds: boolean): SnappedEnd[] {
  if (!(toleranceMeters > 0)) return [];
  const used = occurrences(lines, store);
  const ends: number[] = [];
  const seen = new Set<number>();
  const ownEnds = new Set<string>();
  for (const line of lines) {
    if (line.verts.length < 2) continue;
    const a = store.find(line.verts[0]!);
    const b = store.find(line.verts[line.verts.length - 1]!);
    ownEnds.add(a < b ? `${a}:${b}` : `${b}:${a}`);
    for (const v of [a, b]) {
      if (seen.has(v) || (!allEnds && (used.get(v) ?? 0) !== 1)) continue;
      seen.add(v);
      ends.push(v);
    }
  }
  const { x, y } = store;
  const grid = new SpatialGrid(Math.max(4 * toleranceMeters, 1));
  for (const [i, v] of ends.entries()) grid.insert(i, x[v]!, y[v]!, x[v]!, y[v]!);
  const parent = ends.map((_, i) => i);
  const root = (i: number): number => {
    while (parent[i] !== i) i = parent[i] = parent[parent[i]!]!;
    return i;
  };
  for (const [i, u] of ends.entries()) {
    const px = x[u]!;
    const py = y[u]!;
    for (const j of grid.query(px - toleranceMeters, py - toleranceMeters, px + toleranceMeters, py + toleranceMeters)) {
      if (j <= i) continue;
      const v = ends[j]!;
      if (Math.hypot(x[v]! - px, y[v]! - py) > toleranceMeters) continue;
      if (ownEnds.has(u < v ? `${u}:${v}` : `${v}:${u}`)) continue;
      parent[root(j)] = root(i);
    }
  }
  const clusters = new Map<number, number[]>();
  for (const i of ends.keys()) {
    const r = root(i);
    const list = clusters.get(r);
    if (list) list.push(ends[i]!);
    else clusters.set(r, [ends[i]!]);
  }
  const snapped: SnappedEnd[] = [];
  for (const vertices of clusters.values()) {
    if (vertices.length < 2) continue;
    const cx = vertices.reduce((sum, v) => sum + x[v]!, 0) / vertices.length;
    const cy = vertices.reduce((sum, v) => sum + y[v]!, 0) / vertices.length;
    const [lon, lat] = store.plane.lonLat(cx, cy);
    const target = store.intern(lon, lat);
    for (const v of vertices) {
      store.join(v, target);
      snapped.push({ vertex: target, movedMeters: Math.hypot(x[v]! - cx, y[v]! - cy) });
    }
  }
  normaliseLines(lines, store);
  return [...snapped, ...snapDanglingEnds(lines, store, toleranceMeters, cellMeters, false)];
}

/**
 * Joins each dangling end to the nearest candidate within `toleranceMeters`. Candidates on
 * the same layer are any vertex (or, with `toEdges`, edge point) of another line; across
 * layers only the other line's own ends qualify, so a bridge end meets its approach road but
 * a dead end under a bridge does not climb onto it. Ends are taken in line order, so the
 * result does not depend on hashing.
 */
export function snapDanglingEnds(lines: TopoLine[], store: VertexStore, toleranceMeters: number, cellMeters: number, toEdges = true): SnappedEnd[] {
  if (!(toleranceMeters > 0)) return [];
  const { grid, lineOf, edgeOf } = indexEdges(lines, store, Math.max(cellMeters, toleranceMeters), 0);
  const used = occurrences(lines, store);
  const { x, y } = store;
  const insertions = new Map<number, Insertion[]>();
  const snapped: SnappedEnd[] = [];

  for (const [li, line] of lines.entries()) {
    const ends = line.verts.length > 1 ? [line.verts[0]!, line.verts[line.verts.length - 1]!] : [];
    for (const end of ends) {
      const root = store.find(end);
      if ((used.get(root) ?? 0) !== 1) continue;
      const px = x[root]!;
      const py = y[root]!;
      let best = toleranceMeters;
      let bestVertex = -1;
      let bestEdge: { line: number; edge: number; t: number; x: number; y: number } | null = null;
      for (const id of grid.query(px - toleranceMeters, py - toleranceMeters, px + toleranceMeters, py + toleranceMeters)) {
        const lo = lineOf[id]!;
        if (lo === li) continue;
        const other = lines[lo]!;
        const e = edgeOf[id]!;
        const a = other.verts[e]!;
        const b = other.verts[e + 1]!;
        const sameLayer = other.layer === line.layer;
        const lastEdge = other.verts.length - 2;
        for (const [v, isLineEnd] of [[a, e === 0], [b, e === lastEdge]] as const) {
          if (!sameLayer && !isLineEnd) continue;
          const r = store.find(v);
          const d = Math.hypot(x[r]! - px, y[r]! - py);
          if (d <= best && r !== root) {
            best = d;
            bestVertex = r;
            bestEdge = null;
          }
        }
        if (!sameLayer || !toEdges) continue;
        const ex = x[b]! - x[a]!;
        const ey = y[b]! - y[a]!;
        const len2 = ex * ex + ey * ey;
        if (len2 === 0) continue;
        const t = ((px - x[a]!) * ex + (py - y[a]!) * ey) / len2;
        if (t <= 0 || t >= 1) continue;
        const fx = x[a]! + t * ex;
        const fy = y[a]! + t * ey;
        const d = Math.hypot(fx - px, fy - py);
        if (d < best) {
          best = d;
          bestVertex = -1;
          bestEdge = { line: lo, edge: e, t, x: fx, y: fy };
        }
      }
      let target = bestVertex;
      if (bestEdge) {
        const [lon, lat] = store.plane.lonLat(bestEdge.x, bestEdge.y);
        target = store.find(store.intern(lon, lat));
        addInsertion(insertions, bestEdge.line, { edge: bestEdge.edge, t: bestEdge.t, vertex: target });
      }
      if (target < 0 || target === root) continue;
      store.join(root, target);
      const joined = store.find(target);
      used.set(joined, (used.get(joined) ?? 0) + (used.get(root) ?? 1) + (bestEdge ? 1 : 0));
      used.delete(root);
      snapped.push({ vertex: joined, movedMeters: best });
    }
  }
  applyInsertions(lines, insertions);
  normaliseLines(lines, store);
  return snapped;
}

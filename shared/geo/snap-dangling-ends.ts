// A road that stops just short of another (or just past it) is a digitising slip far more
// often than a real dead end. Ends used by one line only are joined to the nearest vertex
// or edge of another line within the tolerance.
import { addInsertion, applyInsertions, indexEdges, type Insertion, type TopoLine } from './topology-lines';
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
 * Joins dangling ends within `toleranceMeters`. Candidates on the same layer are any vertex
 * or edge point of another line; across layers only the other line's own ends qualify, so a
 * bridge end meets its approach road but a dead end under a bridge does not climb onto it.
 * Ends are taken in line order, so the result does not depend on hashing.
 */
export function snapDanglingEnds(lines: TopoLine[], store: VertexStore, toleranceMeters: number, cellMeters: number): SnappedEnd[] {
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
        if (!sameLayer) continue;
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
  return snapped;
}

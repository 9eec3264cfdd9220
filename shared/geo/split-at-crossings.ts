// GIS road layers often draw junctions as lines that merely cross. Where two roads cross on
// the same layer they are split there and share a node; where they cross on different
// layers (a bridge over a road, a tunnel under it) they stay apart.
import { addInsertion, applyInsertions, indexEdges, type Insertion, type TopoLine } from './topology-lines';
import type { VertexStore } from './vertex-store';

/** Two positions closer than this are treated as the same point, metres. */
const SAME_POINT_METERS = 0.01;

export interface CrossingCounts {
  joined: number;
  onDifferentLayers: number;
}

/**
 * Finds every crossing (and touching: an end lying on another road) between edges of
 * different lines and splices the crossing vertex into both. Crossings of a line with itself
 * are left alone (a road looping over itself is a bridge far more often than a junction).
 * Collinear overlaps are not joined.
 *
 * Cost: O(E + P) for E edges and P edge pairs sharing a grid cell, instead of O(E²).
 */
export function splitAtCrossings(lines: TopoLine[], store: VertexStore, cellMeters: number): CrossingCounts {
  const { grid, lineOf, edgeOf } = indexEdges(lines, store, cellMeters, SAME_POINT_METERS * 2);
  const { x, y } = store;
  const insertions = new Map<number, Insertion[]>();
  const joinedAt = new Set<number>();
  const apartAt = new Set<string>();

  grid.forEachCell((cx, cy, items) => {
    for (let i = 0; i < items.length; i += 1) {
      const ea = items[i]!;
      const la = lineOf[ea]!;
      const lineA = lines[la]!;
      const a0 = lineA.verts[edgeOf[ea]!]!;
      const a1 = lineA.verts[edgeOf[ea]! + 1]!;
      const ax = x[a0]!;
      const ay = y[a0]!;
      const rx = x[a1]! - ax;
      const ry = y[a1]! - ay;
      for (let j = i + 1; j < items.length; j += 1) {
        const eb = items[j]!;
        const lb = lineOf[eb]!;
        if (lb === la) continue;
        const lineB = lines[lb]!;
        const b0 = lineB.verts[edgeOf[eb]!]!;
        const b1 = lineB.verts[edgeOf[eb]! + 1]!;
        if (b0 === a0 || b0 === a1 || b1 === a0 || b1 === a1) continue;
        const bx = x[b0]!;
        const by = y[b0]!;
        const sx = x[b1]! - bx;
        const sy = y[b1]! - by;
        const den = rx * sy - ry * sx;
        const lenA = Math.hypot(rx, ry);
        const lenB = Math.hypot(sx, sy);
        if (Math.abs(den) <= 1e-9 * lenA * lenB) continue; // parallel or collinear
        const qx = bx - ax;
        const qy = by - ay;
        const t = (qx * sy - qy * sx) / den;
        const u = (qx * ry - qy * rx) / den;
        const epsA = SAME_POINT_METERS / lenA;
        const epsB = SAME_POINT_METERS / lenB;
        if (t < -epsA || t > 1 + epsA || u < -epsB || u > 1 + epsB) continue;
        const px = ax + t * rx;
        const py = ay + t * ry;
        // Each pair meets in several cells; handle it only in the cell holding the point.
        if (grid.cellOf(px) !== cx || grid.cellOf(py) !== cy) continue;

        if (lineA.layer !== lineB.layer) {
          apartAt.add(`${Math.round(px * 100)}:${Math.round(py * 100)}`);
          continue;
        }
        const atA = t <= epsA ? a0 : t >= 1 - epsA ? a1 : -1;
        const atB = u <= epsB ? b0 : u >= 1 - epsB ? b1 : -1;
        let vertex: number;
        if (atA >= 0 && atB >= 0) {
          store.join(atB, atA);
          vertex = atA;
        } else if (atA >= 0) {
          vertex = atA;
        } else if (atB >= 0) {
          vertex = atB;
        } else {
          const tt = Math.min(1, Math.max(0, t));
          vertex = store.intern(store.lon[a0]! + tt * (store.lon[a1]! - store.lon[a0]!), store.lat[a0]! + tt * (store.lat[a1]! - store.lat[a0]!));
        }
        if (atA < 0) addInsertion(insertions, la, { edge: edgeOf[ea]!, t, vertex });
        if (atB < 0) addInsertion(insertions, lb, { edge: edgeOf[eb]!, t: u, vertex });
        joinedAt.add(store.find(vertex));
      }
    }
  });
  applyInsertions(lines, insertions);
  return { joined: joinedAt.size, onDifferentLayers: apartAt.size };
}

// Road lines as vertex ids, the edge index over them, and splicing new vertices into edges.
import { SpatialGrid } from './spatial-grid';
import type { VertexStore } from './vertex-store';

export interface TopoLine {
  verts: number[];
  layer: number;
}

/** A vertex to splice into edge `edge` (between verts[edge] and verts[edge + 1]) at fraction t. */
export interface Insertion {
  edge: number;
  t: number;
  vertex: number;
}

export interface EdgeIndex {
  grid: SpatialGrid;
  /** Per edge id: its line and its position in the line. */
  lineOf: Int32Array;
  edgeOf: Int32Array;
}

export function edgeCount(lines: readonly TopoLine[]): number {
  let n = 0;
  for (const l of lines) n += l.verts.length - 1;
  return n;
}

/** Registers every edge in the cells of its bounding box grown by `padMeters`. */
export function indexEdges(lines: readonly TopoLine[], store: VertexStore, cellMeters: number, padMeters: number): EdgeIndex {
  const n = edgeCount(lines);
  const lineOf = new Int32Array(n);
  const edgeOf = new Int32Array(n);
  const grid = new SpatialGrid(cellMeters);
  const { x, y } = store;
  let id = 0;
  for (const [li, line] of lines.entries()) {
    const v = line.verts;
    for (let e = 0; e + 1 < v.length; e += 1) {
      const a = v[e]!;
      const b = v[e + 1]!;
      lineOf[id] = li;
      edgeOf[id] = e;
      grid.insert(
        id,
        Math.min(x[a]!, x[b]!) - padMeters,
        Math.min(y[a]!, y[b]!) - padMeters,
        Math.max(x[a]!, x[b]!) + padMeters,
        Math.max(y[a]!, y[b]!) + padMeters,
      );
      id += 1;
    }
  }
  return { grid, lineOf, edgeOf };
}

/** Splices the insertions into each line, in order along it; duplicates are skipped. */
export function applyInsertions(lines: TopoLine[], insertions: Map<number, Insertion[]>): void {
  for (const [li, list] of insertions) {
    const line = lines[li]!;
    list.sort((p, q) => p.edge - q.edge || p.t - q.t);
    const out: number[] = [];
    let k = 0;
    for (let e = 0; e < line.verts.length; e += 1) {
      const v = line.verts[e]!;
      if (out[out.length - 1] !== v) out.push(v);
      while (k < list.length && list[k]!.edge === e) {
        const w = list[k]!.vertex;
        if (out[out.length - 1] !== w && line.verts[e + 1] !== w) out.push(w);
        k += 1;
      }
    }
    line.verts = out;
  }
}

export function addInsertion(insertions: Map<number, Insertion[]>, line: number, insertion: Insertion): void {
  const list = insertions.get(line);
  if (list) list.push(insertion);
  else insertions.set(line, [insertion]);
}

/** Replaces every vertex by its group's representative and drops repeats, after joins. */
export function normaliseLines(lines: TopoLine[], store: VertexStore): void {
  for (const line of lines) {
    const out: number[] = [];
    for (const v of line.verts) {
      const r = store.find(v);
      if (out[out.length - 1] !== r) out.push(r);
    }
    line.verts = out;
  }
}

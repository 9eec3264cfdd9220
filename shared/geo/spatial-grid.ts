// A uniform grid over the local plane: items are registered in every cell their box covers,
// so a query looks only at nearby items instead of all of them.

const OFFSET = 2 ** 24;
const SPAN = 2 ** 25;

export class SpatialGrid {
  private readonly cells = new Map<number, number[]>();

  /** @param cellMeters edge of a square cell */
  constructor(readonly cellMeters: number) {
    if (!(cellMeters > 0)) throw new Error('cellMeters must be positive');
  }

  cellOf(v: number): number {
    return Math.floor(v / this.cellMeters);
  }

  // Cell coordinates stay within ±2^24 (a continent at 1 m cells), so one exact double
  // (< 2^50) holds both.
  private key(cx: number, cy: number): number {
    return (cx + OFFSET) * SPAN + (cy + OFFSET);
  }

  insert(item: number, minX: number, minY: number, maxX: number, maxY: number): void {
    const x1 = this.cellOf(maxX);
    const y1 = this.cellOf(maxY);
    for (let cx = this.cellOf(minX); cx <= x1; cx += 1) {
      for (let cy = this.cellOf(minY); cy <= y1; cy += 1) {
        const k = this.key(cx, cy);
        const list = this.cells.get(k);
        if (list) list.push(item);
        else this.cells.set(k, [item]);
      }
    }
  }

  /** Items in the cell holding (x, y). */
  at(cx: number, cy: number): readonly number[] {
    return this.cells.get(this.key(cx, cy)) ?? [];
  }

  /** Distinct items whose cells meet the box. */
  query(minX: number, minY: number, maxX: number, maxY: number): number[] {
    const seen = new Set<number>();
    const x1 = this.cellOf(maxX);
    const y1 = this.cellOf(maxY);
    for (let cx = this.cellOf(minX); cx <= x1; cx += 1) {
      for (let cy = this.cellOf(minY); cy <= y1; cy += 1) {
        for (const item of this.at(cx, cy)) seen.add(item);
      }
    }
    return [...seen];
  }

  /** Calls visit(cellX, cellY, items) for every non-empty cell. */
  forEachCell(visit: (cx: number, cy: number, items: readonly number[]) => void): void {
    for (const [k, items] of this.cells) {
      const cx = Math.floor(k / SPAN) - OFFSET;
      const cy = (k % SPAN) - OFFSET;
      visit(cx, cy, items);
    }
  }
}

/**
 * A cell size for n edges: about their median length, but no larger than twice the mean
 * spacing of n items over the area (so long edges do not crowd one cell), and at least
 * `minMeters`.
 */
export function chooseCellMeters(edgeLengths: readonly number[], areaSquareMeters: number, minMeters: number): number {
  if (edgeLengths.length === 0) return Math.max(minMeters, 100);
  const sorted = Float64Array.from(edgeLengths).sort();
  const median = sorted[sorted.length >> 1]!;
  const spacing = 2 * Math.sqrt(Math.max(areaSquareMeters, 1) / edgeLengths.length);
  return Math.max(minMeters, Math.min(median, spacing), 1);
}

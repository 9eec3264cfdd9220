// Where the briefing map writes each shelter's name: shelters of a county often sit a few
// hundred metres apart, and names written at one fixed offset ran into each other. Each label
// tries a few spots around its marker, in order, and takes the first that stays inside the
// frame and clear of the labels already placed (zone names first, as they are drawn on top).
// A label with no clear spot takes the one that overlaps least, so no name is dropped.

import { estimatedTextWidth } from './svg-text';

export type Box = { x: number; y: number; width: number; height: number };
export type PlacedLabel = { x: number; y: number; anchor: 'start' | 'end'; box: Box };
export type Frame = { width: number; height: number };

/** Offsets from the marker's centre: above right, above left, below right, below left, right, left. */
const SPOTS: readonly { dx: number; dy: number; anchor: 'start' | 'end' }[] = [
  { dx: 3, dy: -8, anchor: 'start' },
  { dx: -3, dy: -8, anchor: 'end' },
  { dx: 3, dy: 13, anchor: 'start' },
  { dx: -3, dy: 13, anchor: 'end' },
  { dx: 7, dy: 2.5, anchor: 'start' },
  { dx: -7, dy: 2.5, anchor: 'end' },
];

/** The box a label covers, drawn with svgText's halo at baseline (x, y). */
export function labelBox(x: number, y: number, text: string, size: number, anchor: 'start' | 'middle' | 'end'): Box {
  const width = estimatedTextWidth(text, size, true) + 4;
  const left = anchor === 'start' ? x - 2 : anchor === 'middle' ? x - width / 2 : x - width + 2;
  return { x: left, y: y - size * 0.86, width, height: size * 1.18 };
}

export function overlapArea(a: Box, b: Box): number {
  const w = Math.min(a.x + a.width, b.x + b.width) - Math.max(a.x, b.x);
  const h = Math.min(a.y + a.height, b.y + b.height) - Math.max(a.y, b.y);
  return w > 0 && h > 0 ? w * h : 0;
}

function outside(box: Box, frame: Frame): number {
  const w = Math.min(box.x + box.width, frame.width) - Math.max(box.x, 0);
  const h = Math.min(box.y + box.height, frame.height) - Math.max(box.y, 0);
  return box.width * box.height - (w > 0 && h > 0 ? w * h : 0);
}

/**
 * Places the labels in the order given (callers pass the most important first). `taken` holds
 * boxes already on the map; the placed labels' boxes are added to it.
 */
export function placeLabels(
  markers: readonly { x: number; y: number; text: string }[],
  size: number,
  frame: Frame,
  taken: Box[] = [],
): PlacedLabel[] {
  return markers.map((m) => {
    let best: PlacedLabel | null = null;
    let bestCost = Infinity;
    for (const spot of SPOTS) {
      const x = m.x + spot.dx;
      const y = m.y + spot.dy;
      const box = labelBox(x, y, m.text, size, spot.anchor);
      // Running off the frame counts more than covering another name: a cut name cannot be read.
      const cost = taken.reduce((sum, t) => sum + overlapArea(box, t), 0) + 4 * outside(box, frame);
      if (cost < bestCost) {
        best = { x, y, anchor: spot.anchor, box };
        bestCost = cost;
        if (cost === 0) break;
      }
    }
    taken.push(best!.box);
    return best!;
  });
}

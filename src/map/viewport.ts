// Viewport arithmetic for loading segments: a padded, clamped, rounded bbox (so that small pans
// reuse what is loaded), and the test whether a new view is covered by the last load.
export type Bbox = [number, number, number, number];

export type BoundsLike = { west: number; south: number; east: number; north: number };

const clamp = (v: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, v));
// 1e-5° is about a metre: fine enough, and keeps the query string short and cacheable.
const floor5 = (v: number) => Math.floor(v * 1e5) / 1e5;
const ceil5 = (v: number) => Math.ceil(v * 1e5) / 1e5;

/** The view grown by `padShare` of its size on every side, rounded outward, within WGS84. */
export function paddedBbox(view: BoundsLike, padShare = 0.25): Bbox {
  const dx = (view.east - view.west) * padShare;
  const dy = (view.north - view.south) * padShare;
  return [
    clamp(floor5(view.west - dx), -180, 180),
    clamp(floor5(view.south - dy), -90, 90),
    clamp(ceil5(view.east + dx), -180, 180),
    clamp(ceil5(view.north + dy), -90, 90),
  ];
}

export function bboxContains(outer: Bbox, view: BoundsLike): boolean {
  return outer[0] <= view.west && outer[1] <= view.south && outer[2] >= view.east && outer[3] >= view.north;
}

export function bboxOfCoordinates(coordinates: readonly (readonly [number, number])[]): Bbox | null {
  if (coordinates.length === 0) return null;
  let w = Infinity, s = Infinity, e = -Infinity, n = -Infinity;
  for (const [x, y] of coordinates) {
    w = Math.min(w, x);
    s = Math.min(s, y);
    e = Math.max(e, x);
    n = Math.max(n, y);
  }
  return [w, s, e, n];
}

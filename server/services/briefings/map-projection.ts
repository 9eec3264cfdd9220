// Longitude/latitude to a flat page, for a town-sized map.
//
// Equirectangular projection about the centre latitude φ0: x = R·Δλ·cos φ0, y = R·Δφ (radians).
// Over a few kilometres its scale error is far below what a printed map can show (the east–west
// scale drifts by about tan φ0 · Δφ, e.g. 0.05 % per kilometre north or south at 45°), so the
// scale bar drawn from it can be trusted at briefing accuracy. Not for regional maps.
import type { LonLat } from './briefing-input';

/** Mean Earth radius (IUGG), metres (from memory). */
export const EARTH_MEAN_RADIUS_M = 6_371_008.8;

const RAD = Math.PI / 180;

export type Bounds = { minX: number; minY: number; maxX: number; maxY: number };

export type Projection = {
  /** Metres east and north of the centre; y grows northwards. */
  toMetres: (p: LonLat) => [number, number];
};

export function equirectangularAbout(centre: LonLat): Projection {
  const [lon0, lat0] = centre;
  const kx = EARTH_MEAN_RADIUS_M * RAD * Math.cos(lat0 * RAD);
  const ky = EARTH_MEAN_RADIUS_M * RAD;
  return { toMetres: ([lon, lat]) => [(lon - lon0) * kx, (lat - lat0) * ky] };
}

export function boundsOf(points: Iterable<readonly [number, number]>): Bounds | null {
  let b: Bounds | null = null;
  for (const [x, y] of points) {
    if (!Number.isFinite(x) || !Number.isFinite(y)) continue;
    if (!b) b = { minX: x, minY: y, maxX: x, maxY: y };
    else {
      b.minX = Math.min(b.minX, x);
      b.minY = Math.min(b.minY, y);
      b.maxX = Math.max(b.maxX, x);
      b.maxY = Math.max(b.maxY, y);
    }
  }
  return b;
}

export type PageFit = {
  /** Page units per metre. */
  scale: number;
  /** Metres (east, north) to page (x right, y down). */
  toPage: (m: readonly [number, number]) => [number, number];
};

/**
 * Fits metre bounds into a page box with one scale for both axes (so shapes and the scale bar
 * stay true), centred; a degenerate extent is widened to `minExtentM`.
 */
export function fitToBox(b: Bounds, box: { x: number; y: number; width: number; height: number }, minExtentM = 500): PageFit {
  const cx = (b.minX + b.maxX) / 2;
  const cy = (b.minY + b.maxY) / 2;
  const w = Math.max(b.maxX - b.minX, minExtentM);
  const h = Math.max(b.maxY - b.minY, minExtentM);
  const scale = Math.min(box.width / w, box.height / h);
  const px = box.x + box.width / 2;
  const py = box.y + box.height / 2;
  return { scale, toPage: ([x, y]) => [px + (x - cx) * scale, py - (y - cy) * scale] };
}

/** Initial compass bearing from a to b, degrees clockwise from north (on the flat projection). */
export function bearingDegrees(a: readonly [number, number], b: readonly [number, number]): number {
  const deg = (Math.atan2(b[0] - a[0], b[1] - a[1]) * 180) / Math.PI;
  return (deg + 360) % 360;
}

const compass = ['northbound', 'north-eastbound', 'eastbound', 'south-eastbound', 'southbound', 'south-westbound', 'westbound', 'north-westbound'];

/** Travel direction in words for a bearing: 80° → "eastbound". */
export function travelDirection(bearing: number): string {
  return compass[Math.round(bearing / 45) % 8]!;
}

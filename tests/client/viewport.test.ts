// Viewport arithmetic: the padded, clamped, rounded bbox, and the covered-view test.
import { describe, expect, it } from 'vitest';
import { bboxContains, bboxOfCoordinates, paddedBbox } from '../../src/map/viewport';

describe('viewport', () => {
  it('pads by a share of the view on each side and rounds outward', () => {
    expect(paddedBbox({ west: 10, south: 50, east: 11, north: 51 }, 0.25)).toEqual([9.75, 49.75, 11.25, 51.25]);
    const [w, s, e, n] = paddedBbox({ west: 10.123456789, south: 50.123456789, east: 10.2, north: 50.2 }, 0);
    expect(w).toBeLessThanOrEqual(10.123456789);
    expect(s).toBeLessThanOrEqual(50.123456789);
    expect(e).toBeGreaterThanOrEqual(10.2);
    expect(n).toBeGreaterThanOrEqual(50.2);
    expect(String(w).split('.')[1]!.length).toBeLessThanOrEqual(5);
  });

  it('stays inside WGS84 (the server refuses anything else)', () => {
    expect(paddedBbox({ west: -179, south: -89, east: 179, north: 89 }, 0.5)).toEqual([-180, -90, 180, 90]);
  });

  it('knows when a view is inside what was loaded', () => {
    const loaded = paddedBbox({ west: 10, south: 50, east: 11, north: 51 });
    expect(bboxContains(loaded, { west: 10.1, south: 50.1, east: 11.1, north: 51.1 })).toBe(true);
    expect(bboxContains(loaded, { west: 9.5, south: 50, east: 10.5, north: 51 })).toBe(false);
  });

  it('finds the extent of a line', () => {
    expect(bboxOfCoordinates([[1, 2], [3, -1], [2, 5]])).toEqual([1, -1, 3, 5]);
    expect(bboxOfCoordinates([])).toBeNull();
  });
});

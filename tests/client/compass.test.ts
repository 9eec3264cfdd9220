// Direction of travel in words. The bearing formula is the standard initial great-circle
// bearing; the Land's End → John o' Groats figure (009°07′11″) is the worked example on the
// Movable Type Scripts page "Calculate distance, bearing and more between Latitude/Longitude
// points" (from memory).
import { describe, expect, it } from 'vitest';
import { bearingDegrees, compassPoint, travelDirection } from '../../src/map/compass';

describe('compass', () => {
  it('gives the initial bearing of a great circle', () => {
    expect(bearingDegrees([0, 0], [0, 1])).toBeCloseTo(0, 9);
    expect(bearingDegrees([0, 0], [1, 0])).toBeCloseTo(90, 9);
    expect(bearingDegrees([0, 1], [0, 0])).toBeCloseTo(180, 9);
    expect(bearingDegrees([0, 0], [-1, 0])).toBeCloseTo(270, 9);
    const landsEnd: [number, number] = [-(5 + 42 / 60 + 53 / 3600), 50 + 3 / 60 + 59 / 3600];
    const johnOGroats: [number, number] = [-(3 + 4 / 60 + 12 / 3600), 58 + 38 / 60 + 38 / 3600];
    expect(bearingDegrees(landsEnd, johnOGroats)).toBeCloseTo(9 + 7 / 60 + 11 / 3600, 2);
  });

  it('names the nearest of eight points', () => {
    expect(compassPoint(0)).toBe('north');
    expect(compassPoint(22)).toBe('north');
    expect(compassPoint(23)).toBe('north-east');
    expect(compassPoint(180)).toBe('south');
    expect(compassPoint(337.6)).toBe('north');
    expect(compassPoint(-90)).toBe('west');
  });

  it('reverses for the arc against the stored direction', () => {
    const line: [number, number][] = [[0, 0], [0.5, 0.1], [1, 0]];
    expect(travelDirection(line, 'forward')).toBe('east');
    expect(travelDirection(line, 'backward')).toBe('west');
    expect(travelDirection([[1, 1], [1, 1]], 'forward')).toBeNull();
  });
});

// turf's geodesic lengths against a hand computation of the haversine formula, with the
// Rosetta Code "Haversine formula" value and the WGS84 meridian degree (docs/model.md §6).
import { distance, length, lineString } from '@turf/turf';
import { describe, expect, it } from 'vitest';
import { pathLengthMeters } from '../../../shared/geo';

/** Haversine: d = 2R·asin(√(sin²(Δφ/2) + cos φ1 cos φ2 sin²(Δλ/2))). */
function haversine(lat1: number, lon1: number, lat2: number, lon2: number, radius: number): number {
  const rad = Math.PI / 180;
  const dPhi = (lat2 - lat1) * rad;
  const dLambda = (lon2 - lon1) * rad;
  const a = Math.sin(dPhi / 2) ** 2 + Math.cos(lat1 * rad) * Math.cos(lat2 * rad) * Math.sin(dLambda / 2) ** 2;
  return 2 * radius * Math.asin(Math.sqrt(a));
}

/** Length of one degree of latitude on the WGS84 ellipsoid: M(φ)·π/180, M = a(1−e²)/(1−e² sin²φ)^1.5. */
function wgs84MeridianDegree(latDeg: number): number {
  const a = 6378137;
  const f = 1 / 298.257223563;
  const e2 = f * (2 - f);
  const s = Math.sin((latDeg * Math.PI) / 180);
  return ((a * (1 - e2)) / (1 - e2 * s * s) ** 1.5) * (Math.PI / 180);
}

// turf 7 uses the mean Earth radius 6,371,008.8 m.
const TURF_RADIUS_KM = 6371.0088;

describe('haversine by hand', () => {
  it('reproduces Rosetta Code: (36.12, −86.67) → (33.94, −118.40) with R = 6,372.8 km is 2,887.2599506 km', () => {
    expect(haversine(36.12, -86.67, 33.94, -118.4, 6372.8)).toBeCloseTo(2887.2599506, 6);
  });
});

describe('turf against the hand computation', () => {
  const pairs: [number, number, number, number][] = [
    [36.12, -86.67, 33.94, -118.4],
    [37.8057878, -122.2919937, 37.8073779, -122.3006059],
    [0, 0, 0, 1],
    [44.2, -38.5, 44.25, -38.42],
    [-33.9, 151.2, 51.5, -0.12],
  ];

  it('distance() equals haversine with turf’s radius to 1e-9 relative', () => {
    for (const [la1, lo1, la2, lo2] of pairs) {
      const turfKm = distance([lo1, la1], [lo2, la2], { units: 'kilometers' });
      expect(turfKm / haversine(la1, lo1, la2, lo2, TURF_RADIUS_KM)).toBeCloseTo(1, 9);
    }
    // …and so the Rosetta pair, rescaled to R = 6,372.8 km, gives the published value.
    const turfKm = distance([-86.67, 36.12], [-118.4, 33.94], { units: 'kilometers' });
    expect((turfKm * 6372.8) / TURF_RADIUS_KM).toBeCloseTo(2887.2599506, 5);
  });

  it('segment lengths are the sum of haversine legs, as turf.length gives for the same line', () => {
    const coords: [number, number][] = [[-122.3, 37.806], [-122.299, 37.8065], [-122.298, 37.807], [-122.2975, 37.8081]];
    let byHand = 0;
    for (let i = 1; i < coords.length; i += 1) byHand += haversine(coords[i - 1]![1], coords[i - 1]![0], coords[i]![1], coords[i]![0], TURF_RADIUS_KM * 1000);
    expect(pathLengthMeters(coords)).toBeCloseTo(byHand, 6);
    expect(length(lineString(coords), { units: 'meters' })).toBeCloseTo(byHand, 6);
  });

  it('one degree of latitude: the WGS84 values 110,574.276 / 111,131.777 / 111,693.980 m, and turf’s sphere within 0.6 %', () => {
    expect(wgs84MeridianDegree(0)).toBeCloseTo(110574.276, 2);
    expect(wgs84MeridianDegree(45)).toBeCloseTo(111131.777, 2);
    expect(wgs84MeridianDegree(90)).toBeCloseTo(111693.98, 2);
    for (const lat of [0, 45, 89]) {
      const sphere = distance([0, lat - 0.5], [0, lat + 0.5], { units: 'meters' });
      expect(sphere).toBeCloseTo(haversine(lat - 0.5, 0, lat + 0.5, 0, TURF_RADIUS_KM * 1000), 6);
      expect(Math.abs(sphere / wgs84MeridianDegree(lat) - 1)).toBeLessThan(0.006);
    }
  });
});

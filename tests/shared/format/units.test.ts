// Unit conversion for people. Factors: 1 ft = 0.3048 m and 1 mi = 1,609.344 m exactly, by the
// international yard and pound agreement of 1959 (NIST Handbook 44, Appendix C lists the same).
import { describe, expect, it } from 'vitest';
import { KM_PER_MILE as hcmKmPerMile, JAM_DENSITY_PC_PER_KM_PER_LANE, JAM_DENSITY_PC_PER_MILE_PER_LANE } from '../../../shared/model/hcm';
import {
  densityFromPerKm,
  densityToPerKm,
  distanceFromMeters,
  formatDensity,
  formatLength,
  formatSpeed,
  KM_PER_MILE,
  METERS_PER_FOOT,
  METERS_PER_MILE,
  speedFromKmh,
  speedToKmh,
  speedUnit,
} from '../../../shared/format/units';

describe('the factors', () => {
  it('are those of the international yard and pound agreement of 1959', () => {
    expect(METERS_PER_FOOT).toBe(0.3048);
    expect(METERS_PER_MILE).toBe(1609.344);
    expect(KM_PER_MILE).toBe(1.609344);
    // The model's HCM conversions use the same mile.
    expect(hcmKmPerMile).toBe(KM_PER_MILE);
  });
});

describe('speeds', () => {
  it('convert mph to km/h and back exactly as entered, for every speed a form takes', () => {
    expect(speedToKmh(35, 'us-customary')).toBeCloseTo(56.32704, 12);
    expect(speedToKmh(60, 'us-customary')).toBeCloseTo(96.56064, 12);
    for (let tenths = 1; tenths <= 1240; tenths++) {
      const mph = tenths / 10;
      expect(speedFromKmh(speedToKmh(mph, 'us-customary'), 'us-customary')).toBe(mph);
    }
  });

  it('are left alone in metric', () => {
    expect(speedToKmh(50, 'metric')).toBe(50);
    expect(speedFromKmh(50, 'metric')).toBe(50);
  });

  it('read in the organisation unit', () => {
    expect(speedUnit('metric')).toBe('km/h');
    expect(speedUnit('us-customary')).toBe('mph');
    expect(formatSpeed(56.32704, 'us-customary')).toBe('35 mph');
    expect(formatSpeed(50, 'metric')).toBe('50 km/h');
    // 100 km/h = 62.137… mph (NIST Handbook 44 factor 1 mph = 1.609344 km/h).
    expect(formatSpeed(100, 'us-customary')).toBe('62.1 mph');
  });
});

describe('lengths', () => {
  it('read in metres and kilometres, or feet and miles', () => {
    expect(formatLength(850, 'metric')).toBe('850 m');
    expect(formatLength(253_400, 'metric')).toBe('253.4 km');
    expect(formatLength(1609.344, 'us-customary')).toBe('1 mi');
    // A tenth of a mile is 528 ft; below it, feet.
    expect(formatLength(160.9344, 'us-customary')).toBe('0.1 mi');
    expect(formatLength(100 * 0.3048, 'us-customary')).toBe('100 ft');
    expect(formatLength(253_400, 'us-customary')).toBe('157.5 mi');
    expect(distanceFromMeters(5000, 'metric')).toBe(5);
    expect(distanceFromMeters(1609.344 * 3, 'us-customary')).toBe(3);
  });
});

describe('densities', () => {
  it('turn the HCM jam density back into 190 per mile (HCM 6th ed. Exhibit 25-2)', () => {
    expect(densityFromPerKm(JAM_DENSITY_PC_PER_KM_PER_LANE, 'us-customary')).toBe(JAM_DENSITY_PC_PER_MILE_PER_LANE);
    expect(formatDensity(JAM_DENSITY_PC_PER_KM_PER_LANE, 'us-customary')).toBe('190 veh/mi per lane');
    expect(formatDensity(JAM_DENSITY_PC_PER_KM_PER_LANE, 'metric')).toBe('118.06 veh/km per lane');
    expect(densityToPerKm(190, 'us-customary')).toBeCloseTo(118.06, 2);
  });
});

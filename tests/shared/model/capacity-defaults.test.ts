// Default capacities against the published table they cite (docs/model.md §2–3: HCM 6th/7th ed.
// transcriptions, FHWA HPMS Field Manual 2002 App. N); the ramp and minor rows are common practice.
import { describe, expect, it } from 'vitest';
import { capacityTableSchema } from '../../../shared/api/capacity-table';
import { drivableRoadClasses } from '../../../shared/api/road-attributes';
import {
  ASSUMED_HEAVY_VEHICLE_FACTOR,
  CAPACITY_FACTOR_PRESETS,
  DEFAULT_CAPACITY_ROWS,
  defaultCapacityTable,
  freewayBaseCapacity,
  heavyVehicleFactor,
  JAM_DENSITY_PC_PER_KM_PER_LANE,
  KM_PER_MILE,
  LANE_CLOSURE_FACTORS,
  multilaneBaseCapacity,
  PLANNING_GREEN_RATIO,
  signalisedLaneCapacity,
} from '../../../shared/model';

const row = (c: string) => DEFAULT_CAPACITY_ROWS.find((r) => r.roadClass === c)!;

describe('HCM formulas', () => {
  it('freeway base capacity matches HCM 7th ed. Exhibit 12-6 and the Ch. 26 worked examples', () => {
    expect([55, 60, 65, 70, 75].map(freewayBaseCapacity)).toEqual([2250, 2300, 2350, 2400, 2400]);
    // HCM 7th ed. Ch. 26, Example Problems 1–3: FFS 60.8 / 67.3 / 70.0 mi/h.
    expect(Math.round(freewayBaseCapacity(60.8))).toBe(2308);
    expect(Math.round(freewayBaseCapacity(67.3))).toBe(2373);
    expect(freewayBaseCapacity(70)).toBe(2400);
  });

  it('multilane base capacity follows HCM 7th ed. Eq. 12-7 with its 2,300 cap', () => {
    expect(multilaneBaseCapacity(45)).toBe(1900);
    expect(multilaneBaseCapacity(60)).toBe(2200);
    expect(multilaneBaseCapacity(70)).toBe(2300);
  });

  it('signalised lane capacity is 1,900 × g/C (HCM Eq. 19-16): 760 / 855 / 950 / 1,045', () => {
    expect([0.4, 0.45, 0.5, 0.55].map((g) => Math.round(signalisedLaneCapacity(g)))).toEqual([760, 855, 950, 1045]);
    expect(PLANNING_GREEN_RATIO).toEqual({ principalArterial: 0.55, minorArterial: 0.45, collector: 0.4 });
  });

  it('heavy-vehicle factor and jam density follow HCM Eq. 12-10 and Exhibit 25-2', () => {
    expect(heavyVehicleFactor(0.1, 2)).toBeCloseTo(1 / 1.1, 12);
    expect(heavyVehicleFactor(0.1, 3)).toBeCloseTo(1 / 1.2, 12);
    expect(JAM_DENSITY_PC_PER_KM_PER_LANE).toBeCloseTo(118.06, 2);
    expect(KM_PER_MILE).toBe(1.609344);
  });
});

describe('default capacity table (docs/model.md §3)', () => {
  it('has one row per drivable class and passes its own schema', () => {
    expect(DEFAULT_CAPACITY_ROWS.map((r) => r.roadClass).sort()).toEqual([...drivableRoadClasses].sort());
    expect(capacityTableSchema.safeParse(defaultCapacityTable()).success).toBe(true);
  });

  it('equals the published table row for row (lanes per direction, km/h, veh/h/lane)', () => {
    const published: [string, number, number, number][] = [
      ['motorway', 2, 110, 2000],
      ['motorway_link', 1, 60, 1500],
      ['trunk', 2, 90, 1800],
      ['trunk_link', 1, 60, 1300],
      ['primary', 2, 60, 1000],
      ['secondary', 1, 50, 850],
      ['tertiary', 1, 50, 750],
      ['unclassified', 1, 40, 600],
      ['residential', 1, 40, 600],
      ['living_street', 1, 15, 300],
      ['service', 1, 15, 300],
    ];
    for (const [c, lanes, kmh, cap] of published) {
      expect([c, row(c).lanesPerDirection, row(c).speedKmh, row(c).capacityVehPerHourPerLane]).toEqual([c, lanes, kmh, cap]);
    }
    // *_link of primary/secondary/tertiary: 1 lane, 40 km/h, within 700–900 veh/h/ln (CP).
    for (const c of ['primary_link', 'secondary_link', 'tertiary_link']) {
      expect(row(c).lanesPerDirection).toBe(1);
      expect(row(c).speedKmh).toBe(40);
      expect(row(c).capacityVehPerHourPerLane).toBeGreaterThanOrEqual(700);
      expect(row(c).capacityVehPerHourPerLane).toBeLessThanOrEqual(900);
    }
    // motorway_link: a single-lane ramp below a freeway lane (common practice), and says so.
    expect(row('motorway_link').capacityVehPerHourPerLane).toBeLessThan(row('motorway').capacityVehPerHourPerLane);
    expect(row('motorway_link').capacitySource).toMatch(/^common practice \(CP\)/);
  });

  it('arterial rows are 1,900 × g/C rounded down to the nearest 50', () => {
    const derived = { primary: 0.55, secondary: 0.45, tertiary: 0.4 } as const;
    for (const [c, g] of Object.entries(derived)) {
      expect(row(c).capacityVehPerHourPerLane).toBe(Math.floor(signalisedLaneCapacity(g) / 50) * 50);
    }
  });

  it('freeway and multilane rows stay below the HCM base capacity × f_HV at their speed', () => {
    const mph = (kmh: number) => kmh / KM_PER_MILE;
    expect(row('motorway').capacityVehPerHourPerLane).toBeLessThanOrEqual(freewayBaseCapacity(mph(110)) * ASSUMED_HEAVY_VEHICLE_FACTOR);
    expect(row('trunk').capacityVehPerHourPerLane).toBeLessThanOrEqual(multilaneBaseCapacity(mph(90)) * ASSUMED_HEAVY_VEHICLE_FACTOR);
  });

  it('jam density is the HCM value for every class, and every value says where it comes from', () => {
    for (const r of DEFAULT_CAPACITY_ROWS) {
      expect(r.jamDensityVehPerKmPerLane).toBe(118.06);
      for (const s of [r.capacitySource, r.speedSource, r.lanesSource, r.jamDensitySource]) {
        expect(s).toMatch(/\((C|CP|X|M)\)|from memory/);
      }
    }
    expect(row('motorway').capacitySource).toContain('Eq. 12-6');
    expect(row('primary').capacitySource).toContain('HPMS');
  });
});

describe('capacity factors', () => {
  it('weather presets equal HCM 7th ed. Exhibit 11-20 and the FHWA-HOP-13-042 means', () => {
    const f = Object.fromEntries(CAPACITY_FACTOR_PRESETS.map((p) => [p.id, p.factor]));
    expect([f['heavyRain55'], f['heavyRain65'], f['heavyRain75']]).toEqual([0.89, 0.86, 0.82]);
    expect([f['mediumRain55'], f['mediumRain65'], f['mediumRain75']]).toEqual([0.94, 0.92, 0.9]);
    expect([f['heavySnow55'], f['heavySnow65'], f['heavySnow75']]).toEqual([0.8, 0.76, 0.72]);
    expect(f['rainMean']).toBeCloseTo(0.8587, 10);
    expect(f['snowMean']).toBeCloseTo(0.7757, 10);
    expect(f['observedEvacuation']).toBeCloseTo(0.3, 10);
    for (const p of CAPACITY_FACTOR_PRESETS) expect(p.source.length).toBeGreaterThan(10);
  });

  it('lane closure factors equal HCM 7th ed. Exhibit 11-23', () => {
    expect(LANE_CLOSURE_FACTORS.map((l) => l.factorPerOpenLane)).toEqual([0.7, 0.74, 0.51]);
  });
});

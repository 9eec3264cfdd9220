// Departure curves against the check values of docs/model.md §4 (logistic and Rayleigh forms,
// Li, Ozbay, Bartin et al. 2013; values computed from the formulas).
import { describe, expect, it } from 'vitest';
import { releaseSchedule } from '../../../shared/flow';
import { cumulativeShareByStep, cumulativeShareDeparted, logisticShare, rayleighShare } from '../../../shared/model';

describe('published curve forms', () => {
  it('logistic α = 1/h, H = 3 h: P(3) = 0.5000, P(5) = 0.8808, P(6) = 0.9526, P(0) = 0.0474', () => {
    expect(logisticShare(3, 1, 3)).toBeCloseTo(0.5, 4);
    expect(logisticShare(5, 1, 3)).toBeCloseTo(0.8808, 4);
    expect(logisticShare(6, 1, 3)).toBeCloseTo(0.9526, 4);
    expect(logisticShare(0, 1, 3)).toBeCloseTo(0.0474, 4);
  });

  it('Rayleigh σ = 2 h: F(2) = 0.3935, F(4) = 0.8647, median 2.3548 h', () => {
    expect(rayleighShare(2, 2)).toBeCloseTo(0.3935, 4);
    expect(rayleighShare(4, 2)).toBeCloseTo(0.8647, 4);
    expect(rayleighShare(2.3548, 2)).toBeCloseTo(0.5, 4);
  });
});

describe('cumulative share departed', () => {
  const logistic = { kind: 'logistic', responseRatePerHour: 1, halfLoadingHours: 3 } as const;

  it('shifts the logistic so nobody leaves before the order: F = (P − P(0)) / (1 − P(0))', () => {
    expect(cumulativeShareDeparted(logistic, 0)).toBe(0);
    const p0 = 0.04742587317756678;
    expect(cumulativeShareDeparted(logistic, 5)).toBeCloseTo((0.8807970779778823 - p0) / (1 - p0), 12);
    expect(cumulativeShareDeparted(logistic, 3)).toBeLessThan(0.5);
  });

  it('is 0 before the order and rises to 1 for every curve', () => {
    const curves = [
      { kind: 'allAtOnce' },
      { kind: 'uniform', durationHours: 2 },
      logistic,
      { kind: 'rayleigh', sigmaHours: 2 },
    ] as const;
    for (const c of curves) {
      expect(cumulativeShareDeparted(c, -1)).toBe(0);
      let last = 0;
      for (let h = 0; h <= 30; h += 0.25) {
        const f = cumulativeShareDeparted(c, h);
        expect(f).toBeGreaterThanOrEqual(last);
        last = f;
      }
      expect(last).toBeCloseTo(1, 6);
    }
    expect(cumulativeShareDeparted({ kind: 'uniform', durationHours: 2 }, 0.5)).toBe(0.25);
  });

  it('by step is F at the end of each step and ends at exactly 1', () => {
    expect(cumulativeShareByStep({ kind: 'allAtOnce' }, 60)).toEqual([1]);
    expect(cumulativeShareByStep({ kind: 'uniform', durationHours: 1 }, 1800)).toEqual([0.5, 1]);
    const r = cumulativeShareByStep({ kind: 'rayleigh', sigmaHours: 2 }, 3600);
    expect(r[1]).toBeCloseTo(0.3935, 4); // end of step 1 = 2 h
    expect(r[3]).toBeCloseTo(0.8647, 4); // 4 h
    expect(r[r.length - 1]).toBe(1);
  });

  it('feeds the engine: the release schedule sums to the vehicles and follows the curve', () => {
    const shares = cumulativeShareByStep({ kind: 'uniform', durationHours: 1 }, 600);
    const counts = releaseSchedule({ id: 'z', entryNodes: [0], vehicles: 600, releaseFractionByStep: shares }, 10);
    expect(Array.from(counts)).toEqual([100, 100, 100, 100, 100, 100, 0, 0, 0, 0, 0]);
  });
});

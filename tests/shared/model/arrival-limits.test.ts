// The words for what holds arrivals down. The bound itself is checked against the engine in
// tests/server/runs.test.ts (max-flow/min-cut on the time-expanded network).
import { describe, expect, it } from 'vitest';
import { arrivalLimitParts, arrivalLimitSummary } from '../../../shared/model/arrival-limits';
import type { ArrivalLimits } from '../../../shared/api/runs';

const formats = { count: (n: number) => n.toLocaleString('en-US'), share: (s: number) => `${Math.round(s * 100)} %`, duration: (m: number) => `${m} min` };
const limits = (parts: Partial<ArrivalLimits['parts']>): ArrivalLimits => {
  const all = { roads: 0, departures: 0, zoneRelease: 0, storage: 0, shelterIntake: 0, shelterCapacity: 0, ...parts };
  return { byMinutes: 240, vehicles: Object.values(all).reduce((a, b) => a + b, 0), parts: all, zoneIds: [], shelterIds: [] };
};

describe('arrival limits in words', () => {
  it('lists the parts in the cut, largest first, with their shares', () => {
    const parts = arrivalLimitParts(limits({ roads: 300, departures: 700 }));
    expect(parts.map((p) => [p.key, p.share])).toEqual([
      ['departures', 0.7],
      ['roads', 0.3],
    ]);
  });

  it('says that no road change can raise a limit no road is part of', () => {
    const text = arrivalLimitSummary(limits({ departures: 10_220 }), formats);
    expect(text).toBe(
      'By 240 min after the order at most 10,220 vehicles can have arrived. What holds that number down: departure timing 100 %. ' +
        'No road is part of that limit, so more lanes, contraflow or a reopened road alone cannot raise it; only a change to what is part of it can.',
    );
  });

  it('does not say so when roads are part of it', () => {
    const text = arrivalLimitSummary(limits({ roads: 800, shelterCapacity: 200 }), formats);
    expect(text).toBe('By 240 min after the order at most 1,000 vehicles can have arrived. What holds that number down: road capacity 80 %, shelter space 20 %.');
  });
});

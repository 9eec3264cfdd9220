// A departure schedule saved in a scenario (the quickest order a search found) must reproduce
// the same departures per step when the run uses the same time step, and keep its cumulative
// shape when it does not (worked by hand).
import { describe, expect, it } from 'vitest';
import { releaseSchedule } from '../../../shared/flow';
import { scheduleShares } from '../../../shared/model/apply-scenario';

describe('departure schedules in a scenario', () => {
  it('reproduces the departures exactly at the same time step', () => {
    const departures = [3, 0, 7, 2, 0, 1];
    const shares = scheduleShares(departures, 300, 300, 10);
    expect(Array.from(releaseSchedule({ id: 'z', entryNodes: [0], vehicles: 13, releaseFractionByStep: shares }, 10))).toEqual([3, 0, 7, 2, 0, 1, 0, 0, 0, 0, 0]);
  });

  it('a 5-minute schedule on 10-minute steps: departures of two intervals fall in one step', () => {
    const shares = scheduleShares([4, 2, 6, 8], 300, 600, 3);
    expect(shares).toEqual([0.3, 1, 1, 1]);
  });
});

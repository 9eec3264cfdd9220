// The trip-time words that the Findings tab and the briefing both print (shared/format/trip-times.ts).
import { describe, expect, it } from 'vitest';
import type { RouteTiming } from '../../../shared/api/runs';
import { fastestTripsPastBound, formatTripSeconds, plannedRoutesPastBound, tripTimesMethod, tripTimesPastBound, tripTimesSummary, tripTimesWarning } from '../../../shared/format/trip-times';

const within: RouteTiming = {
  timeStepSeconds: 60,
  pairs: 12,
  largestSeconds: 42,
  typicalSeconds: 18,
  worst: { zoneId: 1, zoneName: 'North Flats', shelterId: 2, shelterName: 'Hill School', freeFlowSeconds: 228, modelledSeconds: 270 },
  suggestedStepSeconds: null,
};
const past: RouteTiming = {
  ...within,
  largestSeconds: 150,
  typicalSeconds: 40,
  worst: { ...within.worst!, freeFlowSeconds: 230, modelledSeconds: 380 },
  suggestedStepSeconds: 20,
};

describe('trip-time words', () => {
  it('formats trip seconds in seconds, minutes or hours', () => {
    expect(formatTripSeconds(42.4)).toBe('42 s');
    expect(formatTripSeconds(228)).toBe('3.8 min');
    expect(formatTripSeconds(4500)).toBe('1 h 15 min');
    expect(formatTripSeconds(7200)).toBe('2 h');
  });

  it('within one step: a summary and no warning', () => {
    expect(tripTimesPastBound(within)).toBe(false);
    expect(tripTimesWarning(within)).toBeNull();
    expect(tripTimesSummary(within)).toBe(
      'Fastest trips from each zone to each shelter or exit (12 pairs) take up to 42 s longer or shorter in the model than at free flow, typically 18 s: within one time step (1 minute).',
    );
  });

  it('adds the routes the plan drives when the result carries them (engine cutline-flow 1.4)', () => {
    const withPlan: RouteTiming = { ...within, plannedRoutes: { vehicles: 10525, largestSeconds: 1877, typicalSeconds: 245, withinOneStepShare: 0.1456 } };
    expect(tripTimesSummary(withPlan)).toBe(
      `${tripTimesSummary(within)} The routes the plan's 10,525 vehicles drive are modelled up to 31.3 min off their own free-flow times, typically 4.1 min; 15 % of those vehicles are within one time step.`,
    );
  });

  it('past one step: the warning names the worst pair and the step to try', () => {
    expect(tripTimesPastBound(past)).toBe(true);
    const w = tripTimesWarning(past)!;
    expect(w).toContain('up to 2.5 min off free flow, more than one time step (1 minute)');
    expect(w).toContain('from North Flats to Hill School takes 3.8 min at free flow and 6.3 min in the model');
    expect(w).toContain('may come that much late');
    expect(w).toContain('Analyse again with a time step of 20 seconds: that should bring the difference within 1 minute.');
    expect(tripTimesWarning({ ...past, suggestedStepSeconds: null })).toContain('Analyse again with a shorter time step');
  });

  it('warns when most of the plan’s routes are more than one step off, even with every fastest trip within it', () => {
    // The generated county at 60 s (tests/bench/flow/README.md): fastest trips can be within the
    // bound while the routes the plan drives (other bridges, when the nearest are full) are not.
    const planOff: RouteTiming = { ...within, suggestedStepSeconds: 15, plannedRoutes: { vehicles: 56166, largestSeconds: 12638, typicalSeconds: 3066, withinOneStepShare: 0.164 } };
    expect(fastestTripsPastBound(planOff)).toBe(false);
    expect(plannedRoutesPastBound(planOff)).toBe(true);
    expect(tripTimesPastBound(planOff)).toBe(true);
    const w = tripTimesWarning(planOff)!;
    expect(w).toBe(
      "Most of the routes the plan's 56,166 vehicles drive are modelled more than one time step (1 minute) slower than at free flow: typically 51.1 min, up to 3 h 31 min; " +
        'only 16 % of those vehicles are within one step, so arrivals, the curve and the clearance time may come that much late. ' +
        'The cause is roads driven against the direction their steps were rounded for (towards the nearest shelter or exit, or out of the nearest zone), each rounded up to a whole step. ' +
        'Analyse again with a time step of 15 seconds: that should bring the difference within 1 minute.',
    );
    // A typical route within one step: no warning on its account.
    const planWithin: RouteTiming = { ...within, plannedRoutes: { vehicles: 900, largestSeconds: 400, typicalSeconds: 60, withinOneStepShare: 0.7 } };
    expect(tripTimesWarning(planWithin)).toBeNull();
    // Both past: the worst fastest trip first, then the plan's routes, one cause.
    const both = tripTimesWarning({ ...past, plannedRoutes: planOff.plannedRoutes })!;
    expect(both).toContain('from North Flats to Hill School takes 3.8 min at free flow and 6.3 min in the model');
    expect(both).toContain("Most of the routes the plan's 56,166 vehicles drive");
    expect(both).toContain('The cause is roads driven against the direction');
  });

  it('the method states the rounding and its bound, with this run’s figures when stored', () => {
    const m = tripTimesMethod(60, within);
    expect(m).toContain('whole time steps of 1 minute');
    expect(m).toContain('within one time step of its free-flow travel time');
    // Which trips the bound covers, and that the others are not bounded (docs/model.md §1).
    expect(m).toContain('a fastest route to the nearest shelter or exit');
    expect(m).toContain('Other trips are not bounded this way');
    // The lower bound every route keeps (tests/shared/flow/route-timing.test.ts checks it).
    expect(m).toContain('No trip is modelled more than one time step faster than at free flow.');
    expect(m).toContain('Fleischer & Skutella 2007');
    expect(m).toContain(tripTimesSummary(within));
    expect(tripTimesMethod(300, undefined)).not.toContain('In this analysis');
  });
});

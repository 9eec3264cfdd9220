// docs/model.md §6, one bottleneck arc (status X, derived from the §1 convention): 13 vehicles,
// capacity 2 per step, τ = 3 steps → the last arrives at step τ + ⌈W/c⌉ − 1 = 9.
import { describe, expect, it } from 'vitest';
import { solveEvacuation, type EvacuationProblem } from '../../../shared/flow';

const problem: EvacuationProblem = {
  nodeCount: 2,
  timeStepSeconds: 60,
  horizonSteps: 12,
  // 120 veh/h × 60 s / 3600 = 2 vehicles per step; 180 s = 3 steps.
  roads: [{ from: 0, to: 1, capacityVehPerHour: 120, travelTimeSeconds: 180, lanes: 1 }],
  zones: [{ id: 'north', entryNodes: [0], vehicles: 13 }],
  shelters: [{ id: 'hall', node: 1, capacityVehicles: null }],
};

describe('one bottleneck arc (docs/model.md §6)', () => {
  const result = solveEvacuation(problem, { verify: true });

  it('clears at step 9 = τ + ⌈W/c⌉ − 1', () => {
    expect(result.verification).toEqual({ ok: true, problems: [] });
    expect(result.curve.clearanceStep).toBe(3 + Math.ceil(13 / 2) - 1);
  });

  it('delivers 2 per step from step τ on', () => {
    expect(result.curve.deliveredVehiclesByStep).toEqual([0, 0, 0, 2, 4, 6, 8, 10, 12, 13, 13, 13, 13]);
    // 50 % of 13 is 6.5 → 7 vehicles by step 6; 90 % → 12 by step 8; 95 % → 13 by step 9.
    expect(result.curve.marks).toEqual({ p50: 6, p90: 8, p95: 9 });
  });

  it('names the road as the bottleneck for the departures of steps 0..5 before clearance', () => {
    // The cut is taken at step 8 (the step before clearance): copies departing 0..5 arrive by 8.
    expect(result.bottlenecks.horizonStep).toBe(8);
    expect(result.bottlenecks.roads).toEqual([{ road: 0, stepRanges: [[0, 5]], cutCapacityVehicles: 12, share: 1 }]);
    expect(result.bottlenecks.cutCapacityVehicles).toBe(result.curve.deliveredVehiclesByStep[8]);
  });

  it('reports the static cut, the plan and the value of a second lane', () => {
    expect(result.steadyState.throughputVehPerHour).toBe(120);
    expect(result.steadyState.cutRoads).toEqual([0]);
    expect(result.fixes).toEqual([{ kind: 'add-lane', road: 0, addedVehPerHour: 120, gainVehPerHour: 120 }]);
    expect(result.plan.zones[0]).toMatchObject({ deliveredVehicles: 13, lastArrivalStep: 9, releasedVehicles: 13 });
    expect(result.plan.shelters[0]).toMatchObject({ arrivedVehicles: 13, lastArrivalStep: 9 });
    expect(result.plan.roads.peakVehiclesPerStep).toEqual([2]);
    expect(result.plan.roads.peakUtilisation).toEqual([1]);
    expect(result.plan.roads.totalVehicles).toEqual([13]);
    expect(result.plan.assignments).toEqual([{ zone: 0, shelter: 0, vehicles: 13 }]);
  });

  it('is not cleared within a horizon of 8 steps', () => {
    const short = solveEvacuation({ ...problem, horizonSteps: 8 });
    expect(short.curve.clearanceStep).toBeNull();
    expect(short.curve.marks.p95).toBeNull();
    expect(short.bottlenecks.horizonStep).toBe(8);
  });
});

// The discrete convention of docs/model.md §1 on hand-solved cases: closures refuse departures in
// every step they overlap (vehicles already on the road finish), the steady state is a snapshot
// at one instant, storage bounds waiting, shelters cap totals, and the result is plain JSON.
import { describe, expect, it } from 'vitest';
import { EvacuationInputError, solveEvacuation, type EvacuationProblem } from '../../../shared/flow';

const STEP = 60;
/** Zone at 0, shelter at 1, one road of 1 vehicle/step taking 1 step, 10 vehicles, 8 steps. */
const base = (road: Partial<EvacuationProblem['roads'][number]> = {}): EvacuationProblem => ({
  nodeCount: 2,
  timeStepSeconds: STEP,
  horizonSteps: 8,
  roads: [{ from: 0, to: 1, capacityVehPerHour: 60, travelTimeSeconds: STEP, ...road }],
  zones: [{ id: 'z', entryNodes: [0], vehicles: 10 }],
  shelters: [{ id: 's', node: 1, capacityVehicles: null }],
});

describe('closures', () => {
  it('a road closed from step 3 on takes departures of steps 0..2 only', () => {
    const result = solveEvacuation(base({ closures: [{ fromSeconds: 3 * STEP, untilSeconds: null }] }), { verify: true });
    expect(result.curve.deliveredVehiclesByStep).toEqual([0, 1, 2, 3, 3, 3, 3, 3, 3]);
    expect(result.verification?.ok).toBe(true);
    // At t = 0 the road is open, so the steady state sees it.
    expect(result.steadyState.throughputVehPerHour).toBe(60);
  });

  it('a road closed until step 2 opens for departures of step 2', () => {
    const result = solveEvacuation(base({ closures: [{ fromSeconds: 0, untilSeconds: 2 * STEP }] }));
    expect(result.curve.deliveredVehiclesByStep).toEqual([0, 0, 0, 1, 2, 3, 4, 5, 6]);
    // Closed at the snapshot instant 0: no steady-state flow, and reopening is the fix.
    expect(result.steadyState.throughputVehPerHour).toBe(0);
    expect(result.fixes).toEqual([{ kind: 'reopen', road: 0, addedVehPerHour: 60, gainVehPerHour: 60 }]);
    expect(solveEvacuation(base({ closures: [{ fromSeconds: 0, untilSeconds: 2 * STEP }] }), { steadyStateAtSeconds: 2 * STEP }).steadyState.throughputVehPerHour).toBe(60);
  });

  it('a closure covering part of a step closes that whole step', () => {
    // [90 s, 150 s) overlaps steps 1 ([60, 120)) and 2 ([120, 180)).
    const result = solveEvacuation(base({ closures: [{ fromSeconds: 90, untilSeconds: 150 }] }));
    expect(result.curve.deliveredVehiclesByStep).toEqual([0, 1, 1, 1, 2, 3, 4, 5, 6]);
  });

  it('vehicles already on the road when it closes still arrive', () => {
    // 3-step road, closed from step 1: the departure of step 0 arrives at step 3.
    const result = solveEvacuation(base({ travelTimeSeconds: 3 * STEP, closures: [{ fromSeconds: STEP, untilSeconds: null }] }));
    expect(result.curve.deliveredVehiclesByStep).toEqual([0, 0, 0, 1, 1, 1, 1, 1, 1]);
  });
});

describe('the rest of the model', () => {
  it('storage on the roads into a node bounds waiting there', () => {
    // 0 → 1 carries 3/step but only departures of step 0 (closed from step 1); 1 → 2 carries
    // 1/step. The three who cross at step 0 must wait at node 1, so its storage decides.
    const problem = (storageVehicles?: number): EvacuationProblem => ({
      nodeCount: 3,
      timeStepSeconds: STEP,
      horizonSteps: 5,
      roads: [
        { from: 0, to: 1, capacityVehPerHour: 180, travelTimeSeconds: STEP, closures: [{ fromSeconds: STEP, untilSeconds: null }], ...(storageVehicles === undefined ? {} : { storageVehicles }) },
        { from: 1, to: 2, capacityVehPerHour: 60, travelTimeSeconds: STEP },
      ],
      zones: [{ id: 'z', entryNodes: [0], vehicles: 20 }],
      shelters: [{ id: 's', node: 2, capacityVehicles: null }],
    });
    expect(solveEvacuation(problem()).curve.deliveredVehiclesByStep).toEqual([0, 0, 1, 2, 3, 3]);
    expect(solveEvacuation(problem(2)).curve.deliveredVehiclesByStep).toEqual([0, 0, 1, 2, 3, 3]);
    expect(solveEvacuation(problem(1)).curve.deliveredVehiclesByStep).toEqual([0, 0, 1, 2, 2, 2]);
    const none = solveEvacuation(problem(0));
    expect(none.curve.deliveredVehiclesByStep).toEqual([0, 0, 1, 1, 1, 1]);
    expect(none.bottlenecks.composition.storage).toBe(0); // storage 0 means no waiting arc at all
  });

  it('a shelter takes at most its capacity over the horizon, the rest goes elsewhere', () => {
    const problem: EvacuationProblem = {
      nodeCount: 3,
      timeStepSeconds: STEP,
      horizonSteps: 6,
      roads: [
        { from: 0, to: 1, capacityVehPerHour: 120, travelTimeSeconds: STEP },
        { from: 0, to: 2, capacityVehPerHour: 60, travelTimeSeconds: 3 * STEP },
      ],
      zones: [{ id: 'z', entryNodes: [0], vehicles: 9 }],
      shelters: [
        { id: 'near', node: 1, capacityVehicles: 4 },
        { id: 'far', node: 2, capacityVehicles: null },
      ],
    };
    const result = solveEvacuation(problem, { verify: true });
    expect(result.verification?.ok).toBe(true);
    // near: 2/step from step 1, full at 4 by step 2; far: 1/step from step 3.
    expect(result.curve.deliveredVehiclesByStep).toEqual([0, 2, 4, 5, 6, 7, 8]);
    expect(result.plan.shelters.map((s) => s.arrivedVehicles)).toEqual([4, 4]);
    expect(result.bottlenecks.shelters).toContain(0);
  });

  it('a departure curve releases round(vehicles · share) by the end of each step', () => {
    const result = solveEvacuation({
      ...base(),
      roads: [{ from: 0, to: 1, capacityVehPerHour: 6000, travelTimeSeconds: STEP }],
      zones: [{ id: 'z', entryNodes: [0], vehicles: 10, releaseFractionByStep: [0.1, 0.25, 0.5, 0.9, 1] }],
    });
    // By the end of steps 0..4: 1, 3 (2.5 → 3), 5, 9, 10 departed; each arrives one step later.
    expect(result.curve.deliveredVehiclesByStep).toEqual([0, 1, 3, 5, 9, 10, 10, 10, 10]);
    expect(result.curve.clearanceStep).toBe(5);
  });

  it('warns about capacities that vanish at the chosen step, and incomplete departures', () => {
    const result = solveEvacuation({
      ...base({ capacityVehPerHour: 50 }),
      zones: [{ id: 'z', entryNodes: [0], vehicles: 10, releaseVehiclesByStep: [5] }],
    });
    expect(result.warnings.map((w) => w.code)).toEqual(['capacity-rounds-to-zero', 'release-incomplete']);
  });

  it('rejects an invalid problem with the offending field', () => {
    expect(() => solveEvacuation({ ...base(), horizonSteps: -1 })).toThrow(EvacuationInputError);
    expect(() => solveEvacuation({ ...base(), zones: [{ id: 'z', entryNodes: [5], vehicles: 1 }] })).toThrow(/zones\[0\]\.entryNodes\[0\]/);
    expect(() => solveEvacuation({ ...base(), zones: [{ id: 'z', entryNodes: [0], vehicles: 1, releaseFractionByStep: [0.5, 0.4] }] })).toThrow(/cannot decrease/);
    expect(() => solveEvacuation(base({ travelTimeSeconds: Number.NaN }))).toThrow(/roads\[0\]\.travelTimeSeconds/);
  });

  it('returns plain JSON, reports progress and honours abort', () => {
    const phases: string[] = [];
    const result = solveEvacuation(base(), { onProgress: (phase, fraction) => phases.push(`${phase}:${fraction}`), now: () => 0 });
    expect(JSON.parse(JSON.stringify(result))).toEqual(result);
    expect(phases[0]).toBe('steady-state:0');
    expect(phases).toContain('curve:1');
    expect(phases.at(-1)).toBe('fixes:1');
    expect(result.stats.timingsMs).toBeDefined();
    expect(() => solveEvacuation(base(), { shouldAbort: () => true })).toThrow(/aborted/);
  });
});

// The closures that hurt most: every reported loss must equal a fresh solve of the problem with
// the road closed (the engine's solveEvacuation from scratch, no warm start), on small random
// plans, closing at the order and at a later time. The fresh steady state is also checked
// against glpk.js's LP (tests/shared/flow/support/evacuation-lp.ts).
import fc from 'fast-check';
import { beforeAll, describe, expect, it } from 'vitest';
import { solveEvacuation } from '../../../shared/flow';
import { cloneProblem, rankClosures, steadyThroughput } from '../../../shared/plan-optimization';
import { steadyStateLpValue } from '../flow/support/evacuation-lp';
import { loadGlpk, type Glpk } from '../flow/support/glpk';
import { randomPlan, STEP_SECONDS } from './support/random-plans';

let glpk: Glpk;
beforeAll(async () => {
  glpk = await loadGlpk();
});

describe('closure ranking', () => {
  it('every loss equals a fresh solve with the road closed', () => {
    fc.assert(
      fc.property(randomPlan({ maxPairs: 4 }), fc.integer({ min: 0, max: 4 }), ({ problem }, closeStep) => {
        const closeAtSeconds = closeStep * STEP_SECONDS;
        const ranking = rankClosures(problem, { closeAtSeconds, candidates: problem.roads.map((_, e) => e), maxClearanceTests: 1000 });
        const base = solveEvacuation(problem, { steadyStateAtSeconds: closeAtSeconds });
        expect(ranking.baseVehPerHour).toBe(base.steadyState.throughputVehPerHour);
        expect(ranking.baseClearanceStep).toBe(base.curve.clearanceStep);
        for (const impact of ranking.impacts) {
          expect(impact.clearanceTested).toBe(true);
          const closed = cloneProblem(problem);
          closed.roads[impact.road]!.closures = [{ fromSeconds: closeAtSeconds, untilSeconds: null }];
          const fresh = solveEvacuation(closed, { steadyStateAtSeconds: closeAtSeconds });
          expect(impact.lossVehPerHour).toBe(base.steadyState.throughputVehPerHour - fresh.steadyState.throughputVehPerHour);
          expect(impact.clearanceStep).toBe(fresh.curve.clearanceStep);
          const T = problem.horizonSteps;
          expect(impact.deliveredLossVehicles).toBe(base.curve.deliveredVehiclesByStep[T]! - fresh.curve.deliveredVehiclesByStep[T]!);
          expect(Math.round(steadyStateLpValue(glpk, closed, closeAtSeconds))).toBe(fresh.steadyState.throughputVehPerHour);
        }
        // Ranked: a closure that stops clearance first, then by clearance loss.
        const keys = ranking.impacts.map((i) => (ranking.baseClearanceStep !== null && i.clearanceStep === null ? 1e9 : (i.clearanceLossSteps ?? 0)));
        for (let i = 1; i < keys.length; i++) expect(keys[i - 1]!).toBeGreaterThanOrEqual(keys[i]!);
      }),
      { numRuns: 50 },
    );
  }, 60_000);

  it('by default tests the roads that carry flow, and a bridge that is the only way out ranks first (worked by hand)', () => {
    // 0 → 1 → 2 (exit), and a slower detour 0 → 3 → 2; road 1 → 2 is the bridge.
    const problem = {
      nodeCount: 4,
      roads: [
        { from: 0, to: 1, capacityVehPerHour: 600, travelTimeSeconds: 60 },
        { from: 1, to: 2, capacityVehPerHour: 600, travelTimeSeconds: 60 },
        { from: 0, to: 3, capacityVehPerHour: 120, travelTimeSeconds: 120 },
        { from: 3, to: 2, capacityVehPerHour: 120, travelTimeSeconds: 120 },
        { from: 2, to: 0, capacityVehPerHour: 600, travelTimeSeconds: 60 },
      ],
      zones: [{ id: 'z', entryNodes: [0], vehicles: 50 }],
      shelters: [{ id: 'exit', node: 2, capacityVehicles: null }],
      timeStepSeconds: 60,
      horizonSteps: 40,
    };
    const ranking = rankClosures(problem);
    expect(ranking.baseVehPerHour).toBe(720);
    expect(ranking.impacts.map((i) => i.road).sort()).toEqual([0, 1, 2, 3]); // road 4 carries nothing
    expect(ranking.impacts[0]!.lossVehPerHour).toBe(600);
    expect([0, 1]).toContain(ranking.impacts[0]!.road);
    expect(steadyThroughput(problem)).toBe(720);
  });
});

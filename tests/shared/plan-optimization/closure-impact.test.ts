// The closures that hurt most: every reported loss must equal a fresh solve of the problem with
// the road closed (the engine's solveEvacuation from scratch, no warm start), on small random
// plans, closing at the order and at a later time. The fresh steady state is also checked
// against glpk.js's LP (tests/shared/flow/support/evacuation-lp.ts).
import fc from 'fast-check';
import { beforeAll, describe, expect, it } from 'vitest';
import { solveEvacuation, type EvacuationProblem } from '../../../shared/flow';
import { cloneProblem, rankClosures, steadyThroughput } from '../../../shared/plan-optimization';
import { steadyStateLpValue } from '../flow/support/evacuation-lp';
import { loadGlpk, type Glpk } from '../flow/support/glpk';
import { randomPlan, STEP_SECONDS } from './support/random-plans';

let glpk: Glpk;
beforeAll(async () => {
  glpk = await loadGlpk();
});

describe.each(['explicit', 'implicit'] as const)('closure ranking on the %s time-expanded network', (layout) => {
  it('every loss equals a fresh solve with the road closed', () => {
    fc.assert(
      fc.property(randomPlan({ maxPairs: 4 }), fc.integer({ min: 0, max: 4 }), ({ problem }, closeStep) => {
        const closeAtSeconds = closeStep * STEP_SECONDS;
        const ranking = rankClosures(problem, { closeAtSeconds, candidates: problem.roads.map((_, e) => e), maxClearanceTests: 1000, layout });
        const base = solveEvacuation(problem, { steadyStateAtSeconds: closeAtSeconds });
        expect(ranking.baseVehPerHour).toBe(base.steadyState.throughputVehPerHour);
        expect(ranking.baseClearanceStep).toBe(base.curve.clearanceStep);
        for (const impact of ranking.impacts) {
          expect(impact.clearanceTested).toBe(true);
          expect(ranking.clearanceLayout).toBe(layout);
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

  it('on larger random grids too, where the warm start reroutes many paths: every clearance equals a fresh solve', () => {
    // Grids of 3 × 3 to 4 × 5 junctions with two-way streets of random capacity, two zones with
    // departures spread over several steps, two exits: enough paths through each road that the
    // rerouting from the base plan (closedClearance) does real work, and closures that delay the
    // clearance by many steps (the bracketed horizon search).
    const grid = fc
      .record({ rows: fc.integer({ min: 3, max: 4 }), cols: fc.integer({ min: 3, max: 5 }) })
      .chain(({ rows, cols }) =>
        fc.record({
          rows: fc.constant(rows),
          cols: fc.constant(cols),
          caps: fc.array(fc.integer({ min: 0, max: 4 }), { minLength: 4 * rows * cols, maxLength: 4 * rows * cols }),
          steps: fc.array(fc.integer({ min: 1, max: 2 }), { minLength: 2 * rows * cols, maxLength: 2 * rows * cols }),
          vehicles: fc.tuple(fc.integer({ min: 5, max: 40 }), fc.integer({ min: 5, max: 40 })),
          closeStep: fc.integer({ min: 0, max: 3 }),
        }),
      );
    fc.assert(
      fc.property(grid, ({ rows, cols, caps, steps, vehicles, closeStep }) => {
        const id = (r: number, c: number) => r * cols + c;
        const roads: EvacuationProblem['roads'] = [];
        let k = 0;
        for (let r = 0; r < rows; r++) {
          for (let c = 0; c < cols; c++) {
            for (const [r2, c2] of [[r, c + 1], [r + 1, c]] as const) {
              if (r2 >= rows || c2 >= cols) continue;
              const seconds = steps[k % steps.length]! * STEP_SECONDS;
              roads.push({ from: id(r, c), to: id(r2, c2), capacityVehPerHour: caps[2 * k]! * 60, travelTimeSeconds: seconds });
              roads.push({ from: id(r2, c2), to: id(r, c), capacityVehPerHour: caps[2 * k + 1]! * 60, travelTimeSeconds: seconds });
              k++;
            }
          }
        }
        const problem: EvacuationProblem = {
          nodeCount: rows * cols,
          roads,
          zones: [
            { id: 'a', entryNodes: [0], vehicles: vehicles[0], releaseFractionByStep: [0.2, 0.5, 0.8, 1] },
            { id: 'b', entryNodes: [cols - 1], vehicles: vehicles[1], releaseFractionByStep: [0, 0.5, 1] },
          ],
          shelters: [
            { id: 'x', node: id(rows - 1, cols - 1), capacityVehicles: null },
            { id: 'y', node: id(rows - 1, 0), capacityVehicles: null },
          ],
          timeStepSeconds: STEP_SECONDS,
          horizonSteps: 40,
        };
        const closeAtSeconds = closeStep * STEP_SECONDS;
        const ranking = rankClosures(problem, { closeAtSeconds, maxClearanceTests: 1000, layout });
        const base = solveEvacuation(problem, { steadyStateAtSeconds: closeAtSeconds });
        expect(ranking.baseClearanceStep).toBe(base.curve.clearanceStep);
        for (const impact of ranking.impacts) {
          const closed = cloneProblem(problem);
          closed.roads[impact.road]!.closures = [{ fromSeconds: closeAtSeconds, untilSeconds: null }];
          const fresh = solveEvacuation(closed, { steadyStateAtSeconds: closeAtSeconds });
          expect(impact.clearanceStep).toBe(fresh.curve.clearanceStep);
          expect(impact.deliveredLossVehicles).toBe(base.curve.deliveredVehiclesByStep[40]! - fresh.curve.deliveredVehiclesByStep[40]!);
          expect(impact.lossVehPerHour).toBe(base.steadyState.throughputVehPerHour - fresh.steadyState.throughputVehPerHour);
        }
      }),
      { numRuns: 40 },
    );
  }, 120_000);
});

describe('closure ranking', () => {
  it('a closure that delays the clearance by nine steps is found by the bracketed search (worked by hand)', () => {
    // 20 vehicles leave node 0 at the order. The direct road 0 → 1 carries 10 a step in one step:
    // departures in steps 0 and 1 arrive by step 2. Closed, the detour 0 → 2 → 1 carries 2 a
    // step in two steps: departures in steps 0..9 arrive by step 11, nine steps later.
    const problem: EvacuationProblem = {
      nodeCount: 3,
      roads: [
        { from: 0, to: 1, capacityVehPerHour: 600, travelTimeSeconds: 60 },
        { from: 0, to: 2, capacityVehPerHour: 120, travelTimeSeconds: 60 },
        { from: 2, to: 1, capacityVehPerHour: 120, travelTimeSeconds: 60 },
      ],
      zones: [{ id: 'z', entryNodes: [0], vehicles: 20, releaseVehiclesByStep: [20] }],
      shelters: [{ id: 'exit', node: 1, capacityVehicles: null }],
      timeStepSeconds: 60,
      horizonSteps: 30,
    };
    const ranking = rankClosures(problem, { candidates: [0] });
    expect(ranking.baseClearanceStep).toBe(2);
    expect(ranking.impacts[0]!.clearanceStep).toBe(11);
    expect(ranking.impacts[0]!.clearanceLossSteps).toBe(9);
    expect(ranking.impacts[0]!.deliveredLossVehicles).toBe(0);
    // With a horizon of 8 steps it never clears: 2 a step departing in steps 0..6 arrive by 8.
    const short = rankClosures({ ...problem, horizonSteps: 8 }, { candidates: [0] });
    expect(short.impacts[0]!.clearanceStep).toBeNull();
    expect(short.impacts[0]!.deliveredLossVehicles).toBe(20 - 14);
  });

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

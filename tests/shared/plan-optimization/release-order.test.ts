// The best release order (quickest transshipment in the discrete model) against:
//  - glpk.js: the smallest horizon T whose time-expanded LP optimum (written independently in
//    tests/shared/flow/support/evacuation-lp.ts) reaches the demand, with everyone free to leave;
//  - Ford & Fulkerson (1958), temporally repeated flows: with one source and one sink the most
//    vehicles delivered by step t is max over static flows x of (t + 1)·|x| − Σ τ_e·x_e, so the
//    quickest time for D vehicles is the first t where that reaches D (glpk.js min-cost LP).
import fc from 'fast-check';
import { beforeAll, describe, expect, it } from 'vitest';
import { bestReleaseOrder, everyoneFreeAtOrder, evaluateCurve } from '../../../shared/plan-optimization';
import type { EvacuationProblem } from '../../../shared/flow';
import { timeExpandedLpValue } from '../flow/support/evacuation-lp';
import { loadGlpk, solveFlowLp, type Glpk } from '../flow/support/glpk';
import { randomPlan, STEP_SECONDS } from './support/random-plans';

let glpk: Glpk;
beforeAll(async () => {
  glpk = await loadGlpk();
});

/** Departure curves that hold the zones back: half at step 2, all by step 4. */
function withSlowDepartures(problem: EvacuationProblem): EvacuationProblem {
  return { ...problem, zones: problem.zones.map((z) => ({ ...z, releaseFractionByStep: [0, 0, 0.5, 0.5, 1] })) };
}

describe.each(['explicit', 'implicit'] as const)('best release order on the %s time-expanded network', (layout) => {
  it('the quickest horizon is the smallest T whose glpk.js LP optimum reaches the demand, and the schedule achieves it', () => {
    fc.assert(
      fc.property(randomPlan({ horizon: 12, maxVehicles: 30 }), ({ problem: raw }) => {
        const problem = withSlowDepartures(raw);
        const order = bestReleaseOrder(problem, { layout });
        const demand = problem.zones.reduce((s, z) => s + z.vehicles, 0);
        const free = everyoneFreeAtOrder(problem);
        let smallest: number | null = null;
        for (let t = 0; t <= problem.horizonSteps; t++) {
          if (Math.round(timeExpandedLpValue(glpk, free, t)) >= demand) {
            smallest = t;
            break;
          }
        }
        expect(order.quickestClearanceStep).toBe(smallest);
        expect(order.scheduleClearanceStep).toBe(order.quickestClearanceStep);
        // The schedule on its own, as a whole curve over every horizon (not the one maximum flow
        // bestReleaseOrder checks it with): it clears exactly at the quickest step.
        const scheduled = { ...problem, zones: problem.zones.map((z, i) => ({ ...z, releaseFractionByStep: undefined, releaseVehiclesByStep: order.zones[i]!.departuresByStep })) };
        if (smallest !== null) expect(evaluateCurve(scheduled).clearanceStep).toBe(smallest);
        // The schedule releases every vehicle that arrives, and the expected curve can only be slower.
        if (smallest !== null) {
          for (const zone of order.zones) expect(zone.departuresByStep.reduce((s, n) => s + n, 0)).toBe(zone.vehicles);
          if (order.expectedClearanceStep !== null) expect(order.expectedClearanceStep).toBeGreaterThanOrEqual(smallest);
        }
        expect(order.expectedClearanceStep).toBe(evaluateCurve(problem).clearanceStep);
      }),
      { numRuns: 30 },
    );
  }, 60_000);

  it('one source, one exit: agrees with Ford & Fulkerson temporally repeated flows', () => {
    const instance = fc.integer({ min: 2, max: 6 }).chain((n) =>
      fc.record({
        n: fc.constant(n),
        arcs: fc.array(fc.record({ from: fc.integer({ min: 0, max: n - 1 }), to: fc.integer({ min: 0, max: n - 1 }), cap: fc.integer({ min: 0, max: 5 }), steps: fc.integer({ min: 1, max: 3 }) }), { maxLength: 12 }),
        demand: fc.integer({ min: 1, max: 60 }),
      }),
    );
    fc.assert(
      fc.property(instance, ({ n, arcs, demand }) => {
        const horizon = 30;
        const problem: EvacuationProblem = {
          nodeCount: n,
          timeStepSeconds: STEP_SECONDS,
          horizonSteps: horizon,
          roads: arcs.map((a) => ({ from: a.from, to: a.to, capacityVehPerHour: (a.cap * 3600) / STEP_SECONDS, travelTimeSeconds: a.steps * STEP_SECONDS })),
          zones: [{ id: 'z', entryNodes: [0], vehicles: demand, releaseFractionByStep: [0, 0, 1] }],
          shelters: [{ id: 'exit', node: n - 1, capacityVehicles: null }],
        };
        const order = bestReleaseOrder(problem, { layout });
        let quickest: number | null = null;
        for (let t = 0; t <= horizon; t++) {
          const lp = solveFlowLp(glpk, n, arcs.map((a) => ({ from: a.from, to: a.to, capacity: a.cap, cost: a.steps })), 0, n - 1, t + 1);
          if (Math.round(lp.value) >= demand) {
            quickest = t;
            break;
          }
        }
        expect(order.quickestClearanceStep).toBe(quickest);
      }),
      { numRuns: 40 },
    );
  }, 60_000);
});

describe('best release order', () => {
  it('moves waits at the entry node back home (worked by hand)', () => {
    // One road, 2 per step, 1 step: 10 vehicles free at step 0 depart 2 per step at steps 0..4.
    const problem: EvacuationProblem = {
      nodeCount: 2,
      roads: [{ from: 0, to: 1, capacityVehPerHour: 120, travelTimeSeconds: 60 }],
      zones: [{ id: 'z', entryNodes: [0], vehicles: 10, releaseFractionByStep: [0, 0, 0, 1] }],
      shelters: [{ id: 's', node: 1, capacityVehicles: null }],
      timeStepSeconds: 60,
      horizonSteps: 12,
    };
    const order = bestReleaseOrder(problem);
    expect(order.quickestClearanceStep).toBe(5);
    expect(order.expectedClearanceStep).toBe(8);
    expect(order.zones[0]!.departuresByStep).toEqual([2, 2, 2, 2, 2]);
    expect(order.waitsMovedHome).toBe(true);
  });
});

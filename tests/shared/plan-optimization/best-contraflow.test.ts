// Best contraflow against two outside references on small random plans:
//  - brute force over every orientation of every candidate pair (none, forward, backward), each
//    evaluated by a fresh maximum flow;
//  - glpk.js (GNU Linear Programming Kit) solving the pooled network as a linear program, written
//    independently of the engine (tests/shared/flow/support/evacuation-lp.ts).
// The pooled-capacity construction and orientation by flow: Rebennack, Arulselvan, Elefteriadou
// & Pardalos (2010), "Complexity analysis for maximum flow problems with arc reversals".
import fc from 'fast-check';
import { beforeAll, describe, expect, it } from 'vitest';
import {
  applyContraflow,
  bestContraflow,
  bestSteadyContraflow,
  cloneProblem,
  evaluateCurve,
  groupCorridors,
  poolPairs,
  steadyThroughput,
  type PairOrientation,
} from '../../../shared/plan-optimization';
import { steadyStateLpValue, timeExpandedLpValue } from '../flow/support/evacuation-lp';
import { loadGlpk, type Glpk } from '../flow/support/glpk';
import { randomPlan, type RandomPlan } from './support/random-plans';

let glpk: Glpk;
beforeAll(async () => {
  glpk = await loadGlpk();
});

/** Every orientation: each pair none / forward / backward. */
function* allOrientations(count: number): Generator<PairOrientation[]> {
  const total = 3 ** count;
  for (let code = 0; code < total; code++) {
    const list: PairOrientation[] = [];
    let c = code;
    for (let i = 0; i < count; i++) {
      const d = c % 3;
      c = Math.floor(c / 3);
      if (d === 1) list.push({ pair: i, direction: 'forward' });
      if (d === 2) list.push({ pair: i, direction: 'backward' });
    }
    yield list;
  }
}

const oriented = ({ problem, pairs }: RandomPlan, orientations: PairOrientation[]) => {
  const copy = cloneProblem(problem);
  applyContraflow(copy, pairs, orientations);
  return copy;
};

describe('best contraflow, steady state', () => {
  it('equals brute force over every orientation subset and the pooled LP (glpk.js)', () => {
    fc.assert(
      fc.property(randomPlan(), (plan) => {
        const { problem, pairs } = plan;
        const all = pairs.map((_, i) => i);
        const result = bestSteadyContraflow(problem, pairs, all);
        let brute = 0;
        for (const o of allOrientations(pairs.length)) brute = Math.max(brute, steadyThroughput(oriented(plan, o)));
        expect(result.achievedVehPerHour).toBe(brute);
        expect(result.boundVehPerHour).toBe(brute);
        expect(result.method).toBe('exact');
        const pooled = cloneProblem(problem);
        poolPairs(pooled, pairs, all);
        expect(Math.round(steadyStateLpValue(glpk, pooled))).toBe(brute);
        // The reported corridors are the orientation that reaches it.
        const chosen = result.corridors.flatMap((c) => c.orientations);
        expect(steadyThroughput(oriented(plan, chosen))).toBe(brute);
      }),
      { numRuns: 60 },
    );
  }, 60_000);

  it('with at most k corridors stays within the brute-force best for k corridors and the pooled bound', () => {
    fc.assert(
      fc.property(randomPlan({ maxPairs: 5 }), fc.integer({ min: 0, max: 2 }), (plan, k) => {
        const { problem, pairs } = plan;
        const result = bestSteadyContraflow(problem, pairs, pairs.map((_, i) => i), { maxCorridors: k });
        let bestWithinK = 0;
        for (const o of allOrientations(pairs.length)) {
          if (groupCorridors(problem, pairs, o).length > k) continue;
          bestWithinK = Math.max(bestWithinK, steadyThroughput(oriented(plan, o)));
        }
        expect(result.corridors.length).toBeLessThanOrEqual(k);
        expect(result.achievedVehPerHour).toBe(steadyThroughput(oriented(plan, result.corridors.flatMap((c) => c.orientations))));
        expect(result.achievedVehPerHour).toBeLessThanOrEqual(bestWithinK);
        expect(bestWithinK).toBeLessThanOrEqual(result.boundVehPerHour);
        if (result.method === 'exact') expect(result.achievedVehPerHour).toBe(result.boundVehPerHour);
      }),
      { numRuns: 40 },
    );
  }, 60_000);

  it('a two-lane road whose inbound lane is idle: reversing it doubles the throughput (worked by hand)', () => {
    // 0 → 1 one lane each way, 10 per step each; everyone leaves from 0 towards the exit at 1.
    const plan: RandomPlan = {
      problem: {
        nodeCount: 2,
        roads: [
          { from: 0, to: 1, capacityVehPerHour: 600, travelTimeSeconds: 60, lanes: 1 },
          { from: 1, to: 0, capacityVehPerHour: 600, travelTimeSeconds: 60, lanes: 1 },
        ],
        zones: [{ id: 'z', entryNodes: [0], vehicles: 100 }],
        shelters: [{ id: 's', node: 1, capacityVehicles: null }],
        timeStepSeconds: 60,
        horizonSteps: 20,
      },
      pairs: [{ forward: 0, backward: 1 }],
    };
    const result = bestContraflow(plan.problem, plan.pairs);
    expect(result.steady.baseVehPerHour).toBe(600);
    expect(result.steady.achievedVehPerHour).toBe(1200);
    expect(result.steady.corridors).toEqual([{ orientations: [{ pair: 0, direction: 'forward' }], gainVehPerHour: 600 }]);
    // 100 vehicles at 10 per step, 1 step long: last departure step 9, arrival 10; reversed 20 per step: arrival 5.
    expect(result.timeExpanded!.base.clearanceStep).toBe(10);
    expect(result.timeExpanded!.chosen.clearanceStep).toBe(5);
    expect(result.timeExpanded!.gapSteps).toBe(0);
  });
});

describe.each(['explicit', 'implicit'] as const)('best contraflow, time-expanded, on the %s network', (layout) => {
  it('the pooled curve bounds every orientation (brute force), equals its glpk.js LP, and the chosen orientation is evaluated exactly', () => {
    fc.assert(
      fc.property(randomPlan({ maxPairs: 4, horizon: 10 }), (plan) => {
        const { problem, pairs } = plan;
        const result = bestContraflow(problem, pairs, { layout });
        const te = result.timeExpanded!;
        const pooled = cloneProblem(problem);
        poolPairs(pooled, pairs, pairs.map((_, i) => i));
        expect(te.bound.deliveredAtHorizon).toBe(Math.round(timeExpandedLpValue(glpk, pooled, problem.horizonSteps)));
        let bestDelivered = 0;
        for (const o of allOrientations(pairs.length)) {
          const c = evaluateCurve(oriented(plan, o));
          bestDelivered = Math.max(bestDelivered, c.deliveredAtHorizon);
          if (te.bound.clearanceStep !== null && c.clearanceStep !== null) expect(c.clearanceStep).toBeGreaterThanOrEqual(te.bound.clearanceStep);
        }
        expect(bestDelivered).toBeLessThanOrEqual(te.bound.deliveredAtHorizon);
        const exact = evaluateCurve(oriented(plan, te.chosen.orientations));
        expect(te.chosen.clearanceStep).toBe(exact.clearanceStep);
        expect(te.chosen.deliveredAtHorizon).toBe(exact.deliveredAtHorizon);
        expect(te.gapVehicles).toBe(te.bound.deliveredAtHorizon - exact.deliveredAtHorizon);
        expect(te.gapVehicles).toBeGreaterThanOrEqual(0);
      }),
      { numRuns: 25 },
    );
  }, 60_000);
});

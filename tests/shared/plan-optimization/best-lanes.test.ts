// The best k added lanes: the exact mixed-integer program (glpk.js) must equal an exhaustive
// search over every allocation of lanes within the budget, each evaluated by a fresh maximum
// flow; the greedy answer never exceeds the LP relaxation's bound, and neither does the MIP.
import fc from 'fast-check';
import { beforeAll, describe, expect, it } from 'vitest';
import { bestLaneImprovements, cloneProblem, steadyThroughput, type LinearSolver } from '../../../shared/plan-optimization';
import { laneCapacity } from '../../../shared/flow';
import { glpkSolver } from '../../../server/optimization/glpk-solver';
import { loadGlpk } from '../flow/support/glpk';
import { randomPlan } from './support/random-plans';
import type { EvacuationProblem } from '../../../shared/flow';

let solver: LinearSolver;
beforeAll(async () => {
  solver = glpkSolver(await loadGlpk());
});

/** Best throughput over every way to add at most `budget` lanes (≤ maxLanes per road). */
function exhaustive(problem: EvacuationProblem, budget: number, maxLanes: number): number {
  const roads = problem.roads.map((_, e) => e).filter((e) => Math.floor(laneCapacity(problem.roads[e]!) + 1e-9) > 0);
  let best = 0;
  const lanes = new Array<number>(roads.length).fill(0);
  const visit = (i: number, left: number): void => {
    if (i === roads.length) {
      const copy = cloneProblem(problem);
      roads.forEach((e, k) => {
        copy.roads[e]!.capacityVehPerHour += lanes[k]! * Math.floor(laneCapacity(problem.roads[e]!) + 1e-9);
      });
      best = Math.max(best, steadyThroughput(copy));
      return;
    }
    for (let n = 0; n <= Math.min(maxLanes, left); n++) {
      lanes[i] = n;
      visit(i + 1, left - n);
    }
    lanes[i] = 0;
  };
  visit(0, budget);
  return best;
}

describe('best k added lanes', () => {
  it('the MIP equals exhaustive search; greedy and MIP never exceed the LP bound', () => {
    fc.assert(
      fc.property(randomPlan({ maxPairs: 3 }), fc.integer({ min: 0, max: 3 }), ({ problem }, budget) => {
        const mip = bestLaneImprovements(problem, { budget, maxLanesPerRoad: 2 }, solver);
        const brute = exhaustive(problem, budget, 2);
        expect(mip.achievedVehPerHour).toBe(brute);
        if (budget > 0 && mip.picks.length > 0) expect(mip.method).toBe('mip');
        expect(mip.spent).toBeLessThanOrEqual(budget);
        const greedy = bestLaneImprovements(problem, { budget, maxLanesPerRoad: 2, method: 'greedy' }, solver);
        expect(greedy.achievedVehPerHour).toBeLessThanOrEqual(brute);
        if (greedy.boundVehPerHour !== null) {
          expect(greedy.achievedVehPerHour).toBeLessThanOrEqual(greedy.boundVehPerHour);
          expect(brute).toBeLessThanOrEqual(greedy.boundVehPerHour);
        }
        // Each step's figure is an exact re-evaluation: the last one equals a fresh solve.
        for (const answer of [mip, greedy]) {
          const copy = cloneProblem(problem);
          for (const pick of answer.picks) copy.roads[pick.road]!.capacityVehPerHour += pick.addedVehPerHour;
          expect(steadyThroughput(copy)).toBe(answer.achievedVehPerHour);
          const sum = answer.steps.reduce((s, step) => s + step.gainVehPerHour, answer.baseVehPerHour);
          expect(sum).toBe(answer.achievedVehPerHour);
        }
      }),
      { numRuns: 40 },
    );
  }, 60_000);

  it('two roads in series need a lane each: greedy stops, the MIP finds both (worked by hand)', () => {
    // Two parallel routes 0→1→3 and 0→2→3, each road 10/step, one lane; one lane on 0→1 alone gains nothing.
    const road = (from: number, to: number) => ({ from, to, capacityVehPerHour: 600, travelTimeSeconds: 60, lanes: 1 });
    const problem: EvacuationProblem = {
      nodeCount: 4,
      roads: [road(0, 1), road(1, 3), road(0, 2), road(2, 3)],
      zones: [{ id: 'z', entryNodes: [0], vehicles: 100 }],
      shelters: [{ id: 's', node: 3, capacityVehicles: null }],
      timeStepSeconds: 60,
      horizonSteps: 20,
    };
    const mip = bestLaneImprovements(problem, { budget: 2, maxLanesPerRoad: 1 }, solver);
    expect(mip.baseVehPerHour).toBe(1200);
    expect(mip.achievedVehPerHour).toBe(1800);
    expect(mip.exact).toBe(true);
    const greedy = bestLaneImprovements(problem, { budget: 2, maxLanesPerRoad: 1, method: 'greedy' }, solver);
    expect(greedy.achievedVehPerHour).toBe(1200);
    expect(greedy.boundVehPerHour).toBe(1800);
    expect(greedy.exact).toBe(false);
  });
});

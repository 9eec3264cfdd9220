// The fix ranking against glpk.js: each reported gain must equal the steady-state LP optimum of
// the problem with that fix applied (one more lane, or the closure lifted) minus the original
// optimum, and roads outside the ranking must gain nothing from a lane.
import fc from 'fast-check';
import { beforeAll, describe, expect, it } from 'vitest';
import { laneCapacity, solveEvacuation, type EvacuationProblem } from '../../../shared/flow';
import { steadyStateLpValue } from './support/evacuation-lp';
import { loadGlpk, type Glpk } from './support/glpk';
import { randomEvacuation } from './support/random-evacuations';

let glpk: Glpk;
beforeAll(async () => {
  glpk = await loadGlpk();
});

const withFix = (problem: EvacuationProblem, road: number, kind: 'add-lane' | 'reopen'): EvacuationProblem => ({
  ...problem,
  roads: problem.roads.map((r, e) => {
    if (e !== road) return r;
    if (kind === 'reopen') return { ...r, closures: (r.closures ?? []).filter((c) => !(c.fromSeconds <= 0 && 0 < (c.untilSeconds ?? Infinity))) };
    return { ...r, capacityVehPerHour: r.capacityVehPerHour + Math.floor(laneCapacity(r)) };
  }),
});

describe('most valuable fix', () => {
  it('each gain equals the LP difference, and other roads gain nothing', () => {
    fc.assert(
      fc.property(randomEvacuation({ maxRoads: 8 }), (problem) => {
        const result = solveEvacuation(problem);
        const before = steadyStateLpValue(glpk, problem);
        if (before >= 1e9) return; // unbounded steady state: no fixes are ranked
        for (const fix of result.fixes) {
          const after = steadyStateLpValue(glpk, withFix(problem, fix.road, fix.kind));
          expect(fix.gainVehPerHour).toBe(Math.round(Math.min(after, 1e9) - before));
        }
        const ranked = new Set(result.fixes.map((f) => f.road));
        problem.roads.forEach((road, e) => {
          if (ranked.has(e) || (road.closures ?? []).some((c) => c.fromSeconds <= 0 && 0 < (c.untilSeconds ?? Infinity))) return;
          expect(Math.round(steadyStateLpValue(glpk, withFix(problem, e, 'add-lane')) - before)).toBe(0);
        });
        for (let k = 1; k < result.fixes.length; k++) expect(result.fixes[k - 1]!.gainVehPerHour).toBeGreaterThanOrEqual(result.fixes[k]!.gainVehPerHour);
      }),
      { numRuns: 150, seed: 26 },
    );
  }, 60_000);
});

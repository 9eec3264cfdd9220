// Outside reference: the time-expanded evacuation model of docs/model.md §1 written directly as a
// linear program (support/evacuation-lp.ts, which shares no code with the engine) and solved by
// glpk.js at every horizon t. The engine's curve, computed incrementally by every algorithm, must
// match it exactly, and every flow it returns must pass verify().
import fc from 'fast-check';
import { beforeAll, describe, expect, it } from 'vitest';
import { solveEvacuation } from '../../../shared/flow';
import { referenceTravelSteps, steadyStateLpValue, timeExpandedLpValue } from './support/evacuation-lp';
import { loadGlpk, type Glpk } from './support/glpk';
import { randomEvacuation } from './support/random-evacuations';

let glpk: Glpk;
beforeAll(async () => {
  glpk = await loadGlpk();
});

describe('time-expanded evacuation model against glpk.js', () => {
  it('matches the LP at every horizon, with closures, storage, departures, rates and shelter limits', () => {
    fc.assert(
      fc.property(randomEvacuation(), (problem) => {
        const result = solveEvacuation(problem, { verify: true });
        expect(result.verification).toEqual({ ok: true, problems: [] });
        // Travel steps by the rounding against node time potentials (zero-step roads included),
        // computed by the support's own implementation of the rule.
        const steps = referenceTravelSteps(problem);
        expect(result.plan.roads.travelSteps).toEqual(steps);
        for (let t = 0; t <= problem.horizonSteps; t++) {
          expect(result.curve.deliveredVehiclesByStep[t]).toBe(Math.round(timeExpandedLpValue(glpk, problem, t, steps)));
        }
        // The LP's stand-in for "no limit" is 1e9: a larger optimum means an unbounded steady state.
        const steady = steadyStateLpValue(glpk, problem);
        expect(result.steadyState.unbounded).toBe(steady >= 1e9);
        if (steady < 1e9) expect(result.steadyState.throughputVehPerHour).toBe(Math.round(steady));
      }),
      { numRuns: 200, seed: 1982 },
    );
  }, 120_000);

  it('gives the same curve with every algorithm (incremental trees and warm restarts alike)', () => {
    fc.assert(
      fc.property(randomEvacuation({ maxNodes: 6, maxRoads: 14, maxHorizon: 10 }), (problem) => {
        const reference = solveEvacuation(problem, { algorithm: 'edmonds-karp', verify: true });
        expect(reference.verification?.ok).toBe(true);
        for (const algorithm of ['dinic', 'push-relabel', 'boykov-kolmogorov', 'incremental-bfs'] as const) {
          const other = solveEvacuation(problem, { algorithm, verify: true });
          expect(other.verification).toEqual({ ok: true, problems: [] });
          expect(other.curve).toEqual(reference.curve);
          expect(other.steadyState.throughputVehPerHour).toBe(reference.steadyState.throughputVehPerHour);
          expect(other.steadyState.cutRoads).toEqual(reference.steadyState.cutRoads);
          expect(other.bottlenecks.cutCapacityVehicles).toBe(reference.bottlenecks.cutCapacityVehicles);
          expect(other.fixes.map((f) => [f.road, f.gainVehPerHour])).toEqual(reference.fixes.map((f) => [f.road, f.gainVehPerHour]));
        }
      }),
      { numRuns: 120, seed: 2011 },
    );
  }, 120_000);
});

// The plan returned with the curve is one maximum flow of the final horizon. The curve gives the
// most vehicles deliverable by each step (checked against glpk.js elsewhere); the plan's own
// arrivals by step are reported beside it, never above it, and the plan is flagged
// earliest-arrival exactly when they match at every step. With one shelter an earliest-arrival
// flow exists (Baumann & Skutella 2009: many sources, one sink), and augmenting by simple paths
// never takes back an arrival there, so the plan must be earliest-arrival.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { solveEvacuation } from '../../../shared/flow';
import { randomEvacuation } from './support/random-evacuations';

describe('the plan beside the curve', () => {
  it('never delivers more than the curve, ends on it, and is flagged earliest-arrival exactly when it matches', () => {
    fc.assert(
      fc.property(
        randomEvacuation({ maxNodes: 6, maxHorizon: 10 }),
        fc.tuple(fc.integer({ min: 1, max: 8 }), fc.integer({ min: 1, max: 8 })),
        (problem, [a, b]) => {
          // Two shelters whose totals bind.
          const withLimits = {
            ...problem,
            shelters: [
              { id: 'a', node: problem.nodeCount - 1, capacityVehicles: a },
              { id: 'b', node: 0, capacityVehicles: b },
            ],
          };
          const result = solveEvacuation(withLimits);
          const curve = result.curve.deliveredVehiclesByStep;
          const plan = result.plan.deliveredVehiclesByStep;
          expect(plan).toHaveLength(curve.length);
          plan.forEach((d, t) => expect(d).toBeLessThanOrEqual(curve[t]!));
          expect(plan[result.plan.horizonStep]).toBe(curve[result.plan.horizonStep]);
          expect(plan.at(-1)).toBe(result.plan.deliveredVehicles);
          expect(result.plan.earliestArrival).toBe(plan.every((d, t) => d === curve[t]));
        },
      ),
      { numRuns: 400, seed: 400 },
    );
  }, 120_000);

  it('with a single shelter the plan is earliest-arrival', () => {
    fc.assert(
      fc.property(randomEvacuation({ maxNodes: 6, maxHorizon: 10 }), (problem) => {
        const single = { ...problem, shelters: problem.shelters.slice(0, 1) };
        const result = solveEvacuation(single);
        expect(result.plan.deliveredVehiclesByStep).toEqual(result.curve.deliveredVehiclesByStep);
        expect(result.plan.earliestArrival).toBe(true);
      }),
      { numRuns: 300, seed: 2009 },
    );
  }, 120_000);
});

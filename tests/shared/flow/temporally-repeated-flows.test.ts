// Ford & Fulkerson (1958), "Constructing maximal dynamic flows from static flows", Operations
// Research 6(3): with one source and one sink and no supply limits, the maximum dynamic flow
// equals the best temporally repeated static flow. Under the discrete convention of docs/model.md §1
// (a path of length L carries departures at steps 0..t − L) that value is
//     max over static flows x of (t + 1)·|x| − Σ_e τ_e·x_e,
// a minimum-cost flow problem that glpk.js solves as a linear program. The engine's evacuation
// curve, built on the time-expanded network, must match it at every horizon t.
import fc from 'fast-check';
import { beforeAll, describe, expect, it } from 'vitest';
import { solveEvacuation, type EvacuationProblem } from '../../../shared/flow';
import { loadGlpk, solveFlowLp, type Glpk } from './support/glpk';

let glpk: Glpk;
beforeAll(async () => {
  glpk = await loadGlpk();
});

const STEP = 60;
const dynamicInstance = fc.integer({ min: 2, max: 7 }).chain((nodeCount) => {
  const node = fc.integer({ min: 0, max: nodeCount - 1 });
  return fc.record({
    nodeCount: fc.constant(nodeCount),
    arcs: fc.array(
      fc.record({ from: node, to: node, capacity: fc.integer({ min: 0, max: 6 }), steps: fc.integer({ min: 1, max: 3 }) }),
      { maxLength: 16 },
    ),
    horizon: fc.integer({ min: 0, max: 9 }),
  });
});

describe('Ford & Fulkerson 1958 temporally repeated flows', () => {
  it('the time-expanded curve equals (t + 1)·|x| − Σ τ·x of the best static flow, for every t', () => {
    fc.assert(
      fc.property(dynamicInstance, ({ nodeCount, arcs, horizon }) => {
        const source = 0;
        const sink = nodeCount - 1;
        const problem: EvacuationProblem = {
          nodeCount,
          timeStepSeconds: STEP,
          horizonSteps: horizon,
          // capacity c per step is c·3600/Δ veh/h; τ steps is τ·Δ seconds.
          roads: arcs.map((a) => ({ from: a.from, to: a.to, capacityVehPerHour: (a.capacity * 3600) / STEP, travelTimeSeconds: a.steps * STEP })),
          // Supply far above anything the roads can carry: no supply limit.
          zones: [{ id: 'source', entryNodes: [source], vehicles: 1_000_000 }],
          shelters: [{ id: 'sink', node: sink, capacityVehicles: null }],
        };
        const result = solveEvacuation(problem, { verify: true });
        expect(result.verification).toEqual({ ok: true, problems: [] });
        for (let t = 0; t <= horizon; t++) {
          const lp = solveFlowLp(
            glpk,
            nodeCount,
            arcs.map((a) => ({ from: a.from, to: a.to, capacity: a.capacity, cost: a.steps })),
            source,
            sink,
            t + 1,
          );
          expect(result.curve.deliveredVehiclesByStep[t]).toBe(Math.round(lp.value));
        }
      }),
      { numRuns: 120, seed: 1958 },
    );
  });

  it('a single path of length L carries t − L + 1 departures (docs/model.md §1)', () => {
    const problem: EvacuationProblem = {
      nodeCount: 3,
      timeStepSeconds: STEP,
      horizonSteps: 10,
      roads: [
        { from: 0, to: 1, capacityVehPerHour: 60, travelTimeSeconds: 2 * STEP },
        { from: 1, to: 2, capacityVehPerHour: 60, travelTimeSeconds: 3 * STEP },
      ],
      zones: [{ id: 'z', entryNodes: [0], vehicles: 100 }],
      shelters: [{ id: 's', node: 2, capacityVehicles: null }],
    };
    const curve = solveEvacuation(problem).curve.deliveredVehiclesByStep;
    expect(curve).toEqual([0, 0, 0, 0, 0, 1, 2, 3, 4, 5, 6]);
  });
});

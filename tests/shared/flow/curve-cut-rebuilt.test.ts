// The curve no longer copies the residual after every horizon: the resumable solvers log each arc
// pair's residual before the horizon's first change to it, and the residual of the horizon before
// clearance is rebuilt from the final one at the end (shared/flow/residual-undo-log.ts). The
// rebuilt residual must be exactly the one a copy taken at that horizon holds (asked for with an
// explicit cut horizon, which copies), and a maximum flow whose cut equals the curve there
// (max-flow/min-cut, checked by verify()). The delivered count, now a running sum of the flow
// each horizon adds, must equal the net flow out of the source (recounted here).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  arcFlows,
  computeEvacuationCurve,
  createFlowState,
  expandOverTime,
  minimumCut,
  netOutflow,
  nodeLimitAtHorizon,
  verify,
  type MaxFlowAlgorithm,
} from '../../../shared/flow';
import { randomEvacuation } from './support/random-evacuations';

describe.each(['incremental-bfs', 'boykov-kolmogorov'] as MaxFlowAlgorithm[])('the curve with %s', (algorithm) => {
  it('rebuilds the residual before clearance exactly as a copy at that horizon holds it', () => {
    let rebuilt = 0;
    fc.assert(
      fc.property(randomEvacuation({ maxNodes: 7, maxRoads: 16, maxHorizon: 16 }), (problem) => {
        const expanded = expandOverTime(problem);
        const demand = problem.zones.reduce((s, z) => s + z.vehicles, 0);
        const state = createFlowState(expanded.network);
        const curve = computeEvacuationCurve(expanded, demand, state, { algorithm });
        // Running sums against a recount at every horizon's limit (the final flow restricted to
        // the horizon is not that horizon's flow, so recount on a replay with explicit cuts).
        const { network, source, sink } = expanded;
        const finalLimit = nodeLimitAtHorizon(expanded, curve.finalHorizon);
        expect(curve.deliveredByStep[curve.finalHorizon]).toBe(netOutflow(network, state, source, finalLimit));
        if (curve.clearanceStep === null || curve.clearanceStep === 0) return;
        rebuilt++;
        const c = curve.clearanceStep - 1;
        expect(curve.cutHorizon).toBe(c);
        const copied = computeEvacuationCurve(expanded, demand, createFlowState(network), { algorithm, cutHorizon: c });
        expect(copied.cutHorizon).toBe(c);
        const cutResidual = curve.takeCutResidual();
        // Rebuilt in place: the state now holds the flow of the horizon before clearance.
        expect(cutResidual).toBe(state.residual);
        expect(Array.from(cutResidual)).toEqual(Array.from(copied.takeCutResidual()));
        const limit = nodeLimitAtHorizon(expanded, c);
        const report = verify(network, {
          source,
          sink,
          nodeLimit: limit,
          value: curve.deliveredByStep[c]!,
          flow: arcFlows(network, { residual: cutResidual }),
          minCut: minimumCut(network, cutResidual, source, limit),
        });
        expect(report.problems).toEqual([]);
        expect(netOutflow(network, { residual: cutResidual }, source, limit)).toBe(curve.deliveredByStep[c]);
      }),
      { numRuns: 500, seed: 1405 },
    );
    // Enough instances clear within the horizon for the check to mean something.
    expect(rebuilt).toBeGreaterThan(30);
  }, 120_000);
});

// Each search over time on both layouts of the time-expanded network, the written-out one
// (time-expanded.ts) and the implicit one (implicit-expanded.ts, used where the written-out one
// would not fit the run budget): on the same small problems they must give the same answer,
// schedule and routes included. Each search's answer on either layout is also checked against
// outside references in its own test file (glpk.js LPs, brute force, Ford & Fulkerson's
// temporally repeated flows, fresh solves with the road closed).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { bestContraflow, bestReleaseOrder, forEachFlowPath, forEachImplicitPath, evaluateCurve, implicitCurve, rankClosures, zoneRoutes, type ExpandedPath } from '../../../shared/plan-optimization';
import { randomPlan } from './support/random-plans';

const withoutLayout = <T extends { clearanceLayout: unknown }>(ranking: T) => ({ ...ranking, clearanceLayout: null });
const summary = (path: ExpandedPath) => ({ ...path, arcs: path.arcs.length });

describe('searches over time on both layouts of the time-expanded network', () => {
  it('the same flow paths, quickest departure order, zone routes, contraflow over time and closures’ clearance', () => {
    fc.assert(
      fc.property(randomPlan({ maxPairs: 5, horizon: 14 }), fc.integer({ min: 0, max: 3 }), ({ problem, pairs }, closeStep) => {
        const explicitPaths: ReturnType<typeof summary>[] = [];
        const curve = evaluateCurve(problem);
        forEachFlowPath(curve.expanded, curve.state, (p) => explicitPaths.push(summary(p)));
        const implicitPaths: ReturnType<typeof summary>[] = [];
        const plan = implicitCurve(problem);
        const before = plan.residual.slice();
        forEachImplicitPath(plan.net, plan.residual, (p) => implicitPaths.push(summary(p)), { withArcs: true });
        expect(implicitPaths).toEqual(explicitPaths);
        expect(plan.residual).toEqual(before); // the walk puts the flow back
        expect(plan.clearanceStep).toBe(curve.clearanceStep);
        expect(plan.deliveredByStep).toEqual(curve.deliveredByStep);

        expect(bestReleaseOrder(problem, { layout: 'implicit' })).toEqual(bestReleaseOrder(problem, { layout: 'explicit' }));
        expect(zoneRoutes(problem, { layout: 'implicit' })).toEqual(zoneRoutes(problem, { layout: 'explicit' }));
        expect(bestContraflow(problem, pairs, { layout: 'implicit' })).toEqual(bestContraflow(problem, pairs, { layout: 'explicit' }));
        const closures = { closeAtSeconds: closeStep * problem.timeStepSeconds, maxClearanceTests: 1000 };
        const implicit = rankClosures(problem, { ...closures, layout: 'implicit' });
        const explicit = rankClosures(problem, { ...closures, layout: 'explicit' });
        expect(implicit.clearanceLayout).toBe('implicit');
        expect(explicit.clearanceLayout).toBe('explicit');
        expect(withoutLayout(implicit)).toEqual(withoutLayout(explicit));
      }),
      { numRuns: 60 },
    );
  }, 120_000);
});

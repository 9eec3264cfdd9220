// The implicit time-expanded network (shared/flow/implicit-expanded.ts) against the explicit one
// (time-expanded.ts), which is the oracle here: on random problems with closures, storage,
// departure schedules, release rates and shelter intake and totals, the implicit layout must list
// exactly the explicit arcs, with the same ends, mates and capacities, node by node in the same
// order; and incremental BFS on it (implicit-incremental-bfs.ts) must find the very same flow as
// incremental BFS on the explicit layout at every horizon, so every read-out (road use, trips, the
// cut) is the same. The curve itself is checked against glpk.js in time-expanded-lp.test.ts, and
// solveEvacuation's answers against the explicit network with Edmonds–Karp below.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  arcCapacity,
  computeEvacuationCurve,
  createFlowState,
  decomposeTrips,
  expandOverTime,
  roadUsage,
  solveEvacuation,
  timeExpandedBottlenecks,
} from '../../../shared/flow';
import { computeImplicitCurve } from '../../../shared/flow/implicit-curve';
import { ImplicitExpandedNetwork } from '../../../shared/flow/implicit-expanded';
import { implicitBottlenecks, implicitDecomposeTrips, implicitRoadUsage, verifyImplicit } from '../../../shared/flow/implicit-readout';
import { randomEvacuation } from './support/random-evacuations';

const demandOf = (problem: { zones: readonly { vehicles: number }[] }): number => problem.zones.reduce((s, z) => s + z.vehicles, 0);

describe('the implicit time-expanded network', () => {
  it('lists the explicit arcs, node by node in the same order, with the same ends, mates and capacities', () => {
    fc.assert(
      fc.property(randomEvacuation({ maxNodes: 7, maxRoads: 10, maxHorizon: 10 }), fc.boolean(), (problem, prune) => {
        const explicit = expandOverTime(problem, { prune });
        const implicit = new ImplicitExpandedNetwork(problem, { prune });
        const { network } = explicit;
        expect(implicit.nodeCount).toBe(network.nodeCount);
        expect(implicit.arcCount).toBe(network.arcCount);
        const toImplicit = new Int32Array(2 * network.arcCount).fill(-1);
        const fresh = implicit.createResidual();
        let visited = 0;
        implicit.forEachArc((i, forward, backward) => {
          visited++;
          const r = network.residualOfArc[i]!;
          toImplicit[r] = forward;
          toImplicit[network.mate[r]!] = backward;
          expect(implicit.mateOf(forward)).toBe(backward);
          expect(implicit.mateOf(backward)).toBe(forward);
          expect(implicit.headOf(forward)).toBe(network.head[r]);
          expect(implicit.headOf(backward)).toBe(network.head[network.mate[r]!]);
          expect(fresh[forward]).toBe(arcCapacity(network, i));
          expect(fresh[backward]).toBe(0);
        });
        expect(visited).toBe(network.arcCount);
        const arcs = new Int32Array(implicit.maxDegree + 1);
        for (let u = 0; u < network.nodeCount; u++) {
          const count = implicit.arcsOf(u, arcs);
          const expected: number[] = [];
          for (let r = network.firstOut[u]!; r < network.firstOut[u + 1]!; r++) expected.push(toImplicit[r]!);
          expect(Array.from(arcs.subarray(0, count))).toEqual(expected);
        }
      }),
      { numRuns: 200, seed: 1411 },
    );
  }, 120_000);

  it('gives incremental BFS the same flow at every horizon, and the same read-outs and cut', () => {
    let cleared = 0;
    fc.assert(
      fc.property(randomEvacuation({ maxNodes: 8, maxRoads: 10, maxHorizon: 14 }), (problem) => {
        const demand = demandOf(problem);
        const explicit = expandOverTime(problem);
        const state = createFlowState(explicit.network);
        const a = computeEvacuationCurve(explicit, demand, state, { algorithm: 'incremental-bfs' });
        const implicit = new ImplicitExpandedNetwork(problem);
        const residual = implicit.createResidual();
        const b = computeImplicitCurve(implicit, demand, residual);
        expect(b.deliveredByStep).toEqual(a.deliveredByStep);
        expect(b.clearanceStep).toBe(a.clearanceStep);
        expect(b.cutHorizon).toBe(a.cutHorizon);
        expect(b.stats.augmentations).toBe(a.stats.augmentations);
        if (a.clearanceStep !== null) cleared++;
        // The very same flow, arc by arc.
        expect(Array.from(residual)).toEqual(Array.from(implicit.residualFromExplicit(explicit, state.residual)));
        expect(implicitRoadUsage(implicit, residual, problem.roads.length)).toEqual(roadUsage(explicit, state, problem.roads.length));
        const roads = {
          from: problem.roads.map((r) => r.from),
          to: problem.roads.map((r) => r.to),
          travelTimeSeconds: problem.roads.map((r) => r.travelTimeSeconds),
        };
        expect(implicitDecomposeTrips(implicit, residual, problem.zones.length, problem.shelters.length, roads)).toEqual(
          decomposeTrips(explicit, state, problem.zones.length, problem.shelters.length, roads),
        );
        expect(verifyImplicit(implicit, residual, a.finalHorizon, a.deliveredByStep[a.finalHorizon]!)).toEqual({ ok: true, problems: [] });
        const cutA = a.takeCutResidual();
        const cutB = b.takeCutResidual();
        expect(Array.from(cutB)).toEqual(Array.from(implicit.residualFromExplicit(explicit, cutA)));
        expect(implicitBottlenecks(implicit, cutB, b.cutHorizon)).toEqual(timeExpandedBottlenecks(explicit, cutA, a.cutHorizon));
        expect(verifyImplicit(implicit, cutB, b.cutHorizon, b.deliveredByStep[b.cutHorizon]!)).toEqual({ ok: true, problems: [] });
      }),
      { numRuns: 400, seed: 1412 },
    );
    expect(cleared).toBeGreaterThan(50);
  }, 180_000);

  it('gives solveEvacuation the answers of Edmonds–Karp on the explicit network', () => {
    fc.assert(
      fc.property(randomEvacuation({ maxNodes: 7, maxRoads: 9, maxHorizon: 10 }), (problem) => {
        const ours = solveEvacuation(problem, { verify: true });
        const reference = solveEvacuation(problem, { verify: true, algorithm: 'edmonds-karp' });
        expect(ours.verification).toEqual({ ok: true, problems: [] });
        expect(reference.verification).toEqual({ ok: true, problems: [] });
        expect(ours.curve).toEqual(reference.curve);
        expect(ours.bottlenecks).toEqual(reference.bottlenecks);
        expect(ours.stats.timeExpandedNetwork).toEqual(reference.stats.timeExpandedNetwork);
      }),
      { numRuns: 150, seed: 1413 },
    );
  }, 180_000);

  it('finds a flow that breaks conservation or a bound', () => {
    const problem = {
      nodeCount: 2,
      timeStepSeconds: 60,
      horizonSteps: 6,
      roads: [{ from: 0, to: 1, capacityVehPerHour: 120, travelTimeSeconds: 120 }],
      zones: [{ id: 'z', entryNodes: [0], vehicles: 5 }],
      shelters: [{ id: 's', node: 1, capacityVehicles: null }],
    };
    const implicit = new ImplicitExpandedNetwork(problem);
    const residual = implicit.createResidual();
    const curve = computeImplicitCurve(implicit, 5, residual);
    expect(verifyImplicit(implicit, residual, curve.finalHorizon, 5).ok).toBe(true);
    // One unit more on the first road copy: its tail no longer balances and it exceeds nothing yet.
    const forward = implicit.forwardArc(0, implicit.slotKind.indexOf(0));
    residual[forward]! -= 1;
    residual[implicit.mateOf(forward)]! += 1;
    const report = verifyImplicit(implicit, residual, curve.finalHorizon, 5);
    expect(report.ok).toBe(false);
    expect(report.problems.some((p) => p.includes('inflow − outflow'))).toBe(true);
  });
});

// Small random evacuation problems for the optimisation checks: two-way roads (pairs), some
// one-way roads, zones and exits. Capacities are whole vehicles per one-minute step.
import fc from 'fast-check';
import type { EvacuationProblem } from '../../../../shared/flow';

export const STEP_SECONDS = 60;

export interface RandomPlan {
  problem: EvacuationProblem;
  /** Road pairs (forward, backward) in road order. */
  pairs: { forward: number; backward: number }[];
}

export const randomPlan = (options: { maxPairs?: number; horizon?: number; maxVehicles?: number } = {}): fc.Arbitrary<RandomPlan> =>
  fc.integer({ min: 3, max: 6 }).chain((nodeCount) => {
    const node = fc.integer({ min: 0, max: nodeCount - 1 });
    const perStep = fc.integer({ min: 0, max: 5 });
    const steps = fc.integer({ min: 1, max: 3 });
    return fc.record({
      nodeCount: fc.constant(nodeCount),
      twoWay: fc.array(fc.record({ a: node, b: node, capAB: perStep, capBA: perStep, steps }), { minLength: 1, maxLength: options.maxPairs ?? 5 }),
      oneWay: fc.array(fc.record({ a: node, b: node, cap: perStep, steps }), { maxLength: 3 }),
      vehicles: fc.integer({ min: 1, max: options.maxVehicles ?? 40 }),
      secondZone: fc.option(fc.record({ node, vehicles: fc.integer({ min: 1, max: 20 }) }), { nil: undefined }),
      horizon: fc.integer({ min: 3, max: options.horizon ?? 14 }),
    });
  }).map(({ nodeCount, twoWay, oneWay, vehicles, secondZone, horizon }) => {
    const roads: EvacuationProblem['roads'] = [];
    const pairs: RandomPlan['pairs'] = [];
    const perHour = (c: number) => (c * 3600) / STEP_SECONDS;
    for (const r of twoWay) {
      if (r.a === r.b) continue;
      pairs.push({ forward: roads.length, backward: roads.length + 1 });
      roads.push({ from: r.a, to: r.b, capacityVehPerHour: perHour(r.capAB), travelTimeSeconds: r.steps * STEP_SECONDS, lanes: 1 });
      roads.push({ from: r.b, to: r.a, capacityVehPerHour: perHour(r.capBA), travelTimeSeconds: r.steps * STEP_SECONDS, lanes: 1 });
    }
    for (const r of oneWay) {
      if (r.a === r.b) continue;
      roads.push({ from: r.a, to: r.b, capacityVehPerHour: perHour(r.cap), travelTimeSeconds: r.steps * STEP_SECONDS, lanes: 1 });
    }
    const zones: EvacuationProblem['zones'] = [{ id: 'z0', entryNodes: [0], vehicles }];
    if (secondZone && secondZone.node !== nodeCount - 1) zones.push({ id: 'z1', entryNodes: [secondZone.node], vehicles: secondZone.vehicles });
    return {
      problem: {
        nodeCount,
        roads,
        zones,
        shelters: [{ id: 'exit', node: nodeCount - 1, capacityVehicles: null }],
        timeStepSeconds: STEP_SECONDS,
        horizonSteps: horizon,
      },
      pairs,
    };
  });

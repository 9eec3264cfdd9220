// The stored result carries the model's trip-time error (RunResult.routeTiming) with zone and
// shelter names, and past one step the step it suggests really brings the error within one present
// step: checked by solving again at that step. Free-flow times here are worked by hand (roads of
// 100 m at 50 km/h take 7.2 s); the engine's own figures are checked against Dijkstra in
// tests/shared/flow/route-timing.test.ts.
import { describe, expect, it } from 'vitest';
import { solveEvacuation, type EvacuationProblem, type EvacuationRoad } from '../../shared/flow';
import type { RunInput } from '../../shared/model/run-input';
import { toRunResult } from '../../server/run-execution/to-run-result';
import { runResultSchema } from '../../shared/api/runs';

/** A two-way row of `n` junctions 100 m apart at 50 km/h (7.2 s a road). */
function row(n: number): EvacuationRoad[] {
  const roads: EvacuationRoad[] = [];
  for (let x = 0; x + 1 < n; x++) {
    roads.push({ from: x, to: x + 1, capacityVehPerHour: 600, travelTimeSeconds: 7.2 });
    roads.push({ from: x + 1, to: x, capacityVehPerHour: 600, travelTimeSeconds: 7.2 });
  }
  return roads;
}

function runInput(problem: EvacuationProblem): RunInput {
  return {
    problem,
    algorithm: 'auto',
    roadOrigins: problem.roads.map((_, e) => ({ segment: e >> 1, direction: e % 2 === 0 ? 'forward' : 'backward' })),
    segments: problem.roads.filter((_, e) => e % 2 === 0).map((_, i) => ({ id: 100 + i, name: `Street ${i}`, roadClass: 'residential' })),
    zones: problem.zones.map((z, i) => ({ id: 10 + i, name: `Zone ${z.id}`, vehicles: z.vehicles, persons: 2 * z.vehicles })),
    shelters: problem.shelters.map((s, i) => ({ id: 20 + i, name: `Exit ${s.id}`, capacityPersons: null, capacityVehicles: null })),
    personsPerVehicleAtShelters: 2,
  };
}

const stored = (problem: EvacuationProblem) => {
  const input = runInput(problem);
  return runResultSchema.parse(toRunResult(input, { result: solveEvacuation(problem), solveMs: 1, peakMemoryBytes: 1 }));
};

describe('the trip-time error in the stored result', () => {
  it('one zone, one exit: a trip of 20 roads (144 s) is modelled within one step, and no step is suggested', () => {
    const problem: EvacuationProblem = {
      nodeCount: 21,
      roads: row(21),
      zones: [{ id: 'a', entryNodes: [0], vehicles: 5 }],
      shelters: [{ id: 'b', node: 20, capacityVehicles: null }],
      timeStepSeconds: 60,
      horizonSteps: 10,
    };
    const t = stored(problem).routeTiming!;
    expect(t.timeStepSeconds).toBe(60);
    expect(t.pairs).toBe(1);
    expect(t.worst!.zoneName).toBe('Zone a');
    expect(t.worst!.shelterName).toBe('Exit b');
    expect(t.worst!.freeFlowSeconds).toBeCloseTo(20 * 7.2, 9);
    expect(t.largestSeconds).toBeLessThanOrEqual(60);
    expect(t.suggestedStepSeconds).toBeNull();
    // The plan's own routes (cutline-flow 1.4): its 5 vehicles drive the 20 roads, 2 steps (120 s)
    // against 144 s by the rounding against potentials, so 24 s off, all within one step.
    expect(t.plannedRoutes!.vehicles).toBe(5);
    expect(t.plannedRoutes!.largestSeconds).toBeCloseTo(24, 9);
    expect(t.plannedRoutes!.withinOneStepShare).toBe(1);
  });

  it('two zones between two exits: past one step, and the suggested step brings it within one present step', () => {
    const problem: EvacuationProblem = {
      nodeCount: 30,
      roads: row(30),
      zones: [
        { id: 'z1', entryNodes: [10], vehicles: 10 },
        { id: 'z2', entryNodes: [20], vehicles: 10 },
      ],
      shelters: [
        { id: 'west', node: 0, capacityVehicles: null },
        { id: 'east', node: 29, capacityVehicles: null },
      ],
      timeStepSeconds: 60,
      horizonSteps: 30,
    };
    const t = stored(problem).routeTiming!;
    expect(t.pairs).toBe(4);
    expect(t.largestSeconds).toBeGreaterThan(60);
    const w = t.worst!;
    // By hand: from zone node 10 or 20 to exit node 0 or 29 is 10, 19, 20 or 9 roads of 7.2 s.
    expect([10, 19, 20, 9].map((k) => k * 7.2).some((s) => Math.abs(s - w.freeFlowSeconds) < 1e-9)).toBe(true);
    expect(Math.abs(w.modelledSeconds - w.freeFlowSeconds)).toBeCloseTo(t.largestSeconds, 9);
    expect(t.suggestedStepSeconds).not.toBeNull();
    expect(t.suggestedStepSeconds!).toBeLessThan(60);
    const finer = stored({ ...problem, timeStepSeconds: t.suggestedStepSeconds!, horizonSteps: Math.ceil((30 * 60) / t.suggestedStepSeconds!) }).routeTiming!;
    expect(finer.largestSeconds).toBeLessThanOrEqual(60);
    // The step is also chosen for the plan's typical route, and brings that within one present step.
    expect(t.suggestedStepSeconds!).toBeLessThanOrEqual((60 * 60) / Math.max(t.largestSeconds, t.plannedRoutes!.typicalSeconds));
    expect(finer.plannedRoutes!.typicalSeconds).toBeLessThanOrEqual(60);
  });
});

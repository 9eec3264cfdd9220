// Where each zone goes: the per-zone decomposition must add up to the engine's own plan (road
// use and zone → shelter assignments of solveEvacuation), obey the flow decomposition theorem
// (each zone's delivered vehicles split exactly over its shelters), and match a case worked by
// hand.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { solveEvacuation, type EvacuationProblem } from '../../../shared/flow';
import { zoneRoutes } from '../../../shared/plan-optimization';
import { randomPlan } from './support/random-plans';

describe.each(['explicit', 'implicit'] as const)('zone routes on the %s time-expanded network', (layout) => {
  it('add up to the engine plan: road vehicles, assignments, delivered vehicles', () => {
    fc.assert(
      fc.property(randomPlan(), ({ problem }) => {
        const routes = zoneRoutes(problem, { layout });
        const engine = solveEvacuation(problem);
        const roadTotals = new Array<number>(problem.roads.length).fill(0);
        routes.zones.forEach((zone, z) => {
          expect(zone.shelters.reduce((s, x) => s + x.vehicles, 0)).toBe(zone.deliveredVehicles);
          expect(zone.deliveredVehicles).toBe(engine.plan.zones[z]!.deliveredVehicles);
          for (const r of zone.roads) roadTotals[r.road]! += r.vehicles;
          for (const a of engine.plan.assignments.filter((x) => x.zone === z)) {
            expect(zone.shelters.find((s) => s.shelter === problem.shelters[a.shelter]!.id)?.vehicles).toBe(a.vehicles);
          }
        });
        // A road used twice by one path (a loop) counts once per zone here; the engine counts entries.
        roadTotals.forEach((total, e) => expect(total).toBeLessThanOrEqual(engine.plan.roads.totalVehicles[e]!));
        expect(routes.clearanceStep).toBe(engine.curve.clearanceStep);
      }),
      { numRuns: 50 },
    );
  }, 60_000);
});

describe('zone routes', () => {
  it('two zones, two shelters (worked by hand)', () => {
    // Zone A at 0 → shelter at 2 via 0→2; zone B at 1 → exit at 3 via 1→3; no link between them.
    const problem: EvacuationProblem = {
      nodeCount: 4,
      roads: [
        { from: 0, to: 2, capacityVehPerHour: 300, travelTimeSeconds: 120 },
        { from: 1, to: 3, capacityVehPerHour: 600, travelTimeSeconds: 60 },
      ],
      zones: [
        { id: 'A', entryNodes: [0], vehicles: 20 },
        { id: 'B', entryNodes: [1], vehicles: 30 },
      ],
      shelters: [
        { id: 'school', node: 2, capacityVehicles: 100 },
        { id: 'exit', node: 3, capacityVehicles: null },
      ],
      timeStepSeconds: 60,
      horizonSteps: 20,
    };
    const routes = zoneRoutes(problem);
    // A: 5 per step, 2 steps: departures 0..3, arrivals 2..5. B: 10 per step, 1 step: departures 0..2, arrivals 1..3.
    expect(routes.zones[0]).toMatchObject({ zone: 'A', deliveredVehicles: 20, shelters: [{ shelter: 'school', vehicles: 20 }], mainRoads: [{ road: 0, vehicles: 20 }], departureWindow: { firstStep: 0, lastStep: 3 }, arrivalWindow: { firstStep: 2, lastStep: 5 } });
    expect(routes.zones[1]).toMatchObject({ zone: 'B', deliveredVehicles: 30, shelters: [{ shelter: 'exit', vehicles: 30 }], mainRoads: [{ road: 1, vehicles: 30 }], departureWindow: { firstStep: 0, lastStep: 2 }, arrivalWindow: { firstStep: 1, lastStep: 3 } });
    expect(routes.clearanceStep).toBe(5);
  });
});

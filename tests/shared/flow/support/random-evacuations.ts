// fast-check generators of small evacuation problems exercising every part of the model:
// closures (whole and partial steps), storage, departure schedules and curves, release rates,
// shelter capacities and intake rates. Zones sit on a random node and shelters anywhere, with a
// two-way chain of roads through all nodes so that most instances deliver something.
import fc from 'fast-check';
import type { EvacuationProblem } from '../../../../shared/flow';

export const STEP_SECONDS = 60;

/** Mostly absent, sometimes present: keeps most instances unconstrained by the optional limits. */
const sometimes = <T>(arbitrary: fc.Arbitrary<T>): fc.Arbitrary<T | undefined> =>
  fc.oneof({ weight: 2, arbitrary: fc.constant(undefined) }, { weight: 1, arbitrary });

export function randomEvacuation(options: { maxNodes?: number; maxRoads?: number; maxHorizon?: number } = {}): fc.Arbitrary<EvacuationProblem> {
  const { maxNodes = 5, maxRoads = 12, maxHorizon = 8 } = options;
  return fc
    .record({ nodeCount: fc.integer({ min: 2, max: maxNodes }), horizonSteps: fc.integer({ min: 0, max: maxHorizon }) })
    .chain(({ nodeCount, horizonSteps }) => {
      const node = fc.integer({ min: 0, max: nodeCount - 1 });
      const closure = fc.record({
        fromSeconds: fc.integer({ min: 0, max: 2 * (horizonSteps + 1) }).map((half) => half * (STEP_SECONDS / 2)),
        untilSeconds: fc.option(fc.integer({ min: 1, max: 8 }).map((half) => half * (STEP_SECONDS / 2)), { nil: null }),
      }).map((c) => ({ fromSeconds: c.fromSeconds, untilSeconds: c.untilSeconds === null ? null : c.fromSeconds + c.untilSeconds }));
      const road = fc.record({
        from: node,
        to: node,
        // c vehicles per 60 s step plus a remainder that the per-step rounding must drop.
        capacityVehPerHour: fc.tuple(fc.integer({ min: 0, max: 5 }), fc.integer({ min: 0, max: 59 })).map(([c, rest]) => 60 * c + rest),
        travelTimeSeconds: fc.integer({ min: 1, max: 150 }),
        storageVehicles: sometimes(fc.integer({ min: 0, max: 6 })),
        closures: sometimes(fc.array(closure, { minLength: 1, maxLength: 2 })),
      });
      const departures = fc.oneof(
        fc.constant({}),
        fc.array(fc.integer({ min: 0, max: 4 }), { maxLength: horizonSteps + 2 }).map((counts) => ({ releaseVehiclesByStep: counts })),
        fc.array(fc.integer({ min: 0, max: 20 }), { minLength: 1, maxLength: horizonSteps + 2 }).map((xs) => {
          let running = 0;
          return { releaseFractionByStep: xs.map((x) => (running = Math.max(running, x / 20))) };
        }),
      );
      const zone = fc.record({
        entryNodes: fc.array(node, { minLength: 1, maxLength: 2 }),
        vehicles: fc.integer({ min: 0, max: 20 }),
        departures,
        releaseVehPerHour: sometimes(fc.integer({ min: 0, max: 250 })),
      });
      const shelter = fc.record({
        node,
        capacityVehicles: fc.option(fc.integer({ min: 0, max: 12 }), { nil: null }),
        intakeVehPerHour: sometimes(fc.integer({ min: 0, max: 300 })),
      });
      return fc.record({
        nodeCount: fc.constant(nodeCount),
        horizonSteps: fc.constant(horizonSteps),
        // A two-way chain 0 ↔ 1 ↔ … ↔ n − 1 so that most instances have somewhere to go, plus random roads.
        roads: fc
          .tuple(fc.array(road, { minLength: 2 * (nodeCount - 1), maxLength: 2 * (nodeCount - 1) }), fc.array(road, { maxLength: maxRoads }))
          .map(([chain, extra]) => [
            ...chain.map((r, k) => (k % 2 === 0 ? { ...r, from: k / 2, to: k / 2 + 1 } : { ...r, from: (k + 1) / 2, to: (k - 1) / 2 })),
            ...extra,
          ]),
        zones: fc.array(zone, { minLength: 1, maxLength: 2 }),
        shelters: fc.array(shelter, { minLength: 1, maxLength: 2 }),
      });
    })
    .map(({ nodeCount, horizonSteps, roads, zones, shelters }) => ({
      nodeCount,
      horizonSteps,
      timeStepSeconds: STEP_SECONDS,
      roads: roads.map(({ storageVehicles, closures, ...road }) => ({
        ...road,
        ...(storageVehicles !== undefined ? { storageVehicles } : {}),
        ...(closures ? { closures } : {}),
      })),
      zones: zones.map((z, i) => {
        const departures = z.departures as { releaseVehiclesByStep?: number[]; releaseFractionByStep?: number[] };
        // A schedule may not release more than the zone has.
        let left = z.vehicles;
        const schedule = departures.releaseVehiclesByStep?.map((c) => {
          const take = Math.min(c, left);
          left -= take;
          return take;
        });
        return {
          id: `z${i}`,
          entryNodes: z.entryNodes,
          vehicles: z.vehicles,
          ...(schedule ? { releaseVehiclesByStep: schedule } : {}),
          ...(departures.releaseFractionByStep ? { releaseFractionByStep: departures.releaseFractionByStep } : {}),
          ...(z.releaseVehPerHour !== undefined ? { releaseVehPerHour: z.releaseVehPerHour } : {}),
        };
      }),
      shelters: shelters.map((s, i) => ({
        id: `s${i}`,
        node: s.node,
        capacityVehicles: s.capacityVehicles,
        ...(s.intakeVehPerHour !== undefined ? { intakeVehPerHour: s.intakeVehPerHour } : {}),
      })),
    }));
}

// The plan → engine translation: docs/model.md §1 arithmetic on hand-sized networks, and the
// one-bottleneck check of docs/model.md §6 (13 vehicles, 2 per step, τ = 3 → last arrives at
// step 9) solved by the engine on the problem this module builds.
import { describe, expect, it } from 'vitest';
import type { SegmentAttributes } from '../../../shared/api/road-attributes';
import type { ZoneAttributes } from '../../../shared/api/zone-shelter-attributes';
import { expandOverTime, maxFlow, perStepCapacity, travelSteps, validateEvacuationProblem } from '../../../shared/flow';
import { buildEvacuationProblem, defaultCapacityTable, ModelInputError, zoneVehicles, shelterVehicles, meanPersonsPerVehicle } from '../../../shared/model';

const base: SegmentAttributes = {
  roadClass: 'primary',
  lanesForward: null,
  lanesBackward: null,
  oneway: false,
  speedKmh: null,
  name: null,
  bridge: false,
  tunnel: false,
  layer: 0,
  closed: false,
  capacityOverrideVehPerHourPerLane: null,
};
const zone: ZoneAttributes = { name: 'Z', population: 1000, participationRate: 0.8, personsPerVehicle: 2.5, departureCurve: { kind: 'allAtOnce' } };
const params = { timeStepSeconds: 60, horizonSteps: 30 };

function twoSegments(a: Partial<SegmentAttributes> = {}, b: Partial<SegmentAttributes> = {}) {
  return {
    nodeCount: 3,
    segments: [
      { fromNode: 0, toNode: 1, lengthMeters: 1000, attributes: { ...base, ...a } },
      { fromNode: 1, toNode: 2, lengthMeters: 500, attributes: { ...base, roadClass: 'residential' as const, ...b } },
    ],
  };
}

describe('buildEvacuationProblem', () => {
  it('capacity = lanes × veh/h/lane × factor, time = length / speed, storage = jam × lanes × length', () => {
    const table = { ...defaultCapacityTable(), capacityFactor: 0.9 };
    const built = buildEvacuationProblem(twoSegments(), table, [], [], [], params);
    const [fwd, back, res] = built.problem.roads;
    // primary: 2 lanes × 1,000 veh/h/lane × 0.9; 1 km at 60 km/h = 60 s; 118.06 × 2 × 1 km.
    expect(fwd).toMatchObject({ from: 0, to: 1, lanes: 2, capacityVehPerHour: 1800, capacityVehPerHourPerLane: 900 });
    expect(fwd!.travelTimeSeconds).toBeCloseTo(60, 9);
    expect(fwd!.storageVehicles).toBeCloseTo(236.12, 9);
    expect(back).toMatchObject({ from: 1, to: 0, capacityVehPerHour: 1800 });
    // residential: 1 lane × 600 × 0.9; 0.5 km at 40 km/h = 45 s.
    expect(res!.capacityVehPerHour).toBeCloseTo(540, 9);
    expect(res!.travelTimeSeconds).toBeCloseTo(45, 9);
    expect(built.roadOrigins).toEqual([
      { segment: 0, direction: 'forward' },
      { segment: 0, direction: 'backward' },
      { segment: 1, direction: 'forward' },
      { segment: 1, direction: 'backward' },
    ]);
    expect(built.segmentRoads).toEqual([{ forward: 0, backward: 1 }, { forward: 2, backward: 3 }]);
    expect(built.defaultsUsed).toEqual([
      { roadClass: 'primary', segments: 1, lanes: 1, speed: 1 },
      { roadClass: 'residential', segments: 1, lanes: 1, speed: 1 },
    ]);
  });

  it('uses tagged lanes, speed and a per-segment capacity override; one-way roads give one road', () => {
    const net = twoSegments({ lanesForward: 3, lanesBackward: 0, oneway: true, speedKmh: 90 }, { capacityOverrideVehPerHourPerLane: 450 });
    const built = buildEvacuationProblem(net, defaultCapacityTable(), [], [], [], { ...params, capacityFactor: 0.5 });
    expect(built.problem.roads).toHaveLength(3);
    expect(built.problem.roads[0]).toMatchObject({ from: 0, to: 1, lanes: 3, capacityVehPerHour: 1500 });
    expect(built.problem.roads[0]!.travelTimeSeconds).toBeCloseTo(40, 9);
    expect(built.problem.roads[1]!.capacityVehPerHour).toBe(225);
    expect(built.segmentRoads[0]).toEqual({ forward: 0, backward: null });
    expect(built.capacityFactor).toBe(0.5);
  });

  it('applies scenario overrides: contraflow lanes, closures (whole run and windows)', () => {
    const overrides = [
      { segment: 0, oneway: true, lanesForward: 4, lanesBackward: 0 },
      { segment: 1, closures: [{ fromSeconds: 600, untilSeconds: 1200 }] },
    ];
    const built = buildEvacuationProblem(twoSegments(), defaultCapacityTable(), overrides, [], [], params);
    expect(built.problem.roads[0]).toMatchObject({ lanes: 4, capacityVehPerHour: 4000 });
    expect(built.segmentRoads[0]!.backward).toBeNull();
    expect(built.problem.roads[1]!.closures).toEqual([{ fromSeconds: 600, untilSeconds: 1200 }]);

    const closed = buildEvacuationProblem(twoSegments(), defaultCapacityTable(), [{ segment: 1, closed: true }], [], [], params);
    expect(closed.closedSegments).toEqual([1]);
    expect(closed.problem.roads[2]!.closures).toEqual([{ fromSeconds: 0, untilSeconds: null }]);
    expect(closed.problem.roads).toHaveLength(4); // indices stay stable across scenarios
  });

  it('rejects overrides that break the attribute rules or name a missing segment', () => {
    expect(() => buildEvacuationProblem(twoSegments(), defaultCapacityTable(), [{ segment: 0, oneway: true }], [], [], params)).toThrow(ModelInputError);
    expect(() => buildEvacuationProblem(twoSegments(), defaultCapacityTable(), [{ segment: 5, closed: true }], [], [], params)).toThrow(/segment 5/);
  });

  it('turns persons into vehicles (rounded up) and shelter places into vehicles (rounded down)', () => {
    expect(zoneVehicles(zone)).toBe(320);
    // 100 × 0.7 is 70.00000000000001 in floating point; still 35 vehicles of 2 persons.
    expect(zoneVehicles({ population: 100, participationRate: 0.7, personsPerVehicle: 2 })).toBe(35);
    expect(zoneVehicles({ population: 101, participationRate: 1, personsPerVehicle: 2 })).toBe(51);
    expect(shelterVehicles(1000, 2.5)).toBe(400);
    expect(shelterVehicles(999, 2.5)).toBe(399);
    expect(shelterVehicles(null, 2.5)).toBeNull();
    // 800 persons in 320 vehicles and 200 in 200: 1,000 / 520.
    expect(meanPersonsPerVehicle([zone, { population: 200, participationRate: 1, personsPerVehicle: 1 }])).toBeCloseTo(1000 / 520, 12);

    const built = buildEvacuationProblem(
      twoSegments(),
      defaultCapacityTable(),
      [],
      [{ id: 'z', attributes: { ...zone, departureCurve: { kind: 'uniform', durationHours: 0.5 } }, entryNodes: [0] }],
      [{ id: 's', attributes: { name: 'S', capacityPersons: 1000 }, node: 2 }],
      { ...params, horizonSteps: 10 },
    );
    validateEvacuationProblem(built.problem);
    expect(built.problem.zones[0]).toMatchObject({ id: 'z', entryNodes: [0], vehicles: 320 });
    expect(built.problem.zones[0]!.releaseFractionByStep).toHaveLength(11); // cut at the horizon
    expect(built.problem.zones[0]!.releaseFractionByStep![0]).toBeCloseTo(1 / 30, 12);
    expect(built.problem.shelters[0]).toEqual({ id: 's', node: 2, capacityVehicles: 400 });
  });

  it('docs/model.md §6 one bottleneck: 13 vehicles, 2 per step, τ = 3 steps → all delivered by step 9, not 8', () => {
    // 120 veh/h at Δ = 60 s is 2 per step; 1 km at 20 km/h is 180 s = 3 steps.
    const net = {
      nodeCount: 2,
      segments: [{ fromNode: 0, toNode: 1, lengthMeters: 1000, attributes: { ...base, roadClass: 'residential' as const, oneway: true, lanesForward: 1, lanesBackward: 0, speedKmh: 20, capacityOverrideVehPerHourPerLane: 120 } }],
    };
    const zones = [{ id: 'z', attributes: { ...zone, population: 13, participationRate: 1, personsPerVehicle: 1 }, entryNodes: [0] }];
    const shelters = [{ id: 'exit', attributes: { name: 'Exit', capacityPersons: null }, node: 1 }];
    const delivered = (horizonSteps: number) => {
      const { problem } = buildEvacuationProblem(net, defaultCapacityTable(), [], zones, shelters, { timeStepSeconds: 60, horizonSteps });
      validateEvacuationProblem(problem);
      expect(perStepCapacity(problem.roads[0]!.capacityVehPerHour, 60)).toBe(2);
      expect(travelSteps(problem.roads[0]!, 60)).toBe(3);
      const expanded = expandOverTime(problem);
      return maxFlow(expanded.network, expanded.source, expanded.sink).value;
    };
    expect(delivered(8)).toBe(12);
    expect(delivered(9)).toBe(13);
  });
});

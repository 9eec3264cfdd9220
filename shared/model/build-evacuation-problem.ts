// Plan data → the flow engine's EvacuationProblem, plus the way back from engine road
// indices to segments. The arithmetic is docs/model.md §1: capacity = lanes × veh/h/lane ×
// factor, travel time = length / speed, storage = jam density × lanes × length.
import { segmentAttributesSchema, type NetworkSegment, type RoadClass, type SegmentAttributes, type SegmentOverride } from '../api/road-attributes';
import { type CapacityTable } from '../api/capacity-table';
import { type ShelterAttributes, type ZoneAttributes } from '../api/zone-shelter-attributes';
import type { EvacuationProblem, EvacuationRoad } from '../flow';
import { capacityRowFor } from './capacity-defaults';
import { cumulativeShareByStep } from './departure-curves';
import { evacuatingPersons, meanPersonsPerVehicle, shelterVehicles, zoneVehicles } from './vehicles';

export interface ModelNetwork {
  nodeCount: number;
  segments: readonly Pick<NetworkSegment, 'fromNode' | 'toNode' | 'lengthMeters' | 'attributes'>[];
}

export interface ModelZone {
  id: string;
  attributes: ZoneAttributes;
  /** From attachZones (shared/geo). */
  entryNodes: number[];
}

export interface ModelShelter {
  id: string;
  attributes: ShelterAttributes;
  /** From attachShelters (shared/geo). */
  node: number;
}

export interface ProblemParameters {
  timeStepSeconds: number;
  horizonSteps: number;
  /** Replaces the table's global capacity factor for this run (e.g. a weather scenario). */
  capacityFactor?: number;
  /** Persons per vehicle used to turn shelter capacity into vehicles; default: the zones'
   *  vehicle-weighted mean (meanPersonsPerVehicle). */
  personsPerVehicleAtShelters?: number;
}

/** Where an engine road comes from: a segment, driven along or against its coordinates. */
export interface RoadOrigin {
  segment: number;
  direction: 'forward' | 'backward';
}

export interface BuiltEvacuationProblem {
  problem: EvacuationProblem;
  /** Index = engine road index. */
  roadOrigins: RoadOrigin[];
  /** Index = segment: its engine roads (null where the direction carries no traffic). */
  segmentRoads: { forward: number | null; backward: number | null }[];
  zones: { id: string; evacuatingPersons: number; vehicles: number }[];
  shelters: { id: string; capacityPersons: number | null; capacityVehicles: number | null }[];
  personsPerVehicleAtShelters: number;
  capacityFactor: number;
  /** Segments whose lanes or speed came from the capacity table, by class. */
  defaultsUsed: { roadClass: RoadClass; segments: number; lanes: number; speed: number }[];
  /** Segments closed for the whole run (their roads stay, with a closure from 0 s). */
  closedSegments: number[];
}

export class ModelInputError extends Error {
  override readonly name = 'ModelInputError';
}

function effectiveAttributes(base: SegmentAttributes, override: SegmentOverride | undefined, segment: number): SegmentAttributes {
  if (!override) return base;
  const { segment: _segment, closures: _closures, ...patch } = override;
  const merged = segmentAttributesSchema.safeParse({ ...base, ...patch });
  if (!merged.success) {
    throw new ModelInputError(`segment ${segment}: the override makes invalid attributes (${merged.error.issues.map((i) => i.message).join('; ')})`);
  }
  return merged.data;
}

/**
 * Builds the engine problem. Every segment direction that has lanes becomes one engine road,
 * in segment order, forward before backward, so road indices are stable across scenarios
 * of the same layer; a closed segment keeps its roads with a closure from 0 s.
 *
 * Rounding: vehicles per zone ⌈persons / persons per vehicle⌉; shelter capacity
 * ⌊persons / persons per vehicle⌋ (see vehicles.ts); capacities and times stay real numbers
 * here, the engine turns them into integer steps.
 *
 * @throws ModelInputError for an override on a segment that does not exist or that makes
 *   invalid attributes.
 */
export function buildEvacuationProblem(
  network: ModelNetwork,
  capacityTable: Pick<CapacityTable, 'rows' | 'capacityFactor'>,
  overrides: readonly SegmentOverride[],
  zones: readonly ModelZone[],
  shelters: readonly ModelShelter[],
  parameters: ProblemParameters,
): BuiltEvacuationProblem {
  const factor = parameters.capacityFactor ?? capacityTable.capacityFactor;
  if (!(factor > 0)) throw new ModelInputError('the capacity factor must be positive');
  const overrideOf = new Map<number, SegmentOverride>();
  for (const o of overrides) {
    if (o.segment >= network.segments.length) throw new ModelInputError(`override for segment ${o.segment}, but the layer has ${network.segments.length}`);
    overrideOf.set(o.segment, { ...overrideOf.get(o.segment), ...o });
  }

  const roads: EvacuationRoad[] = [];
  const roadOrigins: RoadOrigin[] = [];
  const segmentRoads: BuiltEvacuationProblem['segmentRoads'] = [];
  const defaults = new Map<RoadClass, { segments: number; lanes: number; speed: number }>();
  const closedSegments: number[] = [];

  network.segments.forEach((segment, index) => {
    const override = overrideOf.get(index);
    const a = effectiveAttributes(segment.attributes, override, index);
    const row = capacityRowFor(capacityTable, a.roadClass);
    const speedKmh = a.speedKmh ?? row.speedKmh;
    const perLane = a.capacityOverrideVehPerHourPerLane ?? row.capacityVehPerHourPerLane;
    const lanesForward = a.lanesForward ?? row.lanesPerDirection;
    const lanesBackward = a.oneway ? 0 : (a.lanesBackward ?? row.lanesPerDirection);
    const d = defaults.get(a.roadClass) ?? { segments: 0, lanes: 0, speed: 0 };
    d.segments += 1;
    if (a.lanesForward === null || (!a.oneway && a.lanesBackward === null)) d.lanes += 1;
    if (a.speedKmh === null) d.speed += 1;
    defaults.set(a.roadClass, d);

    const closures = [...(a.closed ? [{ fromSeconds: 0, untilSeconds: null }] : []), ...(override?.closures ?? [])];
    if (a.closed) closedSegments.push(index);
    const road = (from: number, to: number, lanes: number): number => {
      const r: EvacuationRoad = {
        from,
        to,
        capacityVehPerHour: lanes * perLane * factor,
        travelTimeSeconds: segment.lengthMeters / (speedKmh / 3.6),
        lanes,
        capacityVehPerHourPerLane: perLane * factor,
        storageVehicles: row.jamDensityVehPerKmPerLane * lanes * (segment.lengthMeters / 1000),
      };
      if (closures.length > 0) r.closures = closures.map((c) => ({ ...c }));
      roads.push(r);
      return roads.length - 1;
    };
    const forward = lanesForward > 0 ? road(segment.fromNode, segment.toNode, lanesForward) : null;
    if (forward !== null) roadOrigins.push({ segment: index, direction: 'forward' });
    const backward = lanesBackward > 0 ? road(segment.toNode, segment.fromNode, lanesBackward) : null;
    if (backward !== null) roadOrigins.push({ segment: index, direction: 'backward' });
    segmentRoads.push({ forward, backward });
  });

  const personsPerVehicleAtShelters = parameters.personsPerVehicleAtShelters ?? meanPersonsPerVehicle(zones.map((z) => z.attributes));
  const zoneRows = zones.map((z) => ({ id: z.id, evacuatingPersons: evacuatingPersons(z.attributes), vehicles: zoneVehicles(z.attributes) }));
  const shelterRows = shelters.map((s) => ({
    id: s.id,
    capacityPersons: s.attributes.capacityPersons,
    capacityVehicles: shelterVehicles(s.attributes.capacityPersons, personsPerVehicleAtShelters),
  }));

  const problem: EvacuationProblem = {
    nodeCount: network.nodeCount,
    roads,
    zones: zones.map((z, i) => ({
      id: z.id,
      entryNodes: [...z.entryNodes],
      vehicles: zoneRows[i]!.vehicles,
      releaseFractionByStep: cumulativeShareByStep(z.attributes.departureCurve, parameters.timeStepSeconds).slice(0, parameters.horizonSteps + 1),
    })),
    shelters: shelters.map((s, i) => ({ id: s.id, node: s.node, capacityVehicles: shelterRows[i]!.capacityVehicles })),
    timeStepSeconds: parameters.timeStepSeconds,
    horizonSteps: parameters.horizonSteps,
  };

  return {
    problem,
    roadOrigins,
    segmentRoads,
    zones: zoneRows,
    shelters: shelterRows,
    personsPerVehicleAtShelters,
    capacityFactor: factor,
    defaultsUsed: [...defaults.entries()].map(([roadClass, v]) => ({ roadClass, ...v })),
    closedSegments,
  };
}

// The static (steady-state) network: roads at their hourly capacity as they stand at one
// instant, a super source feeding every zone (bounded by its release rate, if any) and a super
// sink fed by every shelter (bounded by its intake rate, if any). Its maximum flow is an upper
// bound on evacuees per hour, not a schedule (docs/model.md §1).

import { UNBOUNDED_CAPACITY, floorCapacity } from './capacity';
import type { EvacuationProblem } from './evacuation-problem';
import { maxFlow, type MaxFlowOptions, type MaxFlowResult } from './max-flow';
import { buildNetworkFromArrays, type FlowNetwork } from './flow-network';
import { closedAtInstant } from './road-timing';

/**
 * Layout: road nodes 0..N−1, source N, sink N+1, zone z at N+2+z, shelter collector s at
 * N+2+Z+s. Arc e < R is road e (so static arc indices are road indices); then one arc
 * source → zone per zone, the zone → entry arcs, and per shelter node → collector → sink.
 */
export interface SteadyStateNetwork {
  readonly network: FlowNetwork;
  readonly source: number;
  readonly sink: number;
  readonly atSeconds: number;
  /** veh/h each road carries in this network (0 when closed at atSeconds). */
  readonly roadCapacity: Int32Array;
  /** 1 when the road is closed at atSeconds. */
  readonly roadClosed: Uint8Array;
  /** Arc source → zone z. */
  readonly zoneArc: Int32Array;
  /** Arc collector → sink of shelter s. */
  readonly shelterArc: Int32Array;
}

export function buildSteadyStateNetwork(problem: EvacuationProblem, atSeconds = 0): SteadyStateNetwork {
  const { nodeCount: N, roads, zones, shelters } = problem;
  const R = roads.length;
  const Z = zones.length;
  const source = N;
  const sink = N + 1;
  const tails: number[] = [];
  const heads: number[] = [];
  const caps: number[] = [];
  const add = (t: number, h: number, c: number): number => {
    tails.push(t);
    heads.push(h);
    caps.push(c);
    return tails.length - 1;
  };
  const roadCapacity = new Int32Array(R);
  const roadClosed = new Uint8Array(R);
  roads.forEach((road, e) => {
    roadClosed[e] = closedAtInstant(road.closures, atSeconds) ? 1 : 0;
    roadCapacity[e] = roadClosed[e] ? 0 : floorCapacity(road.capacityVehPerHour);
    add(road.from, road.to, roadCapacity[e]!);
  });
  const zoneArc = new Int32Array(Z);
  zones.forEach((zone, z) => {
    const rate = zone.releaseVehPerHour === undefined ? UNBOUNDED_CAPACITY : floorCapacity(zone.releaseVehPerHour);
    zoneArc[z] = add(source, N + 2 + z, zone.vehicles > 0 ? rate : 0);
  });
  zones.forEach((zone, z) => {
    for (const v of new Set(zone.entryNodes)) add(N + 2 + z, v, UNBOUNDED_CAPACITY);
  });
  const shelterArc = new Int32Array(shelters.length);
  shelters.forEach((shelter, s) => {
    const collector = N + 2 + Z + s;
    add(shelter.node, collector, UNBOUNDED_CAPACITY);
    const rate = shelter.intakeVehPerHour === undefined ? UNBOUNDED_CAPACITY : floorCapacity(shelter.intakeVehPerHour);
    shelterArc[s] = add(collector, sink, shelter.capacityVehicles === 0 ? 0 : rate);
  });
  const network = buildNetworkFromArrays(
    N + 2 + Z + shelters.length,
    Int32Array.from(tails),
    Int32Array.from(heads),
    Int32Array.from(caps),
  );
  return { network, source, sink, atSeconds, roadCapacity, roadClosed, zoneArc, shelterArc };
}

/** The steady state as the server stores it (plain JSON). */
export interface SteadyStateSummary {
  /** The instant whose road closures the static network reflects. */
  atSeconds: number;
  throughputVehPerHour: number;
  /** True when some zone reaches some shelter through arcs without limit. */
  unbounded: boolean;
  zones: { id: string; vehPerHour: number }[];
  shelters: { id: string; vehPerHour: number }[];
  /** veh/h on each road (index = road index) in the maximum flow found. */
  roadFlowVehPerHour: number[];
  /** Roads of the minimum cut (the static choke points), ascending road indices. */
  cutRoads: number[];
  /** Zones whose release rate, and shelters whose intake rate, are part of the minimum cut. */
  cutZoneIds: string[];
  cutShelterIds: string[];
}

export function solveSteadyState(
  problem: EvacuationProblem,
  steady: SteadyStateNetwork,
  options: Pick<MaxFlowOptions, 'algorithm' | 'now' | 'shouldAbort'> = {},
): { summary: SteadyStateSummary; result: MaxFlowResult } {
  const result = maxFlow(steady.network, steady.source, steady.sink, options);
  const R = problem.roads.length;
  const inCut = new Uint8Array(steady.network.arcCount);
  for (const arc of result.minCut.cutArcs) inCut[arc] = 1;
  const cutRoads: number[] = [];
  for (let e = 0; e < R; e++) if (inCut[e]) cutRoads.push(e);
  const summary: SteadyStateSummary = {
    atSeconds: steady.atSeconds,
    throughputVehPerHour: result.value,
    unbounded: result.unbounded,
    zones: problem.zones.map((zone, z) => ({ id: zone.id, vehPerHour: result.flow[steady.zoneArc[z]!]! })),
    shelters: problem.shelters.map((shelter, s) => ({ id: shelter.id, vehPerHour: result.flow[steady.shelterArc[s]!]! })),
    roadFlowVehPerHour: Array.from(result.flow.subarray(0, R)),
    cutRoads,
    cutZoneIds: problem.zones.filter((_, z) => inCut[steady.zoneArc[z]!]).map((zone) => zone.id),
    cutShelterIds: problem.shelters.filter((_, s) => inCut[steady.shelterArc[s]!]).map((s) => s.id),
  };
  return { summary, result };
}

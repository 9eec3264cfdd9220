// The time-expanded network of an evacuation problem (Ford & Fulkerson's dynamic flows as used
// for evacuation by Chalmet, Francis & Saunders 1982), under the discrete convention of
// docs/model.md §1:
//   - node copies (v, θ) for θ = 0..T; a departure from u in step θ on road e arrives at
//     (v, θ + τ_e) and exists only if θ + τ_e ≤ T and the road is open for departures in θ;
//     τ_e ≥ 0 is rounded against node time potentials (route-timing.ts), so a road may end in
//     its own layer, and those zero-step roads never form a cycle;
//   - holdover (v, θ) → (v, θ + 1) bounded by the node's storage (unbounded at zones);
//   - the source releases zone z's departures for step θ into (z, θ); (z, θ) holds over without
//     limit and feeds the zone's entry nodes in the same step, through a gate node that carries
//     at most the zone's release rate per step when one is given;
//   - each shelter s collects arrivals (node_s, θ) → c_s for every θ (bounded per step by its
//     intake rate, if given) and c_s → sink carries at most its capacity over the horizon.
// Nodes are numbered layer by layer after the terminals and collectors, so the network for any
// horizon t ≤ T is exactly the nodes below nodeLimitAtHorizon(t): a flow for horizon t stays
// feasible for t + 1, which is what makes the evacuation curve incremental.
//
// The copies are materialised: every algorithm and verify() then run on the expanded network
// unchanged. Memory: 28 bytes per expanded arc in the FlowNetwork, 5 more for the arc map below,
// 8 per arc for a FlowState; 4 bytes per expanded node. Arcs of capacity 0 (closed steps,
// capacities that round down to 0) are left out.

import { UNBOUNDED_CAPACITY, floorCapacity } from './capacity';
import type { EvacuationProblem } from './evacuation-problem';
import { buildNetworkFromArrays, type FlowNetwork } from './flow-network';
import { releaseSchedule } from './release-schedule';
import { closedAtStep, nodeStorage, perStepCapacity } from './road-timing';
import { routeTravelSteps, type RouteTimingError } from './route-timing';

/** What an expanded arc stands for; arcRef holds the index of the road, node, zone or shelter. */
export const ExpandedArcKind = {
  Road: 0,
  Holdover: 1,
  Release: 2,
  ZoneWait: 3,
  ZoneGate: 4,
  ZoneEntry: 5,
  ShelterArrival: 6,
  ShelterTotal: 7,
} as const;
export type ExpandedArcKind = (typeof ExpandedArcKind)[keyof typeof ExpandedArcKind];

export interface TimeExpandedNetwork {
  readonly network: FlowNetwork;
  readonly source: number;
  readonly sink: number;
  readonly horizonSteps: number;
  readonly timeStepSeconds: number;
  /** Index of node (0, 0); (v, θ) is layerBase + θ·layerSize + v. */
  readonly layerBase: number;
  /** Road nodes, then one node per zone, then one gate per rate-limited zone. */
  readonly layerSize: number;
  readonly roadNodeCount: number;
  readonly arcKind: Uint8Array;
  readonly arcRef: Int32Array;
  /** Arcs of step θ are layerArcStart[θ] .. layerArcStart[θ + 1] − 1; arcs before θ = 0 are the shelter totals. */
  readonly layerArcStart: Int32Array;
  /** τ_e in steps and per-step capacity of each road. */
  readonly roadTravelSteps: Int32Array;
  /** How the zones' fastest modelled trips compare with free flow under those steps. */
  readonly routeTiming: RouteTimingError;
  readonly roadStepCapacity: Int32Array;
  /** Departures per step of each zone. */
  readonly releases: readonly Int32Array[];
  /** Capacity of each node's holdover arc (storage). */
  readonly holdoverCapacity: Int32Array;
}

/** Nodes taking part in the network for horizon t (0 ≤ t ≤ T). */
export function nodeLimitAtHorizon(expanded: TimeExpandedNetwork, horizon: number): number {
  return expanded.layerBase + (horizon + 1) * expanded.layerSize;
}

/** Index of road node v's copy at step θ. */
export function timeNode(expanded: TimeExpandedNetwork, v: number, step: number): number {
  return expanded.layerBase + step * expanded.layerSize + v;
}

/** The step an expanded arc belongs to (its departure step), or −1 for a shelter total. */
export function arcStep(expanded: TimeExpandedNetwork, arc: number): number {
  const starts = expanded.layerArcStart;
  if (arc < starts[0]!) return -1;
  let low = 0;
  let high = starts.length - 2;
  while (low < high) {
    const mid = (low + high + 1) >> 1;
    if (starts[mid]! <= arc) low = mid;
    else high = mid - 1;
  }
  return low;
}

/**
 * Builds the time-expanded network of a validated problem. O((V + E)·T) time and memory.
 */
export function expandOverTime(problem: EvacuationProblem): TimeExpandedNetwork {
  const { nodeCount: N, roads, zones, shelters, timeStepSeconds: dt, horizonSteps: T } = problem;
  const R = roads.length;
  const Z = zones.length;
  const S = shelters.length;
  const source = 0;
  const sink = 1;
  const layerBase = 2 + S;
  const gateOf = new Int32Array(Z).fill(-1);
  let gates = 0;
  zones.forEach((zone, z) => {
    if (zone.releaseVehPerHour !== undefined) gateOf[z] = gates++;
  });
  const layerSize = N + Z + gates;
  const nodeTotal = layerBase + (T + 1) * layerSize;
  if (nodeTotal > 0x7fffffff) throw new RangeError(`time-expanded network too large: ${nodeTotal} nodes`);

  const { steps: roadTravelSteps, timing: routeTiming } = routeTravelSteps(problem);
  const roadStepCapacity = new Int32Array(R);
  roads.forEach((road, e) => {
    roadStepCapacity[e] = perStepCapacity(road.capacityVehPerHour, dt);
  });
  const holdoverCapacity = nodeStorage(problem);
  const releases = zones.map((zone) => releaseSchedule(zone, T));
  const entries = zones.map((zone) => [...new Set(zone.entryNodes)]);
  const entryArcsPerLayer = entries.reduce((sum, list) => sum + list.length, 0);
  const intake = shelters.map((s) =>
    s.intakeVehPerHour === undefined ? UNBOUNDED_CAPACITY : perStepCapacity(s.intakeVehPerHour, dt),
  );

  const bound = S + (T + 1) * (R + N + 3 * Z + gates + entryArcsPerLayer + S);
  const tails = new Int32Array(bound);
  const heads = new Int32Array(bound);
  const caps = new Int32Array(bound);
  const arcKind = new Uint8Array(bound);
  const arcRef = new Int32Array(bound);
  let m = 0;
  const add = (tail: number, head: number, cap: number, kind: ExpandedArcKind, ref: number): void => {
    if (cap <= 0) return;
    tails[m] = tail;
    heads[m] = head;
    caps[m] = cap;
    arcKind[m] = kind;
    arcRef[m] = ref;
    m++;
  };

  shelters.forEach((shelter, s) => {
    const total = shelter.capacityVehicles === null ? UNBOUNDED_CAPACITY : floorCapacity(shelter.capacityVehicles);
    add(2 + s, sink, total, ExpandedArcKind.ShelterTotal, s);
  });
  const layerArcStart = new Int32Array(T + 2);
  for (let step = 0; step <= T; step++) {
    layerArcStart[step] = m;
    const layer = layerBase + step * layerSize;
    const nextLayer = layer + layerSize;
    for (let z = 0; z < Z; z++) {
      const zoneNode = layer + N + z;
      add(source, zoneNode, releases[z]![step]!, ExpandedArcKind.Release, z);
      if (step < T) add(zoneNode, nextLayer + N + z, UNBOUNDED_CAPACITY, ExpandedArcKind.ZoneWait, z);
      let exit = zoneNode;
      const gate = gateOf[z]!;
      if (gate >= 0) {
        exit = layer + N + Z + gate;
        add(zoneNode, exit, perStepCapacity(zones[z]!.releaseVehPerHour!, dt), ExpandedArcKind.ZoneGate, z);
      }
      for (const v of entries[z]!) add(exit, layer + v, UNBOUNDED_CAPACITY, ExpandedArcKind.ZoneEntry, z);
    }
    for (let e = 0; e < R; e++) {
      const road = roads[e]!;
      const arrival = step + roadTravelSteps[e]!;
      if (arrival > T || closedAtStep(road.closures, step, dt)) continue;
      add(layer + road.from, layerBase + arrival * layerSize + road.to, roadStepCapacity[e]!, ExpandedArcKind.Road, e);
    }
    if (step < T) {
      for (let v = 0; v < N; v++) add(layer + v, nextLayer + v, holdoverCapacity[v]!, ExpandedArcKind.Holdover, v);
    }
    shelters.forEach((shelter, s) => {
      add(layer + shelter.node, 2 + s, intake[s]!, ExpandedArcKind.ShelterArrival, s);
    });
  }
  layerArcStart[T + 1] = m;

  const network = buildNetworkFromArrays(nodeTotal, tails.subarray(0, m), heads.subarray(0, m), caps.subarray(0, m));
  return {
    network,
    source,
    sink,
    horizonSteps: T,
    timeStepSeconds: dt,
    layerBase,
    layerSize,
    roadNodeCount: N,
    arcKind: arcKind.slice(0, m),
    arcRef: arcRef.slice(0, m),
    layerArcStart,
    roadTravelSteps,
    routeTiming,
    roadStepCapacity,
    releases,
    holdoverCapacity,
  };
}

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
// This layout writes the copies out: every algorithm and verify() then run on the expanded
// network unchanged (the searches for the best change and the curve's other algorithms use it).
// solveEvacuation keeps only the residuals, in implicit-expanded.ts, from the same slots and rules. Memory: 28 bytes per expanded arc in the FlowNetwork, 5 more for the arc map below,
// 8 per arc for a FlowState; 4 bytes per expanded node. Arcs of capacity 0 (closed steps,
// capacities that round down to 0) are left out, and so are the arcs of node copies that no zone
// reaches by their step or that reach no shelter by the horizon (step-window.ts), which changes
// no maximum flow and no minimum cut.

import { UNBOUNDED_CAPACITY, floorCapacity } from './capacity';
import type { EvacuationProblem } from './evacuation-problem';
import type { FlowNetwork } from './flow-network';
import { releaseSchedule } from './release-schedule';
import { closedAtStep, nodeStorage, perStepCapacity } from './road-timing';
import { givenTravelSteps, routeTravelSteps, type RouteTimingError } from './route-timing';
import { stepWindow } from './step-window';

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

export interface ExpandOptions {
  /**
   * Leave out the arcs of node copies that no zone reaches by their step or that reach no shelter
   * by the horizon (step-window.ts): no maximum flow or minimum cut changes. Default true; false
   * builds every copy (the oracle in tests).
   */
  prune?: boolean;
  /**
   * Whole steps per road (index = road) to use instead of routeTravelSteps(problem), e.g. steps
   * fitted to a plan (fittedTravelSteps in route-timing.ts). Zero-step roads must not close a
   * cycle; that is checked. Default: routeTravelSteps.
   */
  roadTravelSteps?: Int32Array;
}

type AddArc = (tail: number, head: number, cap: number, kind: ExpandedArcKind, ref: number) => void;

/**
 * Builds the time-expanded network of a validated problem. O((V + E)·T) time and memory. The arcs
 * are generated twice, once to count each node's residual arcs and once to write them in place,
 * so no list of arcs is held beside the network (12 bytes per arc less at the peak).
 */
export function expandOverTime(problem: EvacuationProblem, options: ExpandOptions = {}): TimeExpandedNetwork {
  const basics = expansionBasics(problem, options);
  const { roads, zones, shelters, timeStepSeconds: dt, horizonSteps: T } = problem;
  const { N, R, Z, source, sink, layerBase, gateOf, layerSize, nodeTotal, roadTravelSteps, routeTiming, roadStepCapacity } = basics;
  const { holdoverCapacity, releases, entries, intake, earliest, latest, closed } = basics;

  const layerArcStart = new Int32Array(T + 2);
  const emit = (add: AddArc, count: { m: number }): void => {
    shelters.forEach((shelter, s) => {
      const total = shelter.capacityVehicles === null ? UNBOUNDED_CAPACITY : floorCapacity(shelter.capacityVehicles);
      add(2 + s, sink, total, ExpandedArcKind.ShelterTotal, s);
    });
    for (let step = 0; step <= T; step++) {
      layerArcStart[step] = count.m;
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
        for (const v of entries[z]!) {
          if (step >= earliest[v]! && step <= latest[v]!) add(exit, layer + v, UNBOUNDED_CAPACITY, ExpandedArcKind.ZoneEntry, z);
        }
      }
      for (let e = 0; e < R; e++) {
        const road = roads[e]!;
        const arrival = step + roadTravelSteps[e]!;
        if (arrival > T || step < earliest[road.from]! || arrival > latest[road.to]!) continue;
        if (closed !== null && closed[e] !== undefined && closed[e]![step] === 1) continue;
        add(layer + road.from, layerBase + arrival * layerSize + road.to, roadStepCapacity[e]!, ExpandedArcKind.Road, e);
      }
      if (step < T) {
        for (let v = 0; v < N; v++) {
          if (step >= earliest[v]! && step < latest[v]!) add(layer + v, nextLayer + v, holdoverCapacity[v]!, ExpandedArcKind.Holdover, v);
        }
      }
      shelters.forEach((shelter, s) => {
        if (step >= earliest[shelter.node]!) add(layer + shelter.node, 2 + s, intake[s]!, ExpandedArcKind.ShelterArrival, s);
      });
    }
    layerArcStart[T + 1] = count.m;
  };

  // Pass 1: residual arcs per node.
  const firstOut = new Int32Array(nodeTotal + 1);
  const counted = { m: 0 };
  emit((tail, head, cap) => {
    if (cap <= 0) return;
    firstOut[tail + 1]!++;
    firstOut[head + 1]!++;
    counted.m++;
  }, counted);
  const m = counted.m;
  if (2 * m > 0x7fffffff) throw new RangeError(`time-expanded network too large: ${m} arcs`);
  for (let v = 0; v < nodeTotal; v++) firstOut[v + 1]! += firstOut[v]!;

  // Pass 2: the same arcs in the same order, written where buildNetworkFromArrays would put them.
  const next = firstOut.slice(0, nodeTotal);
  const head = new Int32Array(2 * m);
  const mate = new Int32Array(2 * m);
  const capacity = new Int32Array(2 * m);
  const residualOfArc = new Int32Array(m);
  const arcKind = new Uint8Array(m);
  const arcRef = new Int32Array(m);
  const written = { m: 0 };
  emit((tail, h, cap, kind, ref) => {
    if (cap <= 0) return;
    const i = written.m++;
    const forward = next[tail]!++;
    const backward = next[h]!++;
    head[forward] = h;
    head[backward] = tail;
    mate[forward] = backward;
    mate[backward] = forward;
    capacity[forward] = cap;
    residualOfArc[i] = forward;
    arcKind[i] = kind;
    arcRef[i] = ref;
  }, written);

  const network: FlowNetwork = { nodeCount: nodeTotal, arcCount: m, firstOut, head, mate, capacity, residualOfArc };
  return {
    network,
    source,
    sink,
    horizonSteps: T,
    timeStepSeconds: dt,
    layerBase,
    layerSize,
    roadNodeCount: N,
    arcKind,
    arcRef,
    layerArcStart,
    roadTravelSteps,
    routeTiming,
    roadStepCapacity,
    releases,
    holdoverCapacity,
  };
}

/** What both layouts of the time-expanded network (this one and implicit-expanded.ts) derive from the problem. */
export interface ExpansionBasics {
  readonly N: number;
  readonly R: number;
  readonly Z: number;
  readonly S: number;
  readonly source: number;
  readonly sink: number;
  readonly layerBase: number;
  /** Per zone, the index of its release-rate gate among the gates, or −1. */
  readonly gateOf: Int32Array;
  readonly layerSize: number;
  readonly nodeTotal: number;
  readonly roadTravelSteps: Int32Array;
  readonly routeTiming: RouteTimingError;
  readonly roadStepCapacity: Int32Array;
  readonly holdoverCapacity: Int32Array;
  readonly releases: Int32Array[];
  /** Each zone's entry nodes, each once. */
  readonly entries: number[][];
  /** Per shelter, its intake per step (UNBOUNDED_CAPACITY when none is given). */
  readonly intake: number[];
  /** The step window (step-window.ts), or every step when not pruned. */
  readonly earliest: Int32Array;
  readonly latest: Int32Array;
  readonly closed: (Uint8Array | undefined)[] | null;
}

/** Sizes, per-step capacities, road steps, releases and the step window of a validated problem. */
export function expansionBasics(problem: EvacuationProblem, options: ExpandOptions = {}): ExpansionBasics {
  const { nodeCount: N, roads, zones, shelters, timeStepSeconds: dt, horizonSteps: T } = problem;
  const R = roads.length;
  const Z = zones.length;
  const S = shelters.length;
  const layerBase = 2 + S;
  const gateOf = new Int32Array(Z).fill(-1);
  let gates = 0;
  zones.forEach((zone, z) => {
    if (zone.releaseVehPerHour !== undefined) gateOf[z] = gates++;
  });
  const layerSize = N + Z + gates;
  const nodeTotal = layerBase + (T + 1) * layerSize;
  if (nodeTotal > 0x7fffffff) throw new RangeError(`time-expanded network too large: ${nodeTotal} nodes`);

  const { steps: roadTravelSteps, timing: routeTiming } = options.roadTravelSteps
    ? givenTravelSteps(problem, options.roadTravelSteps)
    : routeTravelSteps(problem);
  const roadStepCapacity = new Int32Array(R);
  roads.forEach((road, e) => {
    roadStepCapacity[e] = perStepCapacity(road.capacityVehPerHour, dt);
  });
  const holdoverCapacity = nodeStorage(problem);
  const releases = zones.map((zone) => releaseSchedule(zone, T));
  const entries = zones.map((zone) => [...new Set(zone.entryNodes)]);
  const intake = shelters.map((s) =>
    s.intakeVehPerHour === undefined ? UNBOUNDED_CAPACITY : perStepCapacity(s.intakeVehPerHour, dt),
  );
  const window = options.prune === false
    ? null
    : stepWindow({
        nodeCount: N,
        horizonSteps: T,
        roadFrom: roads.map((road) => road.from),
        roadTo: roads.map((road) => road.to),
        travelSteps: roadTravelSteps,
        stepCapacity: roadStepCapacity,
        zoneEntries: entries,
        zoneFirstRelease: releases.map((counts) => counts.findIndex((c) => c > 0)),
        shelterNodes: shelters.map((s) => s.node),
      });
  const earliest = window?.earliest ?? new Int32Array(N);
  const latest = window?.latest ?? new Int32Array(N).fill(T);
  const closed = closedSteps(problem);
  return {
    N, R, Z, S, source: 0, sink: 1, layerBase, gateOf, layerSize, nodeTotal, roadTravelSteps, routeTiming, roadStepCapacity,
    holdoverCapacity, releases, entries, intake, earliest, latest, closed,
  };
}

/** Per road with closures, 1 at each step whose departures are refused (null when no road has closures). */
function closedSteps(problem: EvacuationProblem): (Uint8Array | undefined)[] | null {
  const { roads, horizonSteps: T, timeStepSeconds: dt } = problem;
  if (!roads.some((road) => road.closures && road.closures.length > 0)) return null;
  return roads.map((road) => {
    if (!road.closures || road.closures.length === 0) return undefined;
    const closed = new Uint8Array(T + 1);
    for (let step = 0; step <= T; step++) if (closedAtStep(road.closures, step, dt)) closed[step] = 1;
    return closed;
  });
}

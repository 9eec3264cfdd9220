// Per-road use of a time-expanded flow, and its decomposition into trips. The expanded network
// is acyclic (every arc moves forward in time, except the zone → gate → entry arcs within a
// step, which never lead back to a zone, and zero-step roads, which never close a cycle), so following arcs that still carry flow from the
// source always ends at the sink: each walk is one group of vehicles with one zone, one shelter
// and one arrival step.

import type { FlowState } from './flow-state';
import { ExpandedArcKind, type TimeExpandedNetwork } from './time-expanded';

export interface RoadUsage {
  /** Vehicles entering each road over the horizon (index = road). */
  totalVehicles: number[];
  /** Most vehicles entering in one step, the first step where that happens (−1 if unused), and that share of the per-step capacity. */
  peakVehiclesPerStep: number[];
  peakStep: number[];
  peakUtilisation: number[];
}

export function roadUsage(expanded: TimeExpandedNetwork, state: FlowState, roadCount: number): RoadUsage {
  const { network, arcKind, arcRef, layerArcStart, roadStepCapacity } = expanded;
  const { residualOfArc, mate } = network;
  const { residual } = state;
  const total = new Float64Array(roadCount);
  const peak = new Int32Array(roadCount);
  const peakStep = new Int32Array(roadCount).fill(-1);
  for (let step = 0; step + 1 < layerArcStart.length; step++) {
    for (let i = layerArcStart[step]!, end = layerArcStart[step + 1]!; i < end; i++) {
      if (arcKind[i] !== ExpandedArcKind.Road) continue;
      const f = residual[mate[residualOfArc[i]!]!]!;
      if (f === 0) continue;
      const e = arcRef[i]!;
      total[e]! += f;
      if (f > peak[e]!) {
        peak[e] = f;
        peakStep[e] = step;
      }
    }
  }
  const utilisation: number[] = [];
  for (let e = 0; e < roadCount; e++) {
    const cap = roadStepCapacity[e]!;
    utilisation.push(cap > 0 ? peak[e]! / cap : 0);
  }
  return {
    totalVehicles: Array.from(total),
    peakVehiclesPerStep: Array.from(peak),
    peakStep: Array.from(peakStep),
    peakUtilisation: utilisation,
  };
}

/** Cumulative arrivals at the shelters by the end of each step 0..T under the flow in `state`. */
export function arrivalsByStep(expanded: TimeExpandedNetwork, state: FlowState): number[] {
  const { network, arcKind, layerArcStart, horizonSteps: T } = expanded;
  const { residualOfArc, mate } = network;
  const byStep: number[] = [];
  let running = 0;
  for (let step = 0; step <= T; step++) {
    for (let i = layerArcStart[step]!, end = layerArcStart[step + 1]!; i < end; i++) {
      if (arcKind[i] === ExpandedArcKind.ShelterArrival) running += state.residual[mate[residualOfArc[i]!]!]!;
    }
    byStep.push(running);
  }
  return byStep;
}

export interface TripSummary {
  /** Per zone: vehicles delivered and the last arrival step of its vehicles (−1 if none). */
  zoneDelivered: number[];
  zoneLastArrivalStep: number[];
  /** Per shelter: vehicles received and the last arrival step (−1 if none). */
  shelterArrived: number[];
  shelterLastArrivalStep: number[];
  /** Vehicles of zone z received by shelter s, for every pair with some. */
  assignments: { zone: number; shelter: number; vehicles: number }[];
  /** Present when the roads were given: how the routes the plan uses are timed against free flow. */
  plannedRoutes?: PlannedRouteTiming;
}

/**
 * The routes the plan's vehicles actually drive (each walk of the decomposition), each route's
 * modelled driving time Σ τ_e·Δ against its free-flow time Σ t_e (waiting in queues left out: it is
 * not a rounding error). Weighted by vehicles.
 */
export interface PlannedRouteTiming {
  vehicles: number;
  /** Largest |modelled − free flow| over the routes used, and the vehicle-weighted median. */
  largestSeconds: number;
  typicalSeconds: number;
  /** Share of the vehicles whose route is modelled within one step of free flow. */
  withinOneStepShare: number;
}

/** The roads as decomposeTrips needs them to time the routes it finds. */
export interface TripRoads {
  readonly from: ArrayLike<number>;
  readonly to: ArrayLike<number>;
  readonly travelTimeSeconds: ArrayLike<number>;
}

/**
 * Decomposes the flow in `state` into source–sink walks. O(E + Σ walk lengths). The walks are
 * taken off `state.residual` itself (no copy: 8 bytes per arc less at the read-out's peak) and the
 * residual is put back at the end from the pair rule residual[r] + residual[mate[r]] = capacity[r],
 * since only the forward arcs' residuals change. `state` is unchanged when this returns.
 */
export function decomposeTrips(
  expanded: TimeExpandedNetwork,
  state: FlowState,
  zoneCount: number,
  shelterCount: number,
  roads?: TripRoads,
): TripSummary {
  const { network, source, sink, layerBase, layerSize } = expanded;
  const routeError = roads ? routeErrorOfWalk(expanded, roads) : null;
  const routes: { error: number; vehicles: number }[] = [];
  const { firstOut, head, capacity, mate, residualOfArc } = network;
  const roadNodes = expanded.roadNodeCount;
  const remaining = state.residual; // flow left on forward arc r = capacity[r] − remaining[r]
  const nextArc = firstOut.slice(0, network.nodeCount);
  const path = new Int32Array(network.nodeCount);
  const zoneDelivered = new Array<number>(zoneCount).fill(0);
  const zoneLast = new Array<number>(zoneCount).fill(-1);
  const shelterArrived = new Array<number>(shelterCount).fill(0);
  const shelterLast = new Array<number>(shelterCount).fill(-1);
  const pairs = new Map<number, number>();

  for (;;) {
    let depth = 0;
    let v = source;
    while (v !== sink) {
      let r = nextArc[v]!;
      const end = firstOut[v + 1]!;
      while (r < end && capacity[r]! - remaining[r]! <= 0) r++;
      nextArc[v] = r;
      if (r === end) break; // only the source can run dry: every other node conserves flow
      path[depth++] = r;
      v = head[r]!;
    }
    if (v !== sink) break;
    let amount = Infinity;
    for (let i = 0; i < depth; i++) amount = Math.min(amount, capacity[path[i]!]! - remaining[path[i]!]!);
    for (let i = 0; i < depth; i++) remaining[path[i]!]! += amount;
    // path[0] enters (zone, θ); the arc before the last one enters the shelter's collector.
    const zone = (head[path[0]!]! - layerBase) % layerSize - roadNodes;
    const collectorArc = path[depth - 2]!;
    const shelter = head[collectorArc]! - 2;
    const arrivalNode = head[mate[collectorArc]!]!;
    const arrival = Math.floor((arrivalNode - layerBase) / layerSize);
    zoneDelivered[zone]! += amount;
    shelterArrived[shelter]! += amount;
    if (arrival > zoneLast[zone]!) zoneLast[zone] = arrival;
    if (arrival > shelterLast[shelter]!) shelterLast[shelter] = arrival;
    const key = zone * shelterCount + shelter;
    pairs.set(key, (pairs.get(key) ?? 0) + amount);
    if (routeError) routes.push({ error: Math.abs(routeError(path, depth)), vehicles: amount });
  }
  // Only forward arcs were raised above; their mates still hold each arc's flow.
  for (let i = 0; i < residualOfArc.length; i++) {
    const r = residualOfArc[i]!;
    remaining[r] = capacity[r]! - remaining[mate[r]!]!;
  }
  const assignments = [...pairs.entries()]
    .sort((a, b) => a[0] - b[0])
    .map(([key, vehicles]) => ({ zone: Math.floor(key / shelterCount), shelter: key % shelterCount, vehicles }));
  const summary: TripSummary = { zoneDelivered, zoneLastArrivalStep: zoneLast, shelterArrived, shelterLastArrivalStep: shelterLast, assignments };
  if (routeError) summary.plannedRoutes = plannedRouteTiming(routes, expanded.timeStepSeconds);
  return summary;
}

/**
 * Modelled minus free-flow seconds of the roads along a walk. A road arc joins copies of two
 * different road nodes; it is told from its parallels by its step count (parallel roads with the
 * same count cannot be told apart in the walk: the first is taken).
 */
function routeErrorOfWalk(expanded: TimeExpandedNetwork, roads: TripRoads): (path: Int32Array, depth: number) => number {
  const { network, layerBase, layerSize, roadNodeCount: N, roadTravelSteps, timeStepSeconds: dt } = expanded;
  const { head, mate } = network;
  const R = roadTravelSteps.length;
  const first = new Int32Array(N + 1);
  for (let e = 0; e < R; e++) first[roads.from[e]! + 1]!++;
  for (let v = 0; v < N; v++) first[v + 1]! += first[v]!;
  const fill = first.slice(0, N);
  const leaving = new Int32Array(R);
  for (let e = 0; e < R; e++) leaving[fill[roads.from[e]!]!++] = e;
  return (path, depth) => {
    let error = 0;
    for (let i = 0; i < depth; i++) {
      const r = path[i]!;
      const tail = head[mate[r]!]! - layerBase;
      const to = head[r]! - layerBase;
      if (tail < 0 || to < 0) continue;
      const u = tail % layerSize;
      const v = to % layerSize;
      if (u >= N || v >= N || u === v) continue; // a zone's or shelter's arc, or waiting
      const steps = Math.floor(to / layerSize) - Math.floor(tail / layerSize);
      for (let k = first[u]!, end = first[u + 1]!; k < end; k++) {
        const e = leaving[k]!;
        if (roads.to[e] === v && roadTravelSteps[e] === steps) {
          error += steps * dt - roads.travelTimeSeconds[e]!;
          break;
        }
      }
    }
    return error;
  };
}

export function plannedRouteTiming(routes: { error: number; vehicles: number }[], dt: number): PlannedRouteTiming {
  const vehicles = routes.reduce((sum, r) => sum + r.vehicles, 0);
  routes.sort((a, b) => a.error - b.error);
  let seen = 0;
  let typical = 0;
  for (const r of routes) {
    seen += r.vehicles;
    if (2 * seen >= vehicles) {
      typical = r.error;
      break;
    }
  }
  const within = routes.reduce((sum, r) => sum + (r.error <= dt + 1e-9 ? r.vehicles : 0), 0);
  return {
    vehicles,
    largestSeconds: routes.length === 0 ? 0 : routes[routes.length - 1]!.error,
    typicalSeconds: typical,
    withinOneStepShare: vehicles === 0 ? 1 : within / vehicles,
  };
}

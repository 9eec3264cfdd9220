// Per-road use of a time-expanded flow, and its decomposition into trips. The expanded network
// is acyclic (every arc moves forward in time, except the zone → gate → entry arcs within a
// step, which never lead back to a zone), so following arcs that still carry flow from the
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
): TripSummary {
  const { network, source, sink, layerBase, layerSize } = expanded;
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
  }
  // Only forward arcs were raised above; their mates still hold each arc's flow.
  for (let i = 0; i < residualOfArc.length; i++) {
    const r = residualOfArc[i]!;
    remaining[r] = capacity[r]! - remaining[mate[r]!]!;
  }
  const assignments = [...pairs.entries()]
    .sort((a, b) => a[0] - b[0])
    .map(([key, vehicles]) => ({ zone: Math.floor(key / shelterCount), shelter: key % shelterCount, vehicles }));
  return { zoneDelivered, zoneLastArrivalStep: zoneLast, shelterArrived, shelterLastArrivalStep: shelterLast, assignments };
}

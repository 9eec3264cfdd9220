// The plan's read-outs (expanded-usage.ts), the time-expanded cut (bottlenecks.ts) and the
// independent check (verify.ts) on the implicit time-expanded network: the same figures from a
// residual in the implicit layout. Arcs are visited in the explicit layout's order, so every
// order-dependent figure (a road's first peak step, the trips' decomposition) is the same.

import type { CutComposition, RoadBottleneck, TimeExpandedBottlenecks } from './bottlenecks';
import type { RoadUsage, TripRoads, TripSummary } from './expanded-usage';
import { plannedRouteTiming } from './expanded-usage';
import type { ImplicitExpandedNetwork } from './implicit-expanded';
import { ExpandedArcKind } from './time-expanded';

/** Vehicles entering each road, per road: total, busiest step and its load (roadUsage). */
export function implicitRoadUsage(net: ImplicitExpandedNetwork, residual: Int32Array, roadCount: number): RoadUsage {
  const total = new Float64Array(roadCount);
  const peak = new Int32Array(roadCount);
  const peakStep = new Int32Array(roadCount).fill(-1);
  const { slotKind, slotRef, slotsPerLayer: F } = net;
  for (let step = 0; step <= net.horizonSteps; step++) {
    for (let j = 0; j < F; j++) {
      if (slotKind[j] !== ExpandedArcKind.Road || !net.isPresent(step, j)) continue;
      const f = residual[net.backwardArc(step, j)]!;
      if (f === 0) continue;
      const e = slotRef[j]!;
      total[e]! += f;
      if (f > peak[e]!) {
        peak[e] = f;
        peakStep[e] = step;
      }
    }
  }
  const utilisation: number[] = [];
  for (let e = 0; e < roadCount; e++) {
    const cap = net.roadStepCapacity[e]!;
    utilisation.push(cap > 0 ? peak[e]! / cap : 0);
  }
  return { totalVehicles: Array.from(total), peakVehiclesPerStep: Array.from(peak), peakStep: Array.from(peakStep), peakUtilisation: utilisation };
}

/** Cumulative arrivals at the shelters by the end of each step 0..T (arrivalsByStep). */
export function implicitArrivalsByStep(net: ImplicitExpandedNetwork, residual: Int32Array): number[] {
  const { slotKind, slotsPerLayer: F } = net;
  const byStep: number[] = [];
  let running = 0;
  for (let step = 0; step <= net.horizonSteps; step++) {
    for (let j = 0; j < F; j++) {
      if (slotKind[j] === ExpandedArcKind.ShelterArrival && net.isPresent(step, j)) running += residual[net.backwardArc(step, j)]!;
    }
    byStep.push(running);
  }
  return byStep;
}

/** Capacity of residual arc r when it is the forward arc of a present slot, else 0. */
function forwardCapacity(net: ImplicitExpandedNetwork, r: number): number {
  if (r < net.prefix) return (r & 1) === 0 ? net.totalCapacity[r >> 1]! : 0;
  if (r >= net.deadArc) return 0;
  const q = r - net.prefix;
  const K = net.arcsPerLayer;
  const layer = Math.floor(q / K);
  const t = q - layer * K;
  if (net.entryForward[t] !== 1) return 0;
  return net.capacityAt(layer, net.entrySlot[t]!);
}

/**
 * Decomposes the flow into source–sink walks (decomposeTrips), taken off `residual` in place and
 * put back at the end: the residual is unchanged when this returns.
 */
export function implicitDecomposeTrips(
  net: ImplicitExpandedNetwork,
  residual: Int32Array,
  zoneCount: number,
  shelterCount: number,
  roads?: TripRoads,
): TripSummary {
  const { source, sink, layerBase, layerSize, roadNodeCount: roadNodes } = net;
  const routeError = roads ? implicitRouteError(net, roads) : null;
  const routes: { error: number; vehicles: number }[] = [];
  const nextArc = new Int32Array(net.nodeCount);
  const arcs = new Int32Array(net.maxDegree + 1);
  const path = new Int32Array(net.horizonSteps * 4 + 16);
  let pathArray = path;
  const zoneDelivered = new Array<number>(zoneCount).fill(0);
  const zoneLast = new Array<number>(zoneCount).fill(-1);
  const shelterArrived = new Array<number>(shelterCount).fill(0);
  const shelterLast = new Array<number>(shelterCount).fill(-1);
  const pairs = new Map<number, number>();
  const left = (r: number): number => forwardCapacity(net, r) - residual[r]!;

  for (;;) {
    let depth = 0;
    let v = source;
    while (v !== sink) {
      const count = net.arcsOf(v, arcs);
      let k = nextArc[v]!;
      while (k < count && left(arcs[k]!) <= 0) k++;
      nextArc[v] = k;
      if (k === count) break;
      const r = arcs[k]!;
      if (depth === pathArray.length) {
        const longer = new Int32Array(pathArray.length * 2);
        longer.set(pathArray);
        pathArray = longer;
      }
      pathArray[depth++] = r;
      v = net.headOf(r);
    }
    if (v !== sink) break;
    let amount = Infinity;
    for (let i = 0; i < depth; i++) amount = Math.min(amount, left(pathArray[i]!));
    for (let i = 0; i < depth; i++) residual[pathArray[i]!]! += amount;
    const zone = (net.headOf(pathArray[0]!) - layerBase) % layerSize - roadNodes;
    const collectorArc = pathArray[depth - 2]!;
    const shelter = net.headOf(collectorArc) - 2;
    const arrivalNode = net.headOf(net.mateOf(collectorArc));
    const arrival = Math.floor((arrivalNode - layerBase) / layerSize);
    zoneDelivered[zone]! += amount;
    shelterArrived[shelter]! += amount;
    if (arrival > zoneLast[zone]!) zoneLast[zone] = arrival;
    if (arrival > shelterLast[shelter]!) shelterLast[shelter] = arrival;
    const key = zone * shelterCount + shelter;
    pairs.set(key, (pairs.get(key) ?? 0) + amount);
    if (routeError) routes.push({ error: Math.abs(routeError(pathArray, depth)), vehicles: amount });
  }
  // Only forward arcs were raised; their mates still hold each arc's flow.
  net.forEachArc((_, forward, backward, step, slot) => {
    const c = step < 0 ? net.totalCapacity[slot]! : net.capacityAt(step, slot);
    residual[forward] = c - residual[backward]!;
  });
  const assignments = [...pairs.entries()]
    .sort((a, b) => a[0] - b[0])
    .map(([key, vehicles]) => ({ zone: Math.floor(key / shelterCount), shelter: key % shelterCount, vehicles }));
  const summary: TripSummary = { zoneDelivered, zoneLastArrivalStep: zoneLast, shelterArrived, shelterLastArrivalStep: shelterLast, assignments };
  if (routeError) summary.plannedRoutes = plannedRouteTiming(routes, net.timeStepSeconds);
  return summary;
}

/** Modelled minus free-flow seconds of the roads along a walk (expanded-usage.ts's routeErrorOfWalk). */
function implicitRouteError(net: ImplicitExpandedNetwork, roads: TripRoads): (path: Int32Array, depth: number) => number {
  const { layerBase, layerSize, roadNodeCount: N, roadTravelSteps, timeStepSeconds: dt } = net;
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
      const tail = net.headOf(net.mateOf(r)) - layerBase;
      const to = net.headOf(r) - layerBase;
      if (tail < 0 || to < 0) continue;
      const u = tail % layerSize;
      const v = to % layerSize;
      if (u >= N || v >= N || u === v) continue;
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

/** Nodes reachable from the source by arcs with residual capacity, among nodes below the horizon's limit. */
export function implicitReachable(net: ImplicitExpandedNetwork, residual: Int32Array, horizon: number): Uint8Array {
  const nodeLimit = net.nodeLimitAtHorizon(horizon);
  const seen = new Uint8Array(net.nodeCount);
  const queue = new Int32Array(nodeLimit);
  const arcs = new Int32Array(net.maxDegree + 1);
  let queueHead = 0;
  let queueTail = 0;
  seen[net.source] = 1;
  queue[queueTail++] = net.source;
  while (queueHead < queueTail) {
    const u = queue[queueHead++]!;
    const count = net.arcsOf(u, arcs);
    for (let k = 0; k < count; k++) {
      const r = arcs[k]!;
      if (residual[r]! <= 0) continue;
      const v = net.headOf(r);
      if (v < nodeLimit && seen[v] === 0) {
        seen[v] = 1;
        queue[queueTail++] = v;
      }
    }
  }
  return seen;
}

/** The time-expanded minimum cut at `horizon` mapped back to roads and limits (timeExpandedBottlenecks). */
export function implicitBottlenecks(net: ImplicitExpandedNetwork, residual: Int32Array, horizon: number): TimeExpandedBottlenecks {
  const nodeLimit = net.nodeLimitAtHorizon(horizon);
  const side = implicitReachable(net, residual, horizon);
  const composition: CutComposition = { roads: 0, departures: 0, zoneRelease: 0, storage: 0, shelterIntake: 0, shelterCapacity: 0 };
  const steps = new Map<number, number[]>();
  const roadCapacity = new Map<number, number>();
  const zones = new Set<number>();
  const shelters = new Set<number>();
  net.forEachArc((_, forward, backward, step, slot) => {
    const h = net.headOf(forward);
    if (h >= nodeLimit || side[h] === 1 || side[net.headOf(backward)] === 0) return;
    if (step < 0) {
      composition.shelterCapacity += net.totalCapacity[slot]!;
      shelters.add(slot);
      return;
    }
    const c = net.capacityAt(step, slot);
    const ref = net.slotRef[slot]!;
    switch (net.slotKind[slot]) {
      case ExpandedArcKind.Road: {
        composition.roads += c;
        roadCapacity.set(ref, (roadCapacity.get(ref) ?? 0) + c);
        let list = steps.get(ref);
        if (!list) steps.set(ref, (list = []));
        list.push(step);
        break;
      }
      case ExpandedArcKind.Release:
        composition.departures += c;
        break;
      case ExpandedArcKind.ZoneGate:
        composition.zoneRelease += c;
        zones.add(ref);
        break;
      case ExpandedArcKind.Holdover:
        composition.storage += c;
        break;
      case ExpandedArcKind.ShelterArrival:
        composition.shelterIntake += c;
        shelters.add(ref);
        break;
      default:
        break;
    }
  });
  const total =
    composition.roads + composition.departures + composition.zoneRelease + composition.storage + composition.shelterIntake + composition.shelterCapacity;
  const roads: RoadBottleneck[] = [...roadCapacity.entries()].map(([road, cut]) => ({
    road,
    stepRanges: toRanges(steps.get(road)!),
    cutCapacityVehicles: cut,
    share: total > 0 ? cut / total : 0,
  }));
  roads.sort((a, b) => b.cutCapacityVehicles - a.cutCapacityVehicles || a.road - b.road);
  return {
    horizonStep: horizon,
    cutCapacityVehicles: total,
    roads,
    composition,
    zones: [...zones].sort((a, b) => a - b),
    shelters: [...shelters].sort((a, b) => a - b),
  };
}

function toRanges(sortedSteps: number[]): [number, number][] {
  const ranges: [number, number][] = [];
  for (const step of sortedSteps) {
    const last = ranges[ranges.length - 1];
    if (last && last[1] === step - 1) last[1] = step;
    else ranges.push([step, step]);
  }
  return ranges;
}

const MAX_REPORTED_PROBLEMS = 20;

/**
 * verify() on a flow held in the implicit layout at `horizon`: each arc's flow (its backward
 * residual) within [0, capacity] and its forward residual the rest, no flow past the horizon,
 * conservation at every node but the terminals, the value leaving the source and reaching the sink,
 * and the nodes reachable from the source in the residual a cut of capacity equal to the value.
 */
export function verifyImplicit(net: ImplicitExpandedNetwork, residual: Int32Array, horizon: number, value: number): { ok: boolean; problems: string[] } {
  const problems: string[] = [];
  const report = (message: string): void => {
    if (problems.length < MAX_REPORTED_PROBLEMS) problems.push(message);
  };
  const nodeLimit = net.nodeLimitAtHorizon(horizon);
  const side = implicitReachable(net, residual, horizon);
  const balance = new Float64Array(net.nodeCount);
  let cutCapacity = 0;
  net.forEachArc((i, forward, backward, step, slot) => {
    const c = step < 0 ? net.totalCapacity[slot]! : net.capacityAt(step, slot);
    const f = residual[backward]!;
    const t = net.headOf(backward);
    const h = net.headOf(forward);
    if (f < 0 || f > c) report(`arc ${i} (${t}→${h}): flow ${f} outside [0, ${c}]`);
    if (residual[forward]! !== c - f) report(`arc ${i} (${t}→${h}): residual ${residual[forward]} is not capacity ${c} less flow ${f}`);
    if (f !== 0 && (t >= nodeLimit || h >= nodeLimit)) report(`arc ${i} (${t}→${h}): flow ${f} beyond the node limit`);
    balance[t]! -= f;
    balance[h]! += f;
    if (h >= nodeLimit || t >= nodeLimit) return;
    const tailIn = side[t] === 1;
    const headIn = side[h] === 1;
    if (tailIn && !headIn) {
      cutCapacity += c;
      if (f !== c) report(`cut arc ${i} (${t}→${h}) carries ${f} of ${c}`);
    } else if (!tailIn && headIn && f !== 0) {
      report(`arc ${i} (${t}→${h}) enters the source side with flow ${f}`);
    }
  });
  const { source, sink } = net;
  for (let v = 0; v < net.nodeCount; v++) {
    if (v !== source && v !== sink && balance[v] !== 0) report(`node ${v}: inflow − outflow = ${balance[v]}`);
  }
  if (-balance[source]! !== value) report(`value ${value} but the source sends ${-balance[source]!}`);
  if (balance[sink]! !== value) report(`value ${value} but the sink receives ${balance[sink]!}`);
  if (side[sink] === 1) report('the sink is on the source side of the cut');
  if (cutCapacity !== value) report(`cut capacity ${cutCapacity} differs from value ${value}`);
  return { ok: problems.length === 0, problems };
}

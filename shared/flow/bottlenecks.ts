// Choke points of the time-expanded network: its minimum cut at one horizon, mapped back to the
// roads (with the departure steps during which each road copy is cut) and to the other things
// that can limit an evacuation (departures not yet made, zone release rates, storage at nodes,
// shelter intake and shelter capacity).

import { reachableFromSource } from './min-cut';
import { ExpandedArcKind, nodeLimitAtHorizon, type TimeExpandedNetwork } from './time-expanded';

export interface RoadBottleneck {
  road: number;
  /** Departure steps [first, last] (inclusive) during which the road is in the cut. */
  stepRanges: [number, number][];
  /** Σ per-step capacity of the cut copies. */
  cutCapacityVehicles: number;
  /** cutCapacityVehicles / the cut's capacity. */
  share: number;
}

export interface CutComposition {
  roads: number;
  /** Release arcs: vehicles that have not yet departed by then (the departure curve limits). */
  departures: number;
  /** Zone release-rate gates. */
  zoneRelease: number;
  /** Waiting (holdover) arcs bounded by road storage. */
  storage: number;
  shelterIntake: number;
  shelterCapacity: number;
}

export interface TimeExpandedBottlenecks {
  /** The horizon whose minimum cut this is. */
  horizonStep: number;
  /** Capacity of the cut = the maximum number of vehicles delivered by that horizon. */
  cutCapacityVehicles: number;
  /** Roads in the cut, largest share first. */
  roads: RoadBottleneck[];
  /** The cut's capacity by what the cut arcs stand for. */
  composition: CutComposition;
  /** Zones whose release rate, and shelters whose intake or capacity, are in the cut. */
  zones: number[];
  shelters: number[];
}

export function timeExpandedBottlenecks(
  expanded: TimeExpandedNetwork,
  residual: Int32Array,
  horizon: number,
): TimeExpandedBottlenecks {
  const { network, source, arcKind, arcRef, layerArcStart } = expanded;
  const { head, mate, capacity, residualOfArc } = network;
  const nodeLimit = nodeLimitAtHorizon(expanded, horizon);
  const side = reachableFromSource(network, residual, source, nodeLimit);
  const composition: CutComposition = { roads: 0, departures: 0, zoneRelease: 0, storage: 0, shelterIntake: 0, shelterCapacity: 0 };
  const steps = new Map<number, number[]>();
  const roadCapacity = new Map<number, number>();
  const zones = new Set<number>();
  const shelters = new Set<number>();
  const layers = layerArcStart.length - 1;
  // Arcs before layer 0 are the shelter totals; treat them as step −1.
  for (let layer = -1; layer < layers; layer++) {
    const start = layer < 0 ? 0 : layerArcStart[layer]!;
    const end = layer < 0 ? layerArcStart[0]! : layerArcStart[layer + 1]!;
    for (let i = start; i < end; i++) {
      const r = residualOfArc[i]!;
      const h = head[r]!;
      if (h >= nodeLimit || side[h] === 1 || side[head[mate[r]!]!] === 0) continue;
      const c = capacity[r]!;
      const ref = arcRef[i]!;
      switch (arcKind[i]) {
        case ExpandedArcKind.Road: {
          composition.roads += c;
          roadCapacity.set(ref, (roadCapacity.get(ref) ?? 0) + c);
          let list = steps.get(ref);
          if (!list) steps.set(ref, (list = []));
          list.push(layer);
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
        case ExpandedArcKind.ShelterTotal:
          composition.shelterCapacity += c;
          shelters.add(ref);
          break;
        default:
          // Zone waiting and entry arcs are unbounded: they are never in a finite cut.
          break;
      }
    }
  }
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

/** Ascending steps → inclusive runs of consecutive steps. */
function toRanges(sortedSteps: number[]): [number, number][] {
  const ranges: [number, number][] = [];
  for (const step of sortedSteps) {
    const last = ranges[ranges.length - 1];
    if (last && last[1] === step - 1) last[1] = step;
    else ranges.push([step, step]);
  }
  return ranges;
}

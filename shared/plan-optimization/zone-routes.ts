// Where each zone goes: the plan's maximum flow (the evacuation curve's last horizon) decomposed
// into paths, summed per zone: the shelters and exits it reaches, the roads its vehicles use,
// and the time windows of its departures and arrivals. One optimal plan of possibly many: the
// routes are those of this plan, not the only way the zone could go.

import type { EvacuationProblem } from '../flow';
import { planOverTime, type OptimisationHooks } from './problem-tools';

export interface ZoneRoute {
  zone: string;
  vehicles: number;
  deliveredVehicles: number;
  shelters: { shelter: string; vehicles: number }[];
  /** Every road the zone's vehicles use, most vehicles first. */
  roads: { road: number; vehicles: number }[];
  /** Roads carrying at least MAIN_ROAD_SHARE of the zone's delivered vehicles, most first. */
  mainRoads: { road: number; vehicles: number }[];
  /** Steps in which the zone's vehicles enter the roads (null when none do). */
  departureWindow: { firstStep: number; lastStep: number } | null;
  arrivalWindow: { firstStep: number; lastStep: number } | null;
}

export const MAIN_ROAD_SHARE = 0.25;

export interface ZoneRoutes {
  timeStepSeconds: number;
  horizonStep: number;
  clearanceStep: number | null;
  zones: ZoneRoute[];
}

export function zoneRoutes(problem: EvacuationProblem, hooks: OptimisationHooks = {}): ZoneRoutes {
  const curve = planOverTime(problem, hooks.layout, hooks.shouldAbort);
  const Z = problem.zones.length;
  const shelterVehicles = Array.from({ length: Z }, () => new Map<number, number>());
  const roadVehicles = Array.from({ length: Z }, () => new Map<number, number>());
  const delivered = new Array<number>(Z).fill(0);
  const window = (): { firstStep: number; lastStep: number } | null => null;
  const departures = Array.from({ length: Z }, window);
  const arrivals = Array.from({ length: Z }, window);
  const widen = (w: { firstStep: number; lastStep: number } | null, step: number) =>
    w ? { firstStep: Math.min(w.firstStep, step), lastStep: Math.max(w.lastStep, step) } : { firstStep: step, lastStep: step };
  curve.forEachPath((path) => {
    const z = path.zone;
    delivered[z]! += path.vehicles;
    shelterVehicles[z]!.set(path.shelter, (shelterVehicles[z]!.get(path.shelter) ?? 0) + path.vehicles);
    for (const road of new Set(path.roads)) roadVehicles[z]!.set(road, (roadVehicles[z]!.get(road) ?? 0) + path.vehicles);
    departures[z] = widen(departures[z]!, path.entryStep);
    arrivals[z] = widen(arrivals[z]!, path.arrivalStep);
  });
  hooks.onProgress?.(1);
  return {
    timeStepSeconds: problem.timeStepSeconds,
    horizonStep: curve.finalHorizon,
    clearanceStep: curve.clearanceStep,
    zones: problem.zones.map((zone, z) => {
      const roads = [...roadVehicles[z]!.entries()].map(([road, vehicles]) => ({ road, vehicles })).sort((a, b) => b.vehicles - a.vehicles || a.road - b.road);
      return {
        zone: zone.id,
        vehicles: zone.vehicles,
        deliveredVehicles: delivered[z]!,
        shelters: [...shelterVehicles[z]!.entries()]
          .map(([s, vehicles]) => ({ shelter: problem.shelters[s]!.id, vehicles }))
          .sort((a, b) => b.vehicles - a.vehicles || a.shelter.localeCompare(b.shelter)),
        roads,
        mainRoads: roads.filter((r) => delivered[z]! > 0 && r.vehicles >= MAIN_ROAD_SHARE * delivered[z]!).slice(0, 12),
        departureWindow: departures[z]!,
        arrivalWindow: arrivals[z]!,
      };
    }),
  };
}

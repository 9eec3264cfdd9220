// How a road's hourly figures and time windows become integer steps (docs/model.md §1):
// per-step capacity ⌊veh/h · Δ / 3600⌋, travel time ⌈τ / Δ⌉ ≥ 1 step, and closures by the
// departure step. A vehicle departing in step θ enters the road during [θΔ, (θ+1)Δ); that
// departure is refused when the step overlaps a closure, while vehicles already on the road
// finish their trip.

import { UNBOUNDED_CAPACITY, ceilWithTolerance, floorCapacity } from './capacity';
import type { EvacuationProblem, EvacuationRoad, RoadClosure } from './evacuation-problem';

export const SECONDS_PER_HOUR = 3600;

/** ⌊veh/h · Δ / 3600⌋ vehicles per step. */
export function perStepCapacity(vehPerHour: number, timeStepSeconds: number): number {
  return floorCapacity((vehPerHour * timeStepSeconds) / SECONDS_PER_HOUR);
}

/** ⌈travel time / Δ⌉, at least one step. */
export function travelSteps(road: EvacuationRoad, timeStepSeconds: number): number {
  return Math.max(1, ceilWithTolerance(road.travelTimeSeconds / timeStepSeconds));
}

/** True when a departure in step θ is refused: [θΔ, (θ+1)Δ) overlaps some closure. */
export function closedAtStep(closures: readonly RoadClosure[] | undefined, step: number, timeStepSeconds: number): boolean {
  if (!closures) return false;
  const start = step * timeStepSeconds;
  const end = start + timeStepSeconds;
  for (const closure of closures) {
    const until = closure.untilSeconds ?? Infinity;
    if (closure.fromSeconds < end && until > start && until > closure.fromSeconds) return true;
  }
  return false;
}

/** True when the road is closed at the instant `atSeconds` (from ≤ t < until). */
export function closedAtInstant(closures: readonly RoadClosure[] | undefined, atSeconds: number): boolean {
  if (!closures) return false;
  return closures.some((c) => c.fromSeconds <= atSeconds && atSeconds < (c.untilSeconds ?? Infinity));
}

/**
 * Vehicles that can wait at each node from one step to the next: the storage of the roads
 * entering it, summed. A node with no entering road, or with one whose storage is not given,
 * has no limit (docs/model.md §1: bounded by storage where the model says so).
 */
export function nodeStorage(problem: EvacuationProblem): Int32Array {
  const storage = new Float64Array(problem.nodeCount);
  const unbounded = new Uint8Array(problem.nodeCount).fill(1);
  const seen = new Uint8Array(problem.nodeCount);
  for (const road of problem.roads) {
    if (!seen[road.to]) {
      seen[road.to] = 1;
      unbounded[road.to] = 0;
    }
    if (road.storageVehicles === undefined) unbounded[road.to] = 1;
    else storage[road.to]! += road.storageVehicles;
  }
  const result = new Int32Array(problem.nodeCount);
  for (let v = 0; v < problem.nodeCount; v++) {
    result[v] = unbounded[v] ? UNBOUNDED_CAPACITY : floorCapacity(storage[v]!);
  }
  return result;
}

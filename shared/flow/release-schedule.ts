// Departures per step from a zone's departure (mobilisation) curve.

import type { EvacuationZone } from './evacuation-problem';

/**
 * Vehicles departing in each step θ = 0..horizonSteps. From a cumulative share F, the count by
 * the end of step θ is round(vehicles · F[θ]), so the running total is always the rounded curve
 * and never drifts; the last value of a short array is repeated. Without a curve, all vehicles
 * depart at step 0 (and wait at the zone while the roads are full).
 */
export function releaseSchedule(zone: EvacuationZone, horizonSteps: number): Int32Array {
  const counts = new Int32Array(horizonSteps + 1);
  const { vehicles } = zone;
  if (zone.releaseVehiclesByStep) {
    for (let step = 0; step <= horizonSteps && step < zone.releaseVehiclesByStep.length; step++) {
      counts[step] = zone.releaseVehiclesByStep[step]!;
    }
    return counts;
  }
  const shares = zone.releaseFractionByStep;
  if (!shares || shares.length === 0) {
    counts[0] = vehicles;
    return counts;
  }
  let departed = 0;
  for (let step = 0; step <= horizonSteps; step++) {
    const share = Math.min(1, shares[Math.min(step, shares.length - 1)]!);
    const byEnd = Math.max(departed, Math.min(vehicles, Math.round(vehicles * share)));
    counts[step] = byEnd - departed;
    departed = byEnd;
  }
  return counts;
}

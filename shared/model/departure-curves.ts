// Departure (mobilisation) curves: the cumulative share of a zone's evacuating vehicles that
// have left by time t after the order. Formulas are stated on departureCurveSchema
// (shared/api/zone-shelter-attributes.ts); the S-shaped forms follow Li, Ozbay, Bartin et al. (2013), TRR 2376.
import type { DepartureCurve } from '../api/zone-shelter-attributes';

/** Share still to leave below which a curve's tail is closed off (release the rest at once). */
export const CURVE_TAIL_SHARE = 1e-6;

/** The logistic curve as published, P(t) = 1 / (1 + e^(−α(t − H))), before the t = 0 shift. */
export function logisticShare(hours: number, responseRatePerHour: number, halfLoadingHours: number): number {
  return 1 / (1 + Math.exp(-responseRatePerHour * (hours - halfLoadingHours)));
}

/** Rayleigh F(t) = 1 − exp(−t² / (2σ²)). */
export function rayleighShare(hours: number, sigmaHours: number): number {
  return 1 - Math.exp(-(hours * hours) / (2 * sigmaHours * sigmaHours));
}

/** Cumulative share departed by `hours` after the order, 0 before it, rising to 1. */
export function cumulativeShareDeparted(curve: DepartureCurve, hours: number): number {
  if (hours < 0) return 0;
  switch (curve.kind) {
    case 'allAtOnce':
      return 1;
    case 'uniform':
      return Math.min(1, hours / curve.durationHours);
    case 'logistic': {
      // Shifted so that F(0) = 0: the published form already has P(0) > 0 (0.0474 for
      // α = 1/h, H = 3 h), which would release people before the order.
      const p0 = logisticShare(0, curve.responseRatePerHour, curve.halfLoadingHours);
      const p = logisticShare(hours, curve.responseRatePerHour, curve.halfLoadingHours);
      return (p - p0) / (1 - p0);
    }
    case 'rayleigh':
      return rayleighShare(hours, curve.sigmaHours);
  }
}

/**
 * The engine's release input (EvacuationZone.releaseFractionByStep): the cumulative share
 * departed by the end of each step θ = 0, 1, 2, …, i.e. F((θ + 1)·Δ), since a departure in
 * step θ enters the roads during [θΔ, (θ+1)Δ). The list ends at the first step where at most
 * CURVE_TAIL_SHARE is still to leave, and that last value is 1 (the engine repeats the last
 * value to the horizon). It may be longer than the horizon: those people leave after it.
 *
 * @example cumulativeShareByStep({ kind: 'uniform', durationHours: 1 }, 1800) → [0.5, 1]
 */
export function cumulativeShareByStep(curve: DepartureCurve, timeStepSeconds: number, maxSteps = 1_000_000): number[] {
  if (!(timeStepSeconds > 0)) throw new Error('timeStepSeconds must be positive');
  const shares: number[] = [];
  for (let step = 0; step < maxSteps; step += 1) {
    const share = cumulativeShareDeparted(curve, ((step + 1) * timeStepSeconds) / 3600);
    if (1 - share <= CURVE_TAIL_SHARE) {
      shares.push(1);
      return shares;
    }
    shares.push(share);
  }
  throw new Error(`departure curve does not finish within ${maxSteps} steps`);
}

/**
 * Where each curve form comes from, shown next to the curve picker and in briefings. The
 * parameters a zone gets by default are example values, not fitted to a population.
 */
export const DEPARTURE_CURVE_SOURCES: Readonly<Record<DepartureCurve['kind'], string>> = {
  allAtOnce: 'a bounding case: everyone leaves at the order (common practice)',
  uniform: 'departures spread evenly over a stated period (common practice)',
  logistic: 'logistic form compared with observed evacuations by Li, Ozbay, Bartin et al. (2013), TRR 2376 (C); formula from memory',
  rayleigh: 'Rayleigh form compared with observed evacuations by Li, Ozbay, Bartin et al. (2013), TRR 2376 (C); formula from memory',
};

// Departure (mobilisation) curves: the cumulative share of a zone's evacuating vehicles that
// have left by time t after the order. Formulas are stated on departureCurveSchema
// (shared/api/network.ts); the S-shaped forms follow Li, Ozbay, Bartin et al. (2013), TRR 2376.
import type { DepartureCurve } from '../api/network';

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
 * Share of the zone's vehicles released at each time step θ = 0, 1, 2, …: those who left
 * during ((θ−1)Δ, θΔ] become available at step θ, so step 0 holds only those who leave at
 * the order itself (everyone for `allAtOnce`, nobody otherwise). The list ends at the first
 * step where at most CURVE_TAIL_SHARE is still to leave; that remainder joins the last step,
 * so the shares sum to exactly 1. It may run past the analysis horizon: those are people
 * who leave after it.
 *
 * @example releaseSharesByStep({ kind: 'uniform', durationHours: 1 }, 1800) → [0, 0.5, 0.5]
 */
export function releaseSharesByStep(curve: DepartureCurve, timeStepSeconds: number, maxSteps = 1_000_000): number[] {
  if (!(timeStepSeconds > 0)) throw new Error('timeStepSeconds must be positive');
  const shares: number[] = [];
  let before = 0;
  for (let step = 0; step <= maxSteps; step += 1) {
    const now = cumulativeShareDeparted(curve, (step * timeStepSeconds) / 3600);
    if (1 - now <= CURVE_TAIL_SHARE) {
      shares.push(1 - before);
      return shares;
    }
    shares.push(now - before);
    before = now;
  }
  throw new Error(`departure curve does not finish within ${maxSteps} steps`);
}

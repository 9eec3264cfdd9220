// The finite stand-in for "unbounded" and the one place where real numbers become integer
// capacities. Residual capacities live in Int32Array: a residual arc never holds more than the
// capacity of the arc it belongs to (arcs are never merged), so no per-arc overflow can occur as
// long as every capacity is at most UNBOUNDED_CAPACITY.

import { FlowInputError } from './errors';

/**
 * Capacity that stands for "no limit": 2^31 − 1 vehicles, the largest value an Int32Array holds.
 * A maximum flow whose minimum cut contains an arc of this capacity is reported as unbounded.
 */
export const UNBOUNDED_CAPACITY = 2_147_483_647;

/**
 * Sums of capacities (flow values, node excesses, cut capacities) are kept in doubles, which are
 * exact for integers up to 2^53 − 1. The front door refuses a source whose outgoing capacity
 * exceeds this, so no sum can lose precision (about four million unbounded source arcs).
 */
export const MAX_EXACT_SUM = Number.MAX_SAFE_INTEGER;

/**
 * Slack for turning a computed real (veh/h × Δ / 3600) into an integer: 1800 × 60 / 3600 must be
 * 30 even when the product comes out as 29.999999999999996.
 */
export const ROUNDING_TOLERANCE = 1e-9;

/** ⌊x⌋ with the rounding tolerance, clamped to [0, UNBOUNDED_CAPACITY]; NaN counts as 0. */
export function floorCapacity(x: number): number {
  if (!(x > 0)) return 0;
  if (x >= UNBOUNDED_CAPACITY) return UNBOUNDED_CAPACITY;
  return Math.floor(x + ROUNDING_TOLERANCE);
}

/** ⌈x⌉ with the rounding tolerance (so 180 s / 60 s is 3 steps, not 4). */
export function ceilWithTolerance(x: number): number {
  return Math.ceil(x - ROUNDING_TOLERANCE);
}

/** True when x is an integer capacity the engine accepts: 0 ≤ x ≤ UNBOUNDED_CAPACITY. */
export function isValidCapacity(x: number): boolean {
  return Number.isInteger(x) && x >= 0 && x <= UNBOUNDED_CAPACITY;
}

/**
 * Residual capacity of residual arc r after its arc gains `amount`: the pair's residuals sum to
 * the arc's capacity, so the raise stops where that capacity reaches UNBOUNDED_CAPACITY (an arc
 * raised that far has no limit, like any other arc of that capacity) and never wraps the Int32.
 */
export function raisedResidual(residual: Int32Array, mate: Int32Array, r: number, amount: number): number {
  if (!Number.isInteger(amount) || amount < 0) throw new FlowInputError(`a capacity can only grow by a non-negative integer, got ${amount}`);
  const ceiling = UNBOUNDED_CAPACITY - residual[mate[r]!]!;
  return Math.min(residual[r]! + amount, ceiling);
}

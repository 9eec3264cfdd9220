// Two-way roads as pairs of engine roads, and contraflow applied to a problem the same way a
// scenario's contraflow corridor is (shared/model/apply-scenario.ts): the outbound road gains
// the inbound road's capacity, lanes and queue space, and the inbound road is closed throughout.

import type { EvacuationProblem } from '../flow';

/** The two directions of one two-way road (engine road indices). */
export interface RoadPair {
  forward: number;
  backward: number;
}

/** 'forward': the pair's forward road runs outbound on both carriageways; 'backward' the other. */
export type ContraflowDirection = 'forward' | 'backward';

export interface PairOrientation {
  /** Index into the candidate pair list. */
  pair: number;
  direction: ContraflowDirection;
}

/**
 * Pairs of antiparallel roads (u→v and v→u), each road in at most one pair, in road order.
 * Use this when no segment map is at hand; the server passes the segment pairs instead.
 */
export function antiparallelPairs(problem: EvacuationProblem): RoadPair[] {
  const open = new Map<string, number[]>();
  const pairs: RoadPair[] = [];
  problem.roads.forEach((road, e) => {
    const mateKey = `${road.to}>${road.from}`;
    const waiting = open.get(mateKey);
    if (waiting && waiting.length > 0) {
      pairs.push({ forward: waiting.shift()!, backward: e });
      return;
    }
    const key = `${road.from}>${road.to}`;
    (open.get(key) ?? open.set(key, []).get(key)!).push(e);
  });
  return pairs;
}

/** A pair may be reversed only when both roads are open throughout (no closure windows). */
export function reversiblePair(problem: EvacuationProblem, pair: RoadPair): boolean {
  const a = problem.roads[pair.forward];
  const b = problem.roads[pair.backward];
  return !!a && !!b && pair.forward !== pair.backward && !(a.closures?.length) && !(b.closures?.length);
}

/** Mutates `problem`: applies contraflow on each oriented pair. */
export function applyContraflow(problem: EvacuationProblem, pairs: readonly RoadPair[], orientations: readonly PairOrientation[]): void {
  for (const { pair, direction } of orientations) {
    const p = pairs[pair]!;
    const out = problem.roads[direction === 'forward' ? p.forward : p.backward]!;
    const inn = problem.roads[direction === 'forward' ? p.backward : p.forward]!;
    out.capacityVehPerHour += inn.capacityVehPerHour;
    out.lanes = (out.lanes ?? 1) + (inn.lanes ?? 1);
    if (out.storageVehicles !== undefined && inn.storageVehicles !== undefined) out.storageVehicles += inn.storageVehicles;
    inn.closures = [{ fromSeconds: 0, untilSeconds: null }];
  }
}

/**
 * Mutates `problem`: each listed pair's roads both get the pooled capacity (and queue space) of
 * the two directions. Every orientation of the pairs is a sub-network of this one, so its maximum
 * is an upper bound on what any choice of reversals can reach.
 */
export function poolPairs(problem: EvacuationProblem, pairs: readonly RoadPair[], which: readonly number[]): void {
  for (const i of which) {
    const p = pairs[i]!;
    const a = problem.roads[p.forward]!;
    const b = problem.roads[p.backward]!;
    const capacity = a.capacityVehPerHour + b.capacityVehPerHour;
    const lanes = (a.lanes ?? 1) + (b.lanes ?? 1);
    const storage = a.storageVehicles !== undefined && b.storageVehicles !== undefined ? a.storageVehicles + b.storageVehicles : undefined;
    for (const road of [a, b]) {
      road.capacityVehPerHour = capacity;
      road.lanes = lanes;
      if (storage !== undefined) road.storageVehicles = storage;
      else delete road.storageVehicles;
    }
  }
}

// Road travel times in whole steps that keep *routes* true to free flow, however short the
// roads (docs/model.md §1). Rounding each road on its own (⌈t/Δ⌉ ≥ 1) charges a 7 s street a full
// 60 s step, so a trip over twenty of them comes out twenty times too slow. Instead every node
// gets a time potential π(v) that falls by t_e along the fastest trips: the free-flow seconds
// from v to the nearest shelter, or minus those from the nearest zone entry node to v (Dijkstra
// 1959). Its step potential is P(v) = round(π(v)/Δ), and road e = (u, v) with free-flow time t_e
// takes
//
//     τ_e = P(u) − P(v) + ⌈s_e/Δ⌉,   s_e = t_e + π(v) − π(u) ≥ 0 (the road's slack):
//
// rounding against node time potentials, so that rounding errors do not add up along a route
// (as reduced costs are rounded against potentials; for condensed time-expanded networks see
// Fleischer & Skutella 2007, "Quickest flows over time", SIAM J. Comput. 36(6)). Along a route
// from a to b the potentials telescope:
//
//     Σ τ_e = P(a) − P(b) + Σ ⌈s_e/Δ⌉   while   Σ t_e / Δ = (π(a) − π(b))/Δ + Σ s_e/Δ,
//
// so a route made of fastest trips (every slack 0) is modelled within one step of its free-flow
// time (half a step at each end), whatever its roads' lengths, and no route is modelled faster
// than that. Each road with slack adds less than one step of its own. Against the shelters every
// fastest trip to the nearest shelter has no slack; against the zones, every fastest trip out of
// the nearest zone. `routeTravelSteps` takes whichever potential leaves the smaller largest
// difference over the zones' fastest trips to each shelter and reports it (`RouteTimingError`).
//
// τ_e may be 0: the vehicle reaches v within the same step. Round a cycle the potentials cancel
// and its slacks add up to its travel time, so a cycle of roads costs at least one step and
// zero-step roads never close one; for cycles of roads that take no time at all, a zero-step
// road must climb to a higher step potential or lead strictly down the potential (at equal
// potential, to a lower node index), else it takes one step. The expanded network stays acyclic.
//
// Roads off every trip (no shelter reachable, or not reachable from a zone, for the potential in
// use), and roads that carry nothing per step, keep the plain rule ⌈t_e/Δ⌉ ≥ 1.

import { ROUNDING_TOLERANCE, ceilWithTolerance } from './capacity';
import type { EvacuationProblem } from './evacuation-problem';
import { perStepCapacity } from './road-timing';

/** Which node potential the steps were rounded against (see the header). */
export type RoutePotential = 'to-shelters' | 'from-zones';

/**
 * Free-flow seconds over roads that carry something per step: from every node to the nearest
 * shelter, or (negated, so that it too falls along a trip) from the nearest zone entry node to
 * every node. Unreachable nodes get ±Infinity.
 */
export function nodeTimePotential(problem: EvacuationProblem, kind: RoutePotential): Float64Array {
  const { nodeCount: N, roads, timeStepSeconds: dt } = problem;
  const forward = kind === 'from-zones';
  const usable = roads.map((road) => perStepCapacity(road.capacityVehPerHour, dt) > 0);
  // Adjacency in the search direction: roads leaving a node (from zones) or entering it (to shelters).
  const first = new Int32Array(N + 1);
  roads.forEach((road, e) => {
    if (usable[e]) first[(forward ? road.from : road.to) + 1]!++;
  });
  for (let v = 0; v < N; v++) first[v + 1]! += first[v]!;
  const fill = first.slice(0, N);
  const adjacent = new Int32Array(first[N]!);
  roads.forEach((road, e) => {
    if (usable[e]) adjacent[fill[forward ? road.from : road.to]!++] = e;
  });
  const dist = new Float64Array(N).fill(Infinity);
  const heap = new MinHeap(N);
  const origins = forward ? problem.zones.flatMap((zone) => zone.entryNodes) : problem.shelters.map((shelter) => shelter.node);
  for (const v of origins) {
    dist[v] = 0;
    heap.push(v, 0);
  }
  while (heap.size > 0) {
    const v = heap.pop();
    const dv = dist[v]!;
    if (heap.lastKey > dv) continue; // a stale entry
    for (let i = first[v]!, end = first[v + 1]!; i < end; i++) {
      const road = roads[adjacent[i]!]!;
      const w = forward ? road.to : road.from;
      const dw = dv + road.travelTimeSeconds;
      if (dw < dist[w]!) {
        dist[w] = dw;
        heap.push(w, dw);
      }
    }
  }
  if (forward) for (let v = 0; v < N; v++) dist[v] = -dist[v]!;
  return dist;
}

/** Steps per road by the rule above against one potential (index = road). */
export function travelStepsAgainst(problem: EvacuationProblem, potential: Float64Array): Int32Array {
  const toShelter = potential;
  const dt = problem.timeStepSeconds;
  const steps = new Int32Array(problem.roads.length);
  problem.roads.forEach((road, e) => {
    const pu = toShelter[road.from]!;
    const pv = toShelter[road.to]!;
    const plain = Math.max(1, ceilWithTolerance(road.travelTimeSeconds / dt));
    if (!Number.isFinite(pu) || !Number.isFinite(pv) || perStepCapacity(road.capacityVehPerHour, dt) === 0) {
      steps[e] = plain;
      return;
    }
    const slack = Math.max(0, road.travelTimeSeconds + pv - pu);
    const stepU = Math.round(pu / dt);
    const stepV = Math.round(pv / dt);
    let tau = stepU - stepV + Math.max(0, ceilWithTolerance(slack / dt));
    if (tau <= 0) {
      // A zero-step road either climbs to a higher step potential or, within one, leads strictly
      // nearer a shelter (equal: to a lower index); no cycle can do either all the way round.
      tau = stepV > stepU || pv < pu || (pv === pu && road.to < road.from) ? 0 : 1;
    }
    steps[e] = tau;
  });
  return steps;
}

/**
 * Steps per road, rounded against whichever potential models the zones' trips to the shelters
 * closer to free flow (smaller largest difference; ties go to the shelters), with that
 * difference. Rounding against the shelters keeps every fastest trip to the nearest shelter
 * within half a step; against the zones, every fastest trip out of the zones that passes no
 * nearer another zone. Two potentials, two measurements: O(Z · E log V).
 */
export function routeTravelSteps(problem: EvacuationProblem): { steps: Int32Array; timing: RouteTimingError } {
  let best: { steps: Int32Array; timing: RouteTimingError } | null = null;
  for (const kind of ['to-shelters', 'from-zones'] as const) {
    const steps = travelStepsAgainst(problem, nodeTimePotential(problem, kind));
    const timing = measureRouteTiming(problem, steps, kind);
    if (best === null || timing.largestSeconds < best.timing.largestSeconds - 1e-9) best = { steps, timing };
  }
  return best!;
}

/**
 * Node phases in seconds, 0 ≤ Φ(v) < Δ, of a potential that falls along trips (nodeTimePotential):
 * Φ(v) = −π(v) mod Δ, 0 where π is infinite. travelStepsFromPhases of these phases keeps every
 * trip the potential makes fastest as tight as travelStepsAgainst does.
 */
export function phasesOfPotential(potential: Float64Array, timeStepSeconds: number): Float64Array {
  const phase = new Float64Array(potential.length);
  for (let v = 0; v < potential.length; v++) phase[v] = Number.isFinite(potential[v]!) ? phaseOf(-potential[v]!, timeStepSeconds) : 0;
  return phase;
}

/** time modulo Δ in [0, Δ); a value within the rounding tolerance of Δ counts as 0. */
function phaseOf(time: number, dt: number): number {
  const p = time - dt * Math.floor(time / dt);
  return p >= dt * (1 - ROUNDING_TOLERANCE) || p < 0 ? 0 : p;
}

/**
 * Steps per road from node phases: τ_e = ⌈(Φ(u) + t_e − Φ(v))/Δ⌉ ≥ 0, the steps until the first
 * instant at v's phase no earlier than the arrival (docs/model.md §1: every rule that models no
 * route faster than free flow by a step or more has this form). Around a cycle the phases cancel,
 * so Σ τ_e·Δ ≥ Σ t_e; a zero-step road must lead to a higher phase (equal: a higher node index),
 * so zero-step roads never close a cycle. Roads that carry nothing per step take ⌈t_e/Δ⌉ ≥ 1.
 */
export function travelStepsFromPhases(problem: EvacuationProblem, phase: Float64Array): Int32Array {
  const dt = problem.timeStepSeconds;
  const steps = new Int32Array(problem.roads.length);
  problem.roads.forEach((road, e) => {
    if (perStepCapacity(road.capacityVehPerHour, dt) === 0) {
      steps[e] = Math.max(1, ceilWithTolerance(road.travelTimeSeconds / dt));
      return;
    }
    const pu = phase[road.from]!;
    const pv = phase[road.to]!;
    let tau = Math.max(0, ceilWithTolerance((pu + road.travelTimeSeconds - pv) / dt));
    if (tau === 0 && !(pv > pu || (pv === pu && road.to > road.from))) tau = 1;
    steps[e] = tau;
  });
  return steps;
}

/**
 * Steps fitted to where a plan drives: starting from the phases of the potential routeTravelSteps
 * keeps, each junction in turn takes the phase that least delays the given vehicles on its roads
 * (Σ vehicles × wait at the far end, the wait being (Φ(v) − Φ(u) − t_e) mod Δ), among the phases
 * that would make one of its roads exact; `sweeps` rounds, or until nothing changes. A coordinate
 * descent: the total wait never rises, but it is a local optimum. O(sweeps · Σ deg²) over the
 * roads with vehicles. `vehiclesByRoad` is typically the road use of a first solve's plan.
 */
export function fittedTravelSteps(problem: EvacuationProblem, vehiclesByRoad: ArrayLike<number>, sweeps = 10): Int32Array {
  const { nodeCount: N, roads, timeStepSeconds: dt } = problem;
  const R = roads.length;
  const start = routeTravelSteps(problem).timing.potential;
  const phase = phasesOfPotential(nodeTimePotential(problem, start), dt);
  const weight = (e: number): number => (perStepCapacity(roads[e]!.capacityVehPerHour, dt) > 0 ? Math.max(0, vehiclesByRoad[e] ?? 0) : 0);
  const first = new Int32Array(N + 1);
  for (let e = 0; e < R; e++) {
    if (weight(e) <= 0 || roads[e]!.from === roads[e]!.to) continue;
    first[roads[e]!.from + 1]!++;
    first[roads[e]!.to + 1]!++;
  }
  for (let v = 0; v < N; v++) first[v + 1]! += first[v]!;
  const fill = first.slice(0, N);
  const incident = new Int32Array(first[N]!);
  for (let e = 0; e < R; e++) {
    if (weight(e) <= 0 || roads[e]!.from === roads[e]!.to) continue;
    incident[fill[roads[e]!.from]!++] = e;
    incident[fill[roads[e]!.to]!++] = e;
  }
  const wait = (x: number): number => phaseOf(x, dt);
  const delay = (v: number, p: number): number => {
    let sum = 0;
    for (let k = first[v]!, end = first[v + 1]!; k < end; k++) {
      const road = roads[incident[k]!]!;
      const pu = road.from === v ? p : phase[road.from]!;
      const pv = road.to === v ? p : phase[road.to]!;
      sum += weight(incident[k]!) * wait(pv - pu - road.travelTimeSeconds);
    }
    return sum;
  };
  for (let round = 0; round < sweeps; round++) {
    let changed = false;
    for (let v = 0; v < N; v++) {
      if (first[v] === first[v + 1]) continue;
      let best = phase[v]!;
      let bestDelay = delay(v, best);
      for (let k = first[v]!, end = first[v + 1]!; k < end; k++) {
        const road = roads[incident[k]!]!;
        const candidate = road.to === v ? phaseOf(phase[road.from]! + road.travelTimeSeconds, dt) : phaseOf(phase[road.to]! - road.travelTimeSeconds, dt);
        const d = delay(v, candidate);
        if (d < bestDelay - 1e-9) {
          bestDelay = d;
          best = candidate;
        }
      }
      if (best !== phase[v]) {
        phase[v] = best;
        changed = true;
      }
    }
    if (!changed) break;
  }
  return travelStepsFromPhases(problem, phase);
}

/**
 * Given steps (ExpandOptions.roadTravelSteps), checked: one whole number ≥ 0 per road, and no
 * cycle of zero-step roads that carry something per step (Kahn's topological sort). The measure
 * names the potential routeTravelSteps would keep.
 */
export function givenTravelSteps(problem: EvacuationProblem, steps: Int32Array): { steps: Int32Array; timing: RouteTimingError } {
  const { nodeCount: N, roads, timeStepSeconds: dt } = problem;
  if (steps.length !== roads.length) throw new RangeError(`roadTravelSteps has ${steps.length} entries for ${roads.length} roads`);
  const indegree = new Int32Array(N);
  const zero: number[] = [];
  roads.forEach((road, e) => {
    if (!(steps[e]! >= 0)) throw new RangeError(`roadTravelSteps[${e}] is ${steps[e]}`);
    if (steps[e] === 0 && perStepCapacity(road.capacityVehPerHour, dt) > 0) {
      zero.push(e);
      indegree[road.to]!++;
    }
  });
  const first = new Int32Array(N + 1);
  for (const e of zero) first[roads[e]!.from + 1]!++;
  for (let v = 0; v < N; v++) first[v + 1]! += first[v]!;
  const fill = first.slice(0, N);
  const out = new Int32Array(zero.length);
  for (const e of zero) out[fill[roads[e]!.from]!++] = e;
  const queue: number[] = [];
  for (let v = 0; v < N; v++) if (indegree[v] === 0) queue.push(v);
  let seen = 0;
  for (let i = 0; i < queue.length; i++) {
    const v = queue[i]!;
    seen++;
    for (let k = first[v]!, end = first[v + 1]!; k < end; k++) {
      const w = roads[out[k]!]!.to;
      if (--indegree[w]! === 0) queue.push(w);
    }
  }
  if (seen < N) throw new RangeError('roadTravelSteps: zero-step roads close a cycle');
  const potential = routeTravelSteps(problem).timing.potential;
  return { steps, timing: measureRouteTiming(problem, steps, potential) };
}

/** How modelled route times compare with free flow, per zone and shelter. */
export interface RouteTimingError {
  /** The time model: rounding against node time potentials, and which one. */
  method: 'node-potential-rounding';
  potential: RoutePotential;
  /** Zone–shelter pairs compared (a shelter the zone can reach at all). */
  pairs: number;
  /** Largest |modelled − free-flow| over those pairs, in seconds and in steps. */
  largestSeconds: number;
  largestSteps: number;
  /** The median of |modelled − free-flow| over the pairs, in seconds. */
  typicalSeconds: number;
  /** The pair with the largest difference (indices into zones and shelters), or null without pairs. */
  worst: { zone: number; shelter: number; freeFlowSeconds: number; modelledSeconds: number } | null;
}

/**
 * For every zone and shelter, the fastest free-flow time (Dijkstra over seconds) and the fastest
 * modelled time (Dijkstra over steps × Δ), each from the best of the zone's entry nodes, and
 * their difference. O(Z · (E log V)).
 */
export function measureRouteTiming(problem: EvacuationProblem, steps: Int32Array, potential: RoutePotential): RouteTimingError {
  const { nodeCount: N, roads, zones, shelters, timeStepSeconds: dt } = problem;
  const usable = roads.map((road) => perStepCapacity(road.capacityVehPerHour, dt) > 0);
  const first = new Int32Array(N + 1);
  roads.forEach((road, e) => {
    if (usable[e]) first[road.from + 1]!++;
  });
  for (let v = 0; v < N; v++) first[v + 1]! += first[v]!;
  const fill = first.slice(0, N);
  const leaving = new Int32Array(first[N]!);
  roads.forEach((road, e) => {
    if (usable[e]) leaving[fill[road.from]!++] = e;
  });
  const heap = new MinHeap(N);
  const fromZone = (entries: readonly number[], weight: (e: number) => number): Float64Array => {
    const dist = new Float64Array(N).fill(Infinity);
    for (const v of entries) {
      dist[v] = 0;
      heap.push(v, 0);
    }
    while (heap.size > 0) {
      const u = heap.pop();
      const du = dist[u]!;
      if (heap.lastKey > du) continue;
      for (let i = first[u]!, end = first[u + 1]!; i < end; i++) {
        const e = leaving[i]!;
        const dv = du + weight(e);
        const v = roads[e]!.to;
        if (dv < dist[v]!) {
          dist[v] = dv;
          heap.push(v, dv);
        }
      }
    }
    return dist;
  };
  const differences: number[] = [];
  let worst: RouteTimingError['worst'] = null;
  let largest = 0;
  zones.forEach((zone, z) => {
    const free = fromZone(zone.entryNodes, (e) => roads[e]!.travelTimeSeconds);
    const modelled = fromZone(zone.entryNodes, (e) => steps[e]! * dt);
    shelters.forEach((shelter, s) => {
      const f = free[shelter.node]!;
      if (!Number.isFinite(f)) return;
      const m = modelled[shelter.node]!;
      const d = Math.abs(m - f);
      differences.push(d);
      if (worst === null || d > largest) {
        largest = d;
        worst = { zone: z, shelter: s, freeFlowSeconds: f, modelledSeconds: m };
      }
    });
  });
  differences.sort((a, b) => a - b);
  const typical = differences.length === 0 ? 0 : differences[Math.floor((differences.length - 1) / 2)]!;
  return {
    method: 'node-potential-rounding',
    potential,
    pairs: differences.length,
    largestSeconds: largest,
    largestSteps: largest / dt,
    typicalSeconds: typical,
    worst,
  };
}

/** Steps offered when the model's route times drift, longest first. */
const SUGGESTED_STEPS_SECONDS = [300, 180, 120, 60, 30, 20, 15, 10, 5];

/**
 * The longest offered step (shorter than Δ) at which the zones' modelled trips should come within
 * one present step of free flow, or null when the difference is within one step already or no
 * offered step is short enough. The excess over free flow comes from roads off the fastest trips,
 * each rounded up to whole steps, so it shrinks about in proportion to the step: at step δ it is
 * about largest · δ/Δ, which is at most Δ for δ ≤ Δ²/largest.
 */
export function suggestedTimeStepSeconds(timing: Pick<RouteTimingError, 'largestSeconds'>, timeStepSeconds: number): number | null {
  const dt = timeStepSeconds;
  if (!(timing.largestSeconds > dt + 1e-9)) return null;
  const wanted = (dt * dt) / timing.largestSeconds;
  return SUGGESTED_STEPS_SECONDS.find((x) => x <= wanted && x < dt) ?? null;
}

/** A binary min-heap of node indices keyed by a double; a node is pushed again when its key falls, and callers skip the stale entries. */
class MinHeap {
  private nodes: Int32Array;
  private keys: Float64Array;
  size = 0;
  constructor(capacity: number) {
    this.nodes = new Int32Array(Math.max(16, capacity));
    this.keys = new Float64Array(Math.max(16, capacity));
  }
  push(node: number, key: number): void {
    if (this.size === this.nodes.length) {
      const nodes = new Int32Array(this.size * 2);
      nodes.set(this.nodes);
      const keys = new Float64Array(this.size * 2);
      keys.set(this.keys);
      this.nodes = nodes;
      this.keys = keys;
    }
    let i = this.size++;
    while (i > 0) {
      const parent = (i - 1) >> 1;
      if (this.keys[parent]! <= key) break;
      this.nodes[i] = this.nodes[parent]!;
      this.keys[i] = this.keys[parent]!;
      i = parent;
    }
    this.nodes[i] = node;
    this.keys[i] = key;
  }
  /** The key of the node last popped. */
  lastKey = 0;
  /** Removes and returns the node of the smallest key. */
  pop(): number {
    const top = this.nodes[0]!;
    this.lastKey = this.keys[0]!;
    const last = --this.size;
    const node = this.nodes[last]!;
    const key = this.keys[last]!;
    let i = 0;
    for (;;) {
      let child = 2 * i + 1;
      if (child >= last) break;
      if (child + 1 < last && this.keys[child + 1]! < this.keys[child]!) child++;
      if (this.keys[child]! >= key) break;
      this.nodes[i] = this.nodes[child]!;
      this.keys[i] = this.keys[child]!;
      i = child;
    }
    this.nodes[i] = node;
    this.keys[i] = key;
    return top;
  }
}

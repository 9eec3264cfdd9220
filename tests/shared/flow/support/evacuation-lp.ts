// The evacuation model of docs/model.md §1 written directly as linear programs for glpk.js, without
// the engine's network builders: the reference the engine's time expansion is checked against.
import type { EvacuationProblem, EvacuationRoad } from '../../../../shared/flow';
import { solveGeneralLp, type GeneralLp, type Glpk } from './glpk';

const NO_LIMIT = 1e9;
const perStep = (vehPerHour: number, dt: number): number => Math.floor((vehPerHour * dt) / 3600 + 1e-9);

/** Departures per step θ = 0..T by the documented rule (round(vehicles · share), never decreasing). */
export function departuresByStep(zone: EvacuationProblem['zones'][number], horizon: number): number[] {
  if (zone.releaseVehiclesByStep) return Array.from({ length: horizon + 1 }, (_, t) => zone.releaseVehiclesByStep![t] ?? 0);
  const shares = zone.releaseFractionByStep;
  if (!shares || shares.length === 0) return Array.from({ length: horizon + 1 }, (_, t) => (t === 0 ? zone.vehicles : 0));
  const out: number[] = [];
  let before = 0;
  for (let t = 0; t <= horizon; t++) {
    const byEnd = Math.max(before, Math.round(zone.vehicles * Math.min(1, shares[Math.min(t, shares.length - 1)]!)));
    out.push(byEnd - before);
    before = byEnd;
  }
  return out;
}

const closedForDeparture = (road: EvacuationRoad, step: number, dt: number): boolean =>
  (road.closures ?? []).some((c) => c.fromSeconds < (step + 1) * dt && (c.untilSeconds ?? Infinity) > step * dt && (c.untilSeconds ?? Infinity) > c.fromSeconds);

/** Bellman–Ford: shortest seconds from `origins` along (forward) or against (backward) the usable roads. */
function bellmanFord(problem: EvacuationProblem, origins: readonly number[], forward: boolean, weight: (e: number) => number): number[] {
  const dt = problem.timeStepSeconds;
  const dist = Array.from({ length: problem.nodeCount }, () => Infinity);
  for (const v of origins) dist[v] = 0;
  for (let round = 0; round < problem.nodeCount; round++) {
    let changed = false;
    problem.roads.forEach((road, e) => {
      if (perStep(road.capacityVehPerHour, dt) <= 0) return;
      const [a, b] = forward ? [road.from, road.to] : [road.to, road.from];
      if (dist[a]! + weight(e) < dist[b]!) {
        dist[b] = dist[a]! + weight(e);
        changed = true;
      }
    });
    if (!changed) break;
  }
  return dist;
}

/**
 * Travel steps per road by docs/model.md §1's rounding against node time potentials, written here
 * without the engine (Bellman–Ford where the engine uses Dijkstra). π is the free-flow time to
 * the nearest shelter ('to-shelters') or minus that from the nearest zone entry node
 * ('from-zones'), over roads carrying at least one vehicle per step;
 * τ_e = round(π(u)/Δ) − round(π(v)/Δ) + ⌈slack/Δ⌉; a road with an unreachable end, or that
 * carries nothing, keeps ⌈t/Δ⌉ ≥ 1; a zero-step road must climb to a higher step potential or
 * lead strictly down π (equal: to a lower node index), else it takes 1. Without `potential`, the
 * one whose zones' fastest trips to each shelter differ least from free flow (ties: shelters).
 */
export function referenceTravelSteps(problem: EvacuationProblem, potential?: 'to-shelters' | 'from-zones'): number[] {
  if (potential === undefined) {
    const shelters = referenceTravelSteps(problem, 'to-shelters');
    const zones = referenceTravelSteps(problem, 'from-zones');
    return largestTripDifference(problem, zones) < largestTripDifference(problem, shelters) - 1e-9 ? zones : shelters;
  }
  const dt = problem.timeStepSeconds;
  const usable = (road: EvacuationRoad): boolean => perStep(road.capacityVehPerHour, dt) > 0;
  const seconds = (e: number): number => problem.roads[e]!.travelTimeSeconds;
  const pi =
    potential === 'to-shelters'
      ? bellmanFord(problem, problem.shelters.map((s) => s.node), false, seconds)
      : bellmanFord(problem, problem.zones.flatMap((z) => z.entryNodes), true, seconds).map((d) => -d);
  const ceil = (x: number): number => Math.ceil(x - 1e-9);
  return problem.roads.map((road) => {
    const pu = pi[road.from]!;
    const pv = pi[road.to]!;
    if (!usable(road) || !Number.isFinite(pu) || !Number.isFinite(pv)) return Math.max(1, ceil(road.travelTimeSeconds / dt));
    const tau = Math.round(pu / dt) - Math.round(pv / dt) + Math.max(0, ceil(Math.max(0, road.travelTimeSeconds + pv - pu) / dt));
    if (tau > 0) return tau;
    return Math.round(pv / dt) > Math.round(pu / dt) || pv < pu || (pv === pu && road.to < road.from) ? 0 : 1;
  });
}

/** Largest |fastest modelled − fastest free-flow| trip time from a zone to a shelter it reaches. */
function largestTripDifference(problem: EvacuationProblem, steps: readonly number[]): number {
  let largest = 0;
  for (const zone of problem.zones) {
    const free = bellmanFord(problem, zone.entryNodes, true, (e) => problem.roads[e]!.travelTimeSeconds);
    const modelled = bellmanFord(problem, zone.entryNodes, true, (e) => steps[e]! * problem.timeStepSeconds);
    for (const shelter of problem.shelters) {
      if (Number.isFinite(free[shelter.node]!)) largest = Math.max(largest, Math.abs(modelled[shelter.node]! - free[shelter.node]!));
    }
  }
  return largest;
}

/**
 * Most vehicles delivered by the end of step `horizon` (time-expanded LP); travel steps per road
 * by `referenceTravelSteps` unless given.
 */
export function timeExpandedLpValue(glpk: Glpk, problem: EvacuationProblem, horizon: number, travelSteps: readonly number[] = referenceTravelSteps(problem)): number {
  const dt = problem.timeStepSeconds;
  const lp: GeneralLp = { variables: [], balances: [], objective: [] };
  const rows = new Map<string, { name: string; coef: number }[]>();
  const flow = (name: string, upper: number, from: string | null, to: string | null): void => {
    lp.variables.push({ name, upper });
    if (from) (rows.get(from) ?? rows.set(from, []).get(from)!).push({ name, coef: -1 });
    if (to) (rows.get(to) ?? rows.set(to, []).get(to)!).push({ name, coef: 1 });
  };
  // Storage at a node: Σ over entering roads, unlimited if any entering road gives none (or none enter).
  const storage = Array.from({ length: problem.nodeCount }, (_, v) => {
    const entering = problem.roads.filter((r) => r.to === v);
    if (entering.length === 0 || entering.some((r) => r.storageVehicles === undefined)) return NO_LIMIT;
    return Math.floor(entering.reduce((sum, r) => sum + r.storageVehicles!, 0) + 1e-9);
  });
  problem.roads.forEach((road, e) => {
    const tau = travelSteps[e]!;
    for (let t = 0; t + tau <= horizon; t++) {
      if (closedForDeparture(road, t, dt)) continue;
      flow(`road${e}_${t}`, perStep(road.capacityVehPerHour, dt), `n${road.from}_${t}`, `n${road.to}_${t + tau}`);
    }
  });
  for (let v = 0; v < problem.nodeCount; v++) {
    for (let t = 0; t < horizon; t++) flow(`wait${v}_${t}`, storage[v]!, `n${v}_${t}`, `n${v}_${t + 1}`);
  }
  problem.zones.forEach((zone, z) => {
    const departures = departuresByStep(zone, horizon);
    for (let t = 0; t <= horizon; t++) {
      flow(`release${z}_${t}`, departures[t]!, null, `z${z}_${t}`);
      if (t < horizon) flow(`home${z}_${t}`, NO_LIMIT, `z${z}_${t}`, `z${z}_${t + 1}`);
      let exit = `z${z}_${t}`;
      if (zone.releaseVehPerHour !== undefined) {
        exit = `gate${z}_${t}`;
        flow(`gate${z}_${t}`, perStep(zone.releaseVehPerHour, dt), `z${z}_${t}`, exit);
      }
      for (const v of new Set(zone.entryNodes)) flow(`enter${z}_${v}_${t}`, NO_LIMIT, exit, `n${v}_${t}`);
    }
  });
  problem.shelters.forEach((shelter, s) => {
    const intake = shelter.intakeVehPerHour === undefined ? NO_LIMIT : perStep(shelter.intakeVehPerHour, dt);
    for (let t = 0; t <= horizon; t++) flow(`arrive${s}_${t}`, intake, `n${shelter.node}_${t}`, `c${s}`);
    flow(`total${s}`, shelter.capacityVehicles === null ? NO_LIMIT : Math.floor(shelter.capacityVehicles), `c${s}`, null);
    lp.objective.push({ name: `total${s}`, coef: 1 });
  });
  for (const [name, terms] of rows) lp.balances.push({ name, terms: mergeTerms(terms) });
  return solveGeneralLp(glpk, lp);
}

/** The steady-state (static, per hour) maximum flow at the instant `atSeconds`. */
export function steadyStateLpValue(glpk: Glpk, problem: EvacuationProblem, atSeconds = 0): number {
  const lp: GeneralLp = { variables: [], balances: [], objective: [] };
  const rows = new Map<string, { name: string; coef: number }[]>();
  const flow = (name: string, upper: number, from: string | null, to: string | null): void => {
    lp.variables.push({ name, upper });
    if (from) (rows.get(from) ?? rows.set(from, []).get(from)!).push({ name, coef: -1 });
    if (to) (rows.get(to) ?? rows.set(to, []).get(to)!).push({ name, coef: 1 });
  };
  problem.roads.forEach((road, e) => {
    const closed = (road.closures ?? []).some((c) => c.fromSeconds <= atSeconds && atSeconds < (c.untilSeconds ?? Infinity));
    flow(`road${e}`, closed ? 0 : Math.floor(road.capacityVehPerHour + 1e-9), `n${road.from}`, `n${road.to}`);
  });
  problem.zones.forEach((zone, z) => {
    const rate = zone.vehicles === 0 ? 0 : zone.releaseVehPerHour === undefined ? NO_LIMIT : Math.floor(zone.releaseVehPerHour);
    flow(`zone${z}`, rate, null, `z${z}`);
    for (const v of new Set(zone.entryNodes)) flow(`enter${z}_${v}`, NO_LIMIT, `z${z}`, `n${v}`);
  });
  problem.shelters.forEach((shelter, s) => {
    const rate = shelter.capacityVehicles === 0 ? 0 : shelter.intakeVehPerHour === undefined ? NO_LIMIT : Math.floor(shelter.intakeVehPerHour);
    flow(`shelter${s}`, rate, `n${shelter.node}`, null);
    lp.objective.push({ name: `shelter${s}`, coef: 1 });
  });
  for (const [name, terms] of rows) lp.balances.push({ name, terms: mergeTerms(terms) });
  return solveGeneralLp(glpk, lp);
}

/** A self-loop puts one variable twice in a row (glpk refuses duplicates): add the coefficients. */
function mergeTerms(terms: { name: string; coef: number }[]): { name: string; coef: number }[] {
  const sum = new Map<string, number>();
  for (const t of terms) sum.set(t.name, (sum.get(t.name) ?? 0) + t.coef);
  return [...sum.entries()].filter(([, coef]) => coef !== 0).map(([name, coef]) => ({ name, coef }));
}

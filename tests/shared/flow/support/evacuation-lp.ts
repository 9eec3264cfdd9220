// The evacuation model of DOMAIN.md §1 written directly as linear programs for glpk.js, without
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

/** Most vehicles delivered by the end of step `horizon` (time-expanded LP). */
export function timeExpandedLpValue(glpk: Glpk, problem: EvacuationProblem, horizon: number): number {
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
    const tau = Math.max(1, Math.ceil(road.travelTimeSeconds / dt - 1e-9));
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

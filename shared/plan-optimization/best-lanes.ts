// The best k improvements: which roads should get added lanes, within a budget, to raise the
// steady-state throughput the most. Each candidate road e may get up to maxLanes lanes, each
// adding its per-lane capacity a_e at cost c_e (default 1, so the budget counts lanes).
//
//   max  Σ flow out of the source
//   s.t. conservation at every other node, 0 ≤ x_a ≤ cap_a for every arc,
//        x_e ≤ cap_e + a_e·y_e for candidates, y_e ∈ {0..maxLanes}, Σ c_e·y_e ≤ budget.
//
// Exact as a mixed-integer program (the caller's LinearSolver, glpk.js on the server) up to
// MIP_MAX_ARCS arcs and MIP_MAX_CANDIDATES candidates and within the time limit. Beyond that a
// greedy search: each step adds the lane with the largest exact gain per cost (re-evaluated from
// the current maximum flow; only roads of the current minimum cut can gain), and the LP
// relaxation's optimum is reported beside it as the bound (when the LP is within LP_MAX_ARCS).

import {
  buildSteadyStateNetwork,
  copyFlowState,
  createIncrementalBfs,
  emptyStats,
  floorCapacity,
  laneCapacity,
  maxFlow,
  UNBOUNDED_CAPACITY,
  type EvacuationProblem,
  type SteadyStateNetwork,
} from '../flow';
import type { LinearProgram, LinearSolver } from './linear-program';
import { checkAbort, type OptimisationHooks } from './problem-tools';

/** The documented size up to which the exact MIP is tried. */
export const MIP_MAX_ARCS = 10_000;
export const MIP_MAX_CANDIDATES = 5_000;
export const MIP_TIME_LIMIT_SECONDS = 20;
/** Largest network whose LP relaxation is solved for the bound. */
export const LP_MAX_ARCS = 60_000;

export interface LaneCandidate {
  road: number;
  /** Cost of one lane (default 1). */
  costPerLane?: number;
  /** Most lanes added on this road (default options.maxLanesPerRoad). */
  maxLanes?: number;
}

export interface LaneOptions extends OptimisationHooks {
  /** Total budget: lanes when every cost is 1. */
  budget: number;
  /** Default all roads open at atSeconds with some per-lane capacity. */
  candidates?: readonly LaneCandidate[];
  maxLanesPerRoad?: number;
  atSeconds?: number;
  /** Force the method (tests); default: 'mip' when within the size limits and a solver is given. */
  method?: 'mip' | 'greedy';
}

export interface LanePick {
  road: number;
  lanes: number;
  addedVehPerHour: number;
  cost: number;
}

export interface LaneStep {
  road: number;
  /** Throughput after this step and the gain of this step alone. */
  throughputVehPerHour: number;
  gainVehPerHour: number;
}

export interface LaneImprovement {
  baseVehPerHour: number;
  achievedVehPerHour: number;
  picks: LanePick[];
  /** Greedy: one entry per lane in the order chosen. MIP: the optimal picks added one at a time, each exactly evaluated. */
  steps: LaneStep[];
  method: 'mip' | 'greedy';
  /** True when the answer is proven optimal (MIP solved to optimality). */
  exact: boolean;
  /** LP relaxation optimum (an upper bound), null when not computed (size). */
  boundVehPerHour: number | null;
  budget: number;
  spent: number;
  note: string;
  unbounded: boolean;
}

function defaultCandidates(problem: EvacuationProblem, steady: SteadyStateNetwork, maxLanes: number): LaneCandidate[] {
  return problem.roads
    .map((road, e) => ({ road: e, lane: steady.roadClosed[e] ? 0 : floorCapacity(laneCapacity(road)) }))
    .filter((c) => c.lane > 0)
    .map((c) => ({ road: c.road, maxLanes }));
}

/** The lane program over the steady-state network; `integer` false gives the LP relaxation. */
export function laneProgram(
  problem: EvacuationProblem,
  steady: SteadyStateNetwork,
  candidates: readonly LaneCandidate[],
  budget: number,
  maxLanesPerRoad: number,
  integer: boolean,
): LinearProgram {
  // In the integer program a tiny cost per lane (together below one vehicle per hour) picks,
  // among the optima, one without lanes that add nothing. Flows are integers, so it never trades
  // away throughput. The relaxation (the bound) has no such cost.
  const totalCost = candidates.reduce((sum, c) => sum + (c.costPerLane ?? 1) * (c.maxLanes ?? maxLanesPerRoad), 0);
  const penalty = integer ? 1 / (2 * (totalCost + 1)) : 0;
  const { network, source, sink } = steady;
  const { residualOfArc, head, mate, capacity } = network;
  const variables: LinearProgram['variables'] = [];
  const balance = new Map<number, { name: string; coef: number }[]>();
  const objective: LinearProgram['objective'] = [];
  const upgrade = new Map(candidates.map((c) => [c.road, c]));
  const rows: LinearProgram['rows'] = [];
  for (let a = 0; a < network.arcCount; a++) {
    const r = residualOfArc[a]!;
    const from = head[mate[r]!]!;
    const to = head[r]!;
    const cap = capacity[r]!;
    const name = `x${a}`;
    const candidate = a < problem.roads.length ? upgrade.get(a) : undefined;
    variables.push({ name, lower: 0, upper: candidate ? null : cap === UNBOUNDED_CAPACITY ? null : cap });
    if (from === source) objective.push({ name, coef: 1 });
    if (to === source) objective.push({ name, coef: -1 });
    if (from !== source && from !== sink) (balance.get(from) ?? balance.set(from, []).get(from)!).push({ name, coef: -1 });
    if (to !== source && to !== sink) (balance.get(to) ?? balance.set(to, []).get(to)!).push({ name, coef: 1 });
    if (candidate) {
      const y = `y${a}`;
      const lanes = candidate.maxLanes ?? maxLanesPerRoad;
      variables.push({ name: y, lower: 0, upper: lanes, integer });
      if (penalty > 0) objective.push({ name: y, coef: -penalty * (candidate.costPerLane ?? 1) });
      rows.push({ name: `cap${a}`, terms: [{ name, coef: 1 }, { name: y, coef: -floorCapacity(laneCapacity(problem.roads[a]!)) }], lower: null, upper: cap });
    }
  }
  for (const [v, terms] of balance) rows.push({ name: `node${v}`, terms, lower: 0, upper: 0 });
  if (candidates.length > 0) {
    rows.push({ name: 'budget', terms: candidates.map((c) => ({ name: `y${c.road}`, coef: c.costPerLane ?? 1 })), lower: null, upper: budget });
  }
  return { variables, rows, objective };
}

export function bestLaneImprovements(problem: EvacuationProblem, options: LaneOptions, solver?: LinearSolver): LaneImprovement {
  const at = options.atSeconds ?? 0;
  const maxLanes = options.maxLanesPerRoad ?? 2;
  const steady = buildSteadyStateNetwork(problem, at);
  const { network, source, sink } = steady;
  const base = maxFlow(network, source, sink, { shouldAbort: options.shouldAbort });
  const candidates = (options.candidates ?? defaultCandidates(problem, steady, maxLanes)).filter(
    (c) => c.road >= 0 && c.road < problem.roads.length && !steady.roadClosed[c.road] && floorCapacity(laneCapacity(problem.roads[c.road]!)) > 0,
  );
  const laneOf = (e: number): number => floorCapacity(laneCapacity(problem.roads[e]!));
  const costOf = (e: number): number => candidates.find((c) => c.road === e)?.costPerLane ?? 1;
  const budget = options.budget;
  const empty: LaneImprovement = {
    baseVehPerHour: base.value,
    achievedVehPerHour: base.value,
    picks: [],
    steps: [],
    method: 'greedy',
    exact: candidates.length === 0 || budget <= 0,
    boundVehPerHour: candidates.length === 0 || budget <= 0 ? base.value : null,
    budget,
    spent: 0,
    note: '',
    unbounded: base.unbounded,
  };
  if (base.unbounded) return { ...empty, exact: false, note: 'The steady state has no finite bottleneck: added lanes cannot be ranked.' };
  if (candidates.length === 0 || budget <= 0) return { ...empty, note: 'No candidate road or no budget.' };

  const withinMip = network.arcCount <= MIP_MAX_ARCS && candidates.length <= MIP_MAX_CANDIDATES;
  const bound =
    solver && network.arcCount <= LP_MAX_ARCS
      ? solver.solve(laneProgram(problem, steady, candidates, budget, maxLanes, false), { timeLimitSeconds: MIP_TIME_LIMIT_SECONDS })
      : null;
  const boundValue = bound && bound.status === 'optimal' ? Math.floor(bound.objective + 1e-6) : null;
  options.onProgress?.(0.2);

  // Evaluates a list of lane picks step by step, exactly, warm-started from the base flow.
  const replay = (order: number[]): LaneStep[] => {
    const work = copyFlowState(base.state);
    const solver2 = createIncrementalBfs(network, work.residual, source, sink, network.nodeCount);
    solver2.maximise(emptyStats(), options.shouldAbort);
    let value = base.value;
    return order.map((e) => {
      solver2.raiseCapacity(network.residualOfArc[e]!, laneOf(e));
      const gain = solver2.maximise(emptyStats(), options.shouldAbort);
      value += gain;
      return { road: e, throughputVehPerHour: value, gainVehPerHour: gain };
    });
  };
  const picksOf = (order: number[]): LanePick[] => {
    const count = new Map<number, number>();
    for (const e of order) count.set(e, (count.get(e) ?? 0) + 1);
    return [...count.entries()].map(([road, lanes]) => ({ road, lanes, addedVehPerHour: lanes * laneOf(road), cost: lanes * costOf(road) }));
  };

  if (solver && withinMip && options.method !== 'greedy') {
    const mip = solver.solve(laneProgram(problem, steady, candidates, budget, maxLanes, true), { timeLimitSeconds: MIP_TIME_LIMIT_SECONDS });
    if (mip.status === 'optimal') {
      const order: number[] = [];
      for (const c of candidates) {
        const lanes = Math.round(mip.values[`y${c.road}`] ?? 0);
        for (let i = 0; i < lanes; i++) order.push(c.road);
      }
      const needed = order;
      const finalSteps = replay(needed);
      const achieved = finalSteps.length > 0 ? finalSteps[finalSteps.length - 1]!.throughputVehPerHour : base.value;
      options.onProgress?.(1);
      return {
        baseVehPerHour: base.value,
        achievedVehPerHour: achieved,
        picks: picksOf(needed),
        steps: finalSteps,
        method: 'mip',
        exact: true,
        boundVehPerHour: boundValue,
        budget,
        spent: needed.reduce((s, e) => s + costOf(e), 0),
        note: 'Exact: the mixed-integer program was solved to optimality.',
        unbounded: false,
      };
    }
  }

  // Greedy with exact re-evaluation from the current maximum flow.
  const work = copyFlowState(base.state);
  const inc = createIncrementalBfs(network, work.residual, source, sink, network.nodeCount);
  inc.maximise(emptyStats(), options.shouldAbort);
  const added = new Map<number, number>();
  let spent = 0;
  let value = base.value;
  const steps: LaneStep[] = [];
  let stoppedEarly = false;
  for (;;) {
    checkAbort(options);
    const saved = inc.save();
    // Roads crossing the current minimum cut: the only ones a lane can help.
    const cut = maxFlow(network, source, sink, { state: copyFlowState(work), algorithm: 'edmonds-karp' }).minCut.cutArcs;
    let best: { e: number; gain: number; ratio: number } | null = null;
    for (const arc of cut) {
      const c = arc < problem.roads.length ? candidates.find((x) => x.road === arc) : undefined;
      if (!c) continue;
      const cost = c.costPerLane ?? 1;
      if ((added.get(arc) ?? 0) >= (c.maxLanes ?? maxLanes) || spent + cost > budget + 1e-9) continue;
      inc.raiseCapacity(network.residualOfArc[arc]!, laneOf(arc));
      const gain = inc.maximise(emptyStats(), options.shouldAbort);
      inc.restore(saved);
      const ratio = gain / cost;
      if (gain > 0 && (!best || ratio > best.ratio || (ratio === best.ratio && arc < best.e))) best = { e: arc, gain, ratio };
    }
    if (!best) {
      stoppedEarly = spent < budget;
      break;
    }
    inc.raiseCapacity(network.residualOfArc[best.e]!, laneOf(best.e));
    inc.maximise(emptyStats(), options.shouldAbort);
    value += best.gain;
    spent += costOf(best.e);
    added.set(best.e, (added.get(best.e) ?? 0) + 1);
    steps.push({ road: best.e, throughputVehPerHour: value, gainVehPerHour: best.gain });
    options.onProgress?.(0.2 + 0.8 * Math.min(1, spent / budget));
  }
  options.onProgress?.(1);
  const reason = !solver
    ? 'no LP solver was available'
    : !withinMip
      ? `the network (${network.arcCount} arcs, ${candidates.length} candidates) is above the exact limit (${MIP_MAX_ARCS} arcs, ${MIP_MAX_CANDIDATES} candidates)`
      : options.method === 'greedy'
        ? 'greedy was requested'
        : `the mixed-integer program did not finish within ${MIP_TIME_LIMIT_SECONDS} s`;
  return {
    baseVehPerHour: base.value,
    achievedVehPerHour: value,
    picks: picksOf(steps.map((s) => s.road)),
    steps,
    method: 'greedy',
    exact: boundValue !== null && value >= boundValue,
    boundVehPerHour: boundValue,
    budget,
    spent,
    note:
      `Greedy search (${reason}): each lane was chosen by its exact gain given the lanes before it; the LP relaxation bounds the best possible.` +
      (stoppedEarly ? ' It stopped when no single further lane added throughput; lanes on two roads together might still.' : ''),
    unbounded: false,
  };
}

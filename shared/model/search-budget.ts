// What a search over time builds, against the run budget (run-budget.ts), and on which layout of
// the time-expanded network it runs: the implicit one (shared/flow/implicit-expanded.ts, a run's
// 10 bytes per arc), or for closures the written-out one (shared/flow/time-expanded.ts) where that
// fits; past the budget the search is refused with what to change. Bytes per arc and node are counted from the arrays
// each layout allocates (below); the implicit figures are the run's, measured on the generated
// county (tests/bench/flow/README.md), and the searches' peaks on the county are in
// tests/bench/optimization/README.md.
import type { EvacuationProblem } from '../flow';
import { BYTES_PER_EXPANDED_ARC, BYTES_PER_EXPANDED_NODE, budgetRefusal, expandedSize, fits, type ExpandedBytes, type NetworkSize, type RunBudget } from './run-budget';

export type SearchLayout = 'explicit' | 'implicit';
/** The searches that solve over time (best added lanes works on the steady state only). */
export type OverTimeSearch = 'contraflow' | 'closures' | 'release-order' | 'zone-routes';

/**
 * Written out: head, mate and capacity of both residual arcs (24 bytes), the arc's residual id,
 * kind and reference (9), the flow's two residuals (8): 41 bytes; taking the plan apart into
 * paths adds an arc index per residual arc and a copy of the residuals (16). Per node copy: the
 * forward star's start, the walk's next arc and a solver's arrays (about 32).
 */
const WRITTEN_OUT: ExpandedBytes = { perArc: 57, perNode: 40 };
/** Closures also keep the base flow while each road works on a copy, and one more while the horizon grows: 16 bytes per arc; the sink tree's per-node arrays: 20. */
const WRITTEN_OUT_CLOSURES: ExpandedBytes = { perArc: 73, perNode: 60 };
/**
 * Implicit: a run's per node, and the path walk's next arc; per arc a run's 10 bytes and 6 more,
 * because a search builds one network after another and the last one's memory is not always
 * returned before the next is built: on the generated county at 60 s over 6 h (183.5 million
 * arcs, 32.5 million node copies) the quickest departure order peaked at 3,427 MiB, where one
 * network is 2.3 GB (tests/bench/optimization/README.md); 16 and 26 bound that by 5 % (3,606 MiB).
 */
const IMPLICIT: ExpandedBytes = { perArc: BYTES_PER_EXPANDED_ARC + 6, perNode: BYTES_PER_EXPANDED_NODE + 4 };
/** Closures on the implicit layout keep the kept paths and each road's change journal (16 bytes per change) beside the base flow: 2 bytes per arc more. */
const IMPLICIT_CLOSURES: ExpandedBytes = { perArc: IMPLICIT.perArc + 2, perNode: IMPLICIT.perNode };

export function searchBytes(search: OverTimeSearch, layout: SearchLayout): ExpandedBytes {
  if (layout === 'explicit') return search === 'closures' ? WRITTEN_OUT_CLOSURES : WRITTEN_OUT;
  return search === 'closures' ? IMPLICIT_CLOSURES : IMPLICIT;
}

/** The problem's size in the terms of run-budget.ts (as the run's own check counts it). */
export function problemNetworkSize(problem: EvacuationProblem): NetworkSize {
  const entries = problem.zones.reduce((sum, z) => sum + z.entryNodes.length + 2, 0) + 2 * problem.shelters.length;
  return { nodeCount: problem.nodeCount, roads: problem.roads.length, entries };
}

export type LayoutChoice = { layout: SearchLayout; refusal: null } | { layout: null; refusal: string };

/**
 * Closures' clearance is faster written out, where its warm start reuses the base plan's sink tree
 * (6.7 s of CPU against 12.2 s implicit for 20 roads on the demo town); the other searches took as
 * much CPU or less on the implicit layout there (tests/bench/optimization/README.md), with less
 * memory, so they always run on it.
 */
const WRITTEN_OUT_FIRST: ReadonlySet<OverTimeSearch> = new Set(['closures']);

/**
 * The layout a search runs on: for closures the written-out one when what it builds there fits
 * the budget, else (and for the other searches) the implicit one when that fits, else a refusal
 * that says what to change (a coarser step or a shorter horizon).
 */
export function chooseSearchLayout(search: OverTimeSearch, problem: EvacuationProblem, budget: RunBudget): LayoutChoice {
  const network = problemNetworkSize(problem);
  const T = problem.horizonSteps;
  for (const layout of WRITTEN_OUT_FIRST.has(search) ? (['explicit', 'implicit'] as const) : (['implicit'] as const)) {
    if (fits(expandedSize(network.nodeCount, network.roads, T, network.entries, searchBytes(search, layout)), budget)) return { layout, refusal: null };
  }
  const refusal = budgetRefusal(
    network,
    { horizonMinutes: (T * problem.timeStepSeconds) / 60, timeStepSeconds: problem.timeStepSeconds },
    budget,
    'about',
    network,
    searchBytes(search, 'implicit'),
  );
  return { layout: null, refusal: refusal ?? 'This search does not fit the server’s budget.' };
}

// What a run may cost, told before it starts: the time-expanded network's size in arcs and in
// bytes against the server's budget, and when it does not fit, the shortest coarser time step
// that does, with what that step changes. A coarser step keeps trips true to free flow within one
// step (road steps are rounded against node time potentials, shared/flow/route-timing.ts), so
// the cost of a coarser step is resolution, not a drift that grows with the route's length.

/**
 * Bytes per time-expanded arc for the whole solve, per arc of the formula below (every copy, the
 * ones the engine leaves out included, since the implicit network keeps a place for each):
 * two 4-byte residuals per (step, slot) (shared/flow/implicit-expanded.ts), the curve's undo-log
 * bits and allocation slack. Per node copy: incremental BFS's arrays (18 bytes) and the read-out's
 * (the check's balance and the cut's search run after the solver's arrays are released).
 * Measured on the generated county at 60 s over 6 h (tests/bench/flow/README.md): 2,333 MiB peak
 * RSS for 183.5 million arcs and 32.5 million node copies of the formula, which 10 per arc and 22
 * per node bound from above by 4 % (2,432 MiB).
 */
export const BYTES_PER_EXPANDED_ARC = 10;
/** Bytes per time-expanded node (see BYTES_PER_EXPANDED_ARC). */
export const BYTES_PER_EXPANDED_NODE = 22;

/** Steps offered when a run does not fit, shortest first. */
export const OFFERED_STEPS_SECONDS = [60, 90, 120, 180, 240, 300, 600, 900, 1800, 3600];

export type ExpandedSize = { arcs: number; nodes: number; bytes: number };
/** Bytes per time-expanded arc and per node copy of what is built (a run's by default; a search's: search-budget.ts). */
export type ExpandedBytes = { perArc: number; perNode: number };
export const RUN_BYTES: ExpandedBytes = { perArc: BYTES_PER_EXPANDED_ARC, perNode: BYTES_PER_EXPANDED_NODE };
export type RunBudget = { maxExpandedArcs: number; maxBytes: number };

export function horizonStepsOf(horizonMinutes: number, timeStepSeconds: number): number {
  return Math.max(1, Math.round((horizonMinutes * 60) / timeStepSeconds));
}

/**
 * The time-expanded size for `roads` directed roads on `nodeCount` junctions over T steps: a copy
 * of every road and a waiting arc at every junction for each of the T + 1 steps, plus `entries`
 * arcs per step (each zone's arcs to its entry nodes, and the zones' and shelters' own arcs:
 * zones spread over many junctions make this a tenth of the total on the generated county).
 * Closed steps make it smaller.
 */
export function expandedSize(nodeCount: number, roads: number, horizonSteps: number, entries = 0, cost: ExpandedBytes = RUN_BYTES): ExpandedSize {
  const layers = horizonSteps + 1;
  const arcs = (roads + nodeCount + entries) * layers;
  const nodes = nodeCount * layers;
  return { arcs, nodes, bytes: arcs * cost.perArc + nodes * cost.perNode };
}

export function fits(size: ExpandedSize, budget: RunBudget): boolean {
  return size.arcs <= budget.maxExpandedArcs && size.bytes <= budget.maxBytes;
}

/** 60 → "1 minute", 120 → "2 minutes", 90 → "90 seconds" (as shared/format/numbers formatStep, which the model may not import). */
function formatStep(seconds: number): string {
  if (seconds % 60 === 0) return seconds === 60 ? '1 minute' : `${seconds / 60} minutes`;
  return `${seconds} seconds`;
}

/** 180 → "3-minute", 90 → "90-second". */
function stepAdjective(seconds: number): string {
  return seconds % 60 === 0 ? `${seconds / 60}-minute` : `${seconds}-second`;
}

const millions = (n: number): string => (n >= 1e6 ? `${(n / 1e6).toFixed(1)} million` : Math.round(n).toLocaleString('en-US'));
const gigabytes = (bytes: number): string => (bytes >= 2 ** 30 ? `${(bytes / 2 ** 30).toFixed(1)} GB` : `${Math.ceil(bytes / 2 ** 20).toLocaleString('en-US')} MB`);

/**
 * Null when the run fits the budget; otherwise the refusal a planner can act on: the size, the
 * budget, the shortest offered coarser step that fits with its size and effect, and the longest
 * horizon that fits at the chosen step.
 */
export type NetworkSize = { nodeCount: number; roads: number; entries?: number };

export function budgetRefusal(
  network: NetworkSize,
  parameters: { horizonMinutes: number; timeStepSeconds: number },
  budget: RunBudget,
  /** 'about' for an exact count, 'more than' for a lower bound. */
  precision: 'about' | 'more than' = 'about',
  /** An upper bound of the network, for the coarser step and shorter horizon offered, so that
   *  what is offered on a lower bound is not refused when the exact size is known. */
  offerFor: NetworkSize = network,
  /** Bytes per arc and node of what is built (default a run's). */
  cost: ExpandedBytes = RUN_BYTES,
): string | null {
  const { horizonMinutes, timeStepSeconds } = parameters;
  const size = expandedSize(network.nodeCount, network.roads, horizonStepsOf(horizonMinutes, timeStepSeconds), network.entries, cost);
  if (fits(size, budget)) return null;
  const head =
    `This analysis would need ${precision} ${millions(size.arcs)} time-expanded arcs and ${gigabytes(size.bytes)} of memory, ` +
    `more than this server's budget of ${millions(budget.maxExpandedArcs)} arcs and ${gigabytes(budget.maxBytes)}.`;
  const coarser = OFFERED_STEPS_SECONDS.filter((s) => s > timeStepSeconds)
    .map((s) => ({ s, size: expandedSize(offerFor.nodeCount, offerFor.roads, horizonStepsOf(horizonMinutes, s), offerFor.entries, cost) }))
    .find((c) => fits(c.size, budget));
  const perLayer = expandedSize(offerFor.nodeCount, offerFor.roads, 0, offerFor.entries, cost);
  const layersThatFit = Math.min(Math.floor(budget.maxExpandedArcs / perLayer.arcs), Math.floor(budget.maxBytes / perLayer.bytes));
  const horizonThatFits = Math.floor(((layersThatFit - 1) * timeStepSeconds) / 60);
  const shorter =
    horizonThatFits >= 10 ? ` Or keep the ${formatStep(timeStepSeconds)} step and shorten the horizon to at most ${horizonThatFits} minutes.` : '';
  if (!coarser) return `${head} No time step up to one hour fits: use a smaller road layer or area.${shorter}`;
  const step = formatStep(coarser.s);
  const steps = `${stepAdjective(coarser.s)} steps`;
  return (
    `${head} At a time step of ${step} it fits (at most ${millions(coarser.size.arcs)} arcs, ${gigabytes(coarser.size.bytes)}). ` +
    `What that changes: travel times are counted in whole ${steps}, so each zone's fastest trips stay within ${step} of free flow ` +
    `(instead of ${formatStep(timeStepSeconds)}) on the way to the nearest shelter or exit (other trips can drift further, about in proportion to the step), ` +
    `and the curve, the clearance time and the 50/90/95 % times are read in ${steps}.${shorter}`
  );
}

// The one front door: maxFlow(network, source, sink, options). It picks or runs the requested
// algorithm, then reads the value, the arc flows and the minimum cut off the final residual.

import { MAX_EXACT_SUM, UNBOUNDED_CAPACITY } from './capacity';
import { boykovKolmogorov } from './boykov-kolmogorov';
import { dinic } from './dinic';
import { edmondsKarp } from './edmonds-karp';
import { incrementalBfs } from './incremental-bfs';
import { FlowInputError, FlowOverflowError } from './errors';
import { autoAugmentationLimit, incrementalBfsThenPushRelabel } from './handover';
import { chooseAuto, type AutoChoice } from './network-shape';
import { arcFlows, createFlowState, netOutflow, type FlowState } from './flow-state';
import { minimumCut, type MinimumCut } from './min-cut';
import type { FlowNetwork } from './flow-network';
import { pushRelabel } from './push-relabel';
import { emptyStats, type MaxFlowStats, type SolveContext } from './solve-context';

export type MaxFlowAlgorithm = 'edmonds-karp' | 'dinic' | 'push-relabel' | 'boykov-kolmogorov' | 'incremental-bfs';
export type MaxFlowAlgorithmChoice = MaxFlowAlgorithm | 'auto';
export const MAX_FLOW_ALGORITHMS: readonly MaxFlowAlgorithm[] = ['edmonds-karp', 'dinic', 'push-relabel', 'boykov-kolmogorov', 'incremental-bfs'];

/**
 * 'auto' runs Edmonds–Karp up to AUTO_THRESHOLD_ARCS arcs (it is the reference method and is fast
 * enough there); above, it decides by the network's shape before solving (network-shape.ts):
 * push-relabel where capacities are drawn from a wide range, otherwise incremental BFS, which
 * hands over to push-relabel when it makes more than AUTO_HANDOVER_AUGMENTATIONS_PER_ARC
 * augmentations per arc (handover.ts).
 */
export { AUTO_THRESHOLD_ARCS, chooseAuto, shapeFigures, type AutoChoice, type NetworkShape, type ShapeFigures } from './network-shape';

const RUNNERS: Record<MaxFlowAlgorithm, (ctx: SolveContext) => void> = {
  'edmonds-karp': edmondsKarp,
  dinic,
  'push-relabel': pushRelabel,
  'boykov-kolmogorov': boykovKolmogorov,
  'incremental-bfs': incrementalBfs,
};

/** Options of maxFlow; every field is optional. */
export interface MaxFlowOptions {
  /** Which algorithm; 'auto' (default) chooses by size and shape (network-shape.ts). */
  algorithm?: MaxFlowAlgorithmChoice;
  /** Continue from this flow instead of the empty one (warm start). It is updated in place. */
  state?: FlowState;
  /** Only nodes 0..nodeLimit − 1 take part (default: all). Lets a network grow by node ranges. */
  nodeLimit?: number;
  /** A clock in milliseconds; when given, stats.elapsedMs is filled in. */
  now?: () => number;
  /** Polled now and then; returning true throws FlowAbortedError. */
  shouldAbort?: () => boolean;
}

export interface MaxFlowResult {
  readonly source: number;
  readonly sink: number;
  readonly nodeLimit: number;
  /** Net flow out of the source. */
  readonly value: number;
  /** Flow on each input arc (index = input arc). */
  readonly flow: Int32Array;
  readonly minCut: MinimumCut;
  /** True when the minimum cut contains an arc of UNBOUNDED_CAPACITY: no finite bottleneck. */
  readonly unbounded: boolean;
  /** The algorithm that finished (under 'auto', push-relabel when incremental BFS handed over). */
  readonly algorithm: MaxFlowAlgorithm;
  /** Under 'auto': the shape it saw, the algorithm it started with and why; null when one was requested. */
  readonly autoChoice: AutoChoice | null;
  readonly stats: MaxFlowStats;
  /** The final residual capacities, for warm starts and what-if runs. */
  readonly state: FlowState;
}

/**
 * The algorithm 'auto' starts with on this network (incremental BFS may then hand over to
 * push-relabel). Without terminals the shape figures count the terminals' arcs too.
 */
export function chooseAlgorithm(network: FlowNetwork, nodeLimit = network.nodeCount, source = -1, sink = -1): MaxFlowAlgorithm {
  return chooseAuto(network, source, sink, nodeLimit).start;
}

/**
 * A maximum flow from source to sink and the minimum cut that proves it optimal.
 * Every algorithm returns the same value and the same cut (the source side is the set of nodes
 * reachable from the source in the final residual digraph).
 *
 * @throws FlowInputError for terminals out of range or equal; FlowOverflowError when the
 *   capacity leaving the source cannot be summed exactly; FlowAbortedError on shouldAbort.
 * @example
 *   // CLRS 3rd ed. Fig. 26.1 has value 23; a two-arc path has the smaller capacity:
 *   maxFlow(buildNetwork(3, [{ from: 0, to: 1, capacity: 5 }, { from: 1, to: 2, capacity: 3 }]), 0, 2).value; // 3
 */
export function maxFlow(
  network: FlowNetwork,
  source: number,
  sink: number,
  options: MaxFlowOptions = {},
): MaxFlowResult {
  const nodeLimit = options.nodeLimit ?? network.nodeCount;
  if (!Number.isInteger(nodeLimit) || nodeLimit < 0 || nodeLimit > network.nodeCount) {
    throw new FlowInputError(`nodeLimit ${nodeLimit} is outside 0..${network.nodeCount}`);
  }
  for (const [name, node] of [['source', source], ['sink', sink]] as const) {
    if (!Number.isInteger(node) || node < 0 || node >= nodeLimit) {
      throw new FlowInputError(`${name} ${node} is outside 0..${nodeLimit - 1}`);
    }
  }
  if (source === sink) throw new FlowInputError('source and sink must differ');
  checkSourceCapacity(network, source, nodeLimit);

  const choice = options.algorithm ?? 'auto';
  if (choice !== 'auto' && !RUNNERS[choice]) throw new FlowInputError(`unknown algorithm ${String(choice)}`);
  const state = options.state ?? createFlowState(network);
  if (state.residual.length !== network.capacity.length) {
    throw new FlowInputError('flow state belongs to another network');
  }

  const stats = emptyStats();
  const started = options.now?.();
  const { algorithm, autoChoice } = runChoice(choice, { network, residual: state.residual, source, sink, nodeLimit, stats, shouldAbort: options.shouldAbort });
  if (started !== undefined && options.now) stats.elapsedMs = options.now() - started;
  const minCut = minimumCut(network, state.residual, source, nodeLimit);

  let unbounded = false;
  for (const arc of minCut.cutArcs) {
    if (network.capacity[network.residualOfArc[arc]!] === UNBOUNDED_CAPACITY) unbounded = true;
  }
  return {
    source,
    sink,
    nodeLimit,
    value: netOutflow(network, state, source, nodeLimit),
    flow: arcFlows(network, state),
    minCut,
    unbounded,
    algorithm,
    autoChoice,
    stats,
    state,
  };
}

/**
 * The algorithm alone: brings `state` to a maximum flow and returns what ran, without reading
 * off flows or the cut (callers that solve many horizons or what-ifs do that only when needed).
 * Same preconditions as maxFlow, checked by the caller.
 */
export function maximiseInPlace(
  network: FlowNetwork,
  source: number,
  sink: number,
  state: FlowState,
  options: Pick<MaxFlowOptions, 'algorithm' | 'nodeLimit' | 'shouldAbort'> = {},
): { algorithm: MaxFlowAlgorithm; autoChoice: AutoChoice | null; stats: MaxFlowStats } {
  const nodeLimit = options.nodeLimit ?? network.nodeCount;
  const stats = emptyStats();
  const ctx = { network, residual: state.residual, source, sink, nodeLimit, stats, shouldAbort: options.shouldAbort };
  return { ...runChoice(options.algorithm ?? 'auto', ctx), stats };
}

/** Runs the chosen algorithm, or 'auto' by shape with its handover; returns the one that finished. */
function runChoice(choice: MaxFlowAlgorithmChoice, ctx: SolveContext): { algorithm: MaxFlowAlgorithm; autoChoice: AutoChoice | null } {
  if (choice !== 'auto') {
    RUNNERS[choice](ctx);
    return { algorithm: choice, autoChoice: null };
  }
  const autoChoice = chooseAuto(ctx.network, ctx.source, ctx.sink, ctx.nodeLimit);
  if (!autoChoice.handover) {
    RUNNERS[autoChoice.start](ctx);
    return { algorithm: autoChoice.start, autoChoice };
  }
  const algorithm = incrementalBfsThenPushRelabel(ctx, autoAugmentationLimit(ctx.network.firstOut[ctx.nodeLimit]! / 2));
  return { algorithm, autoChoice };
}

function checkSourceCapacity(network: FlowNetwork, source: number, nodeLimit: number): void {
  const { firstOut, head, capacity } = network;
  let total = 0;
  for (let r = firstOut[source]!, end = firstOut[source + 1]!; r < end; r++) {
    if (head[r]! < nodeLimit) total += capacity[r]!;
  }
  if (total > MAX_EXACT_SUM) {
    throw new FlowOverflowError(
      `capacity leaving the source (${total}) exceeds ${MAX_EXACT_SUM}; bound some source arcs`,
    );
  }
}

/** A JSON-ready copy of a result: typed arrays become number arrays, the source side a node list. */
export interface MaxFlowResultJson {
  source: number;
  sink: number;
  value: number;
  unbounded: boolean;
  algorithm: MaxFlowAlgorithm;
  autoChoice: AutoChoice | null;
  flow: number[];
  sourceSide: number[];
  cutArcs: number[];
  cutCapacity: number;
  stats: MaxFlowStats;
}

export function maxFlowResultToJson(result: MaxFlowResult): MaxFlowResultJson {
  const sourceSide: number[] = [];
  result.minCut.sourceSide.forEach((inSide, v) => {
    if (inSide) sourceSide.push(v);
  });
  return {
    source: result.source,
    sink: result.sink,
    value: result.value,
    unbounded: result.unbounded,
    algorithm: result.algorithm,
    autoChoice: result.autoChoice,
    flow: Array.from(result.flow),
    sourceSide,
    cutArcs: Array.from(result.minCut.cutArcs),
    cutCapacity: result.minCut.capacity,
    stats: { ...result.stats },
  };
}

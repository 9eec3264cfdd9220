// The evacuation curve: the maximum number of vehicles delivered by each step t = 0..T, each an
// exact maximum flow of the time-expanded network cut at horizon t. The horizons are nested
// (horizon t is the nodes below nodeLimitAtHorizon(t)), so the maximum flow for t is a feasible
// flow for t + 1 and the next horizon only augments from it. With the tree-based algorithms the
// search trees are kept as well, so each horizon costs roughly what its new layer adds.

import { createBoykovKolmogorov } from './boykov-kolmogorov';
import { FlowAbortedError } from './errors';
import { netOutflow, type FlowState } from './flow-state';
import { createIncrementalBfs } from './incremental-bfs';
import { maximiseInPlace, type MaxFlowAlgorithm } from './max-flow';
import { emptyStats, type MaxFlowStats } from './solve-context';
import { ResidualUndoLog } from './residual-undo-log';
import { nodeLimitAtHorizon, type TimeExpandedNetwork } from './time-expanded';

export interface CurveMarks {
  /** First step by which at least half of the demand has arrived, or null. */
  p50: number | null;
  p90: number | null;
  p95: number | null;
}

export interface CurveComputation {
  /** Index t = 0..T: the most vehicles that can have arrived by the end of step t. */
  deliveredByStep: number[];
  /** First t with everything delivered, or null when not within the horizon. */
  clearanceStep: number | null;
  marks: CurveMarks;
  /** The last horizon solved (min(T, clearanceStep)); `state` holds its maximum flow. */
  finalHorizon: number;
  /** The horizon whose minimum cut `takeCutResidual()` gives. */
  cutHorizon: number;
  /**
   * The residual capacities of a maximum flow at `cutHorizon`, not to be modified. When that is
   * the horizon before clearance (resumable solvers) they are rebuilt in `state` itself, which
   * from then on holds that horizon's flow instead of the final one: read the final flow first.
   * Otherwise the final state, or a copy taken at an explicit cut horizon.
   */
  takeCutResidual: () => Int32Array;
  stats: MaxFlowStats;
}

export interface CurveOptions {
  algorithm: MaxFlowAlgorithm;
  /** The horizon whose cut to keep; default: the last horizon before clearance, else T. */
  cutHorizon?: number;
  onHorizon?: (horizon: number) => void;
  shouldAbort?: () => boolean;
}

/** Steps at which a cumulative curve first reaches 50, 90 and 95 % of the demand. */
export function curveMarks(deliveredByStep: readonly number[], demand: number): CurveMarks {
  const first = (share: number): number | null => {
    const needed = Math.ceil(share * demand - 1e-9);
    const t = deliveredByStep.findIndex((delivered) => delivered >= needed);
    return t < 0 ? null : t;
  };
  return { p50: first(0.5), p90: first(0.9), p95: first(0.95) };
}

/**
 * Solves horizons 0..T in turn on `state` (which ends holding the maximum flow of the final
 * horizon) and gives the residual capacities at the cut horizon on request.
 *
 * The resumable solvers (incremental BFS, Boykov–Kolmogorov) log each arc pair's residual before
 * the horizon's first change to it (`ResidualUndoLog`), so the residual of the horizon before
 * clearance is rebuilt in place when asked for, and the delivered count is the running sum of the flow
 * each horizon adds: nothing is copied or rescanned per horizon beyond what the augmentations
 * touch. The other algorithms restart their search over every node below the limit at each
 * horizon anyway, so for them the residual prefix is copied after each horizon as before.
 */
export function computeEvacuationCurve(
  expanded: TimeExpandedNetwork,
  demand: number,
  state: FlowState,
  options: CurveOptions,
): CurveComputation {
  const { network, source, sink, horizonSteps: T } = expanded;
  const { residual } = state;
  const stats = emptyStats();
  const deliveredByStep: number[] = [];
  const explicitCut = options.cutHorizon;
  const resumable = options.algorithm === 'incremental-bfs' || options.algorithm === 'boykov-kolmogorov';
  const undoLog = resumable ? new ResidualUndoLog(network.mate, residual) : null;
  const persistent =
    options.algorithm === 'incremental-bfs'
      ? createIncrementalBfs(network, residual, source, sink, nodeLimitAtHorizon(expanded, 0), undefined, undoLog)
      : options.algorithm === 'boykov-kolmogorov'
        ? createBoykovKolmogorov(network, residual, source, sink, nodeLimitAtHorizon(expanded, 0), undoLog)
        : null;

  // For the other algorithms: residual capacities of the arcs of nodes below a horizon's limit
  // are a prefix of the array; the rest still equals the capacities, so the prefix is a snapshot.
  let snapshot: Int32Array | null = null;
  let snapshotHorizon = -1;
  const takeSnapshot = (horizon: number): void => {
    snapshot ??= network.capacity.slice();
    snapshot.set(residual.subarray(0, network.firstOut[nodeLimitAtHorizon(expanded, horizon)]!));
    snapshotHorizon = horizon;
  };

  let clearanceStep: number | null = null;
  let delivered = 0;
  let horizon = 0;
  for (; horizon <= T; horizon++) {
    if (options.shouldAbort?.()) throw new FlowAbortedError('evacuation curve aborted by the caller');
    const nodeLimit = nodeLimitAtHorizon(expanded, horizon);
    if (persistent) {
      undoLog!.startRound();
      if (horizon > 0) persistent.extendNodeLimit(nodeLimit);
      delivered += persistent.maximise(stats, options.shouldAbort);
    } else {
      const run = maximiseInPlace(network, source, sink, state, {
        algorithm: options.algorithm,
        nodeLimit,
        shouldAbort: options.shouldAbort,
      });
      addStats(stats, run.stats);
      delivered = netOutflow(network, state, source, nodeLimit);
    }
    deliveredByStep.push(delivered);
    options.onHorizon?.(horizon);
    if (delivered >= demand) {
      clearanceStep = horizon;
      break;
    }
    if (explicitCut === horizon) {
      snapshot = residual.slice();
      snapshotHorizon = horizon;
    } else if (!persistent && explicitCut === undefined) takeSnapshot(horizon);
  }
  const finalHorizon = Math.min(horizon, T);
  // Nothing more can arrive once everyone has: the rest of the curve is flat.
  while (deliveredByStep.length <= T) deliveredByStep.push(deliveredByStep[deliveredByStep.length - 1] ?? 0);

  const beforeClearance = explicitCut === undefined && clearanceStep !== null && clearanceStep > 0;
  let cutHorizon: number;
  let cut: () => Int32Array;
  if (explicitCut !== undefined && snapshotHorizon === explicitCut) {
    cutHorizon = explicitCut;
    cut = () => snapshot!;
  } else if (beforeClearance && persistent) {
    // Undoing the clearing horizon's changes leaves the maximum flow of the horizon before it.
    cutHorizon = clearanceStep! - 1;
    let undone = false;
    cut = () => {
      if (!undone) undoLog!.undoInto(residual);
      undone = true;
      return residual;
    };
  } else if (beforeClearance && snapshotHorizon === clearanceStep! - 1) {
    cutHorizon = snapshotHorizon;
    cut = () => snapshot!;
  } else {
    // Cleared at step 0, or an explicit cut horizon at or after clearance: the final flow's cut.
    cutHorizon = finalHorizon;
    cut = () => residual;
  }
  return {
    deliveredByStep,
    clearanceStep,
    marks: curveMarks(deliveredByStep, demand),
    finalHorizon,
    cutHorizon,
    takeCutResidual: cut,
    stats,
  };
}

function addStats(into: MaxFlowStats, from: MaxFlowStats): void {
  into.augmentations += from.augmentations;
  into.phases += from.phases;
  into.pushes += from.pushes;
  into.relabels += from.relabels;
  into.globalRelabels += from.globalRelabels;
}

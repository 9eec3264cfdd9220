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
  /** The horizon whose minimum cut `cutResidual` holds (see bottleneckHorizonFor). */
  cutHorizon: number;
  cutResidual: Int32Array;
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
 * horizon) and keeps a copy of the residual capacities at the cut horizon.
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
  // Residual capacities of the arcs of nodes below a horizon's limit are a prefix of the array;
  // the rest still equals the capacities, so copying the prefix is a full snapshot.
  const snapshot = network.capacity.slice();
  let snapshotHorizon = -1;
  const takeSnapshot = (horizon: number): void => {
    snapshot.set(residual.subarray(0, network.firstOut[nodeLimitAtHorizon(expanded, horizon)]!));
    snapshotHorizon = horizon;
  };

  const persistent =
    options.algorithm === 'incremental-bfs'
      ? createIncrementalBfs(network, residual, source, sink, nodeLimitAtHorizon(expanded, 0))
      : options.algorithm === 'boykov-kolmogorov'
        ? createBoykovKolmogorov(network, residual, source, sink, nodeLimitAtHorizon(expanded, 0))
        : null;

  let clearanceStep: number | null = null;
  let horizon = 0;
  for (; horizon <= T; horizon++) {
    if (options.shouldAbort?.()) throw new FlowAbortedError('evacuation curve aborted by the caller');
    const nodeLimit = nodeLimitAtHorizon(expanded, horizon);
    if (persistent) {
      if (horizon > 0) persistent.extendNodeLimit(nodeLimit);
      persistent.maximise(stats, options.shouldAbort);
    } else {
      const run = maximiseInPlace(network, source, sink, state, {
        algorithm: options.algorithm,
        nodeLimit,
        shouldAbort: options.shouldAbort,
      });
      addStats(stats, run.stats);
    }
    const delivered = netOutflow(network, state, source, nodeLimit);
    deliveredByStep.push(delivered);
    options.onHorizon?.(horizon);
    if (delivered >= demand) {
      clearanceStep = horizon;
      break;
    }
    if (explicitCut === undefined || explicitCut === horizon) takeSnapshot(horizon);
  }
  const finalHorizon = Math.min(horizon, T);
  // Nothing more can arrive once everyone has: the rest of the curve is flat.
  while (deliveredByStep.length <= T) deliveredByStep.push(deliveredByStep[deliveredByStep.length - 1] ?? 0);

  let cutHorizon: number;
  let cutResidual: Int32Array;
  if (explicitCut !== undefined && snapshotHorizon === explicitCut) {
    cutHorizon = explicitCut;
    cutResidual = snapshot;
  } else if (explicitCut === undefined && clearanceStep !== null && clearanceStep > 0 && snapshotHorizon === clearanceStep - 1) {
    cutHorizon = snapshotHorizon;
    cutResidual = snapshot;
  } else {
    // Cleared at step 0, or an explicit cut horizon at or after clearance: the final flow's cut.
    cutHorizon = finalHorizon;
    cutResidual = residual.slice();
  }
  return {
    deliveredByStep,
    clearanceStep,
    marks: curveMarks(deliveredByStep, demand),
    finalHorizon,
    cutHorizon,
    cutResidual,
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

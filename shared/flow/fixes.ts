// The most valuable fix: for each road of the static minimum cut, how many more vehicles per
// hour the network would carry with one more lane; for each road closed at the snapshot instant
// whose reopening could help, the gain from reopening it. Each what-if augments from the current
// maximum flow (only paths through the changed road can appear) and is then undone.

import { floorCapacity, raisedResidual } from './capacity';
import type { EvacuationProblem } from './evacuation-problem';
import { FlowAbortedError } from './errors';
import { copyFlowState, netOutflow } from './flow-state';
import { createIncrementalBfs } from './incremental-bfs';
import { maximiseInPlace, type MaxFlowAlgorithm, type MaxFlowResult } from './max-flow';
import { emptyStats } from './solve-context';
import type { SteadyStateNetwork } from './steady-state';

export interface RoadFix {
  kind: 'add-lane' | 'reopen';
  road: number;
  /** Capacity the fix adds (one lane, or the whole road when reopened). */
  addedVehPerHour: number;
  /** Increase of the steady-state maximum flow. */
  gainVehPerHour: number;
}

export interface FixOptions {
  algorithm: MaxFlowAlgorithm;
  /** At most this many what-ifs are solved (largest added capacity first). */
  maxEvaluations: number;
  onEvaluated?: (done: number, total: number) => void;
  shouldAbort?: () => boolean;
}

/** Capacity one more lane adds: the per-lane figure if given, else capacity / lanes. */
export function laneCapacity(road: EvacuationProblem['roads'][number]): number {
  if (road.capacityVehPerHourPerLane !== undefined) return road.capacityVehPerHourPerLane;
  return road.capacityVehPerHour / (road.lanes ?? 1);
}

/**
 * Ranks the fixes, largest gain first (ties: smaller road index). Only roads crossing the
 * minimum cut can gain anything: raising an arc that does not leave the source side opens no
 * augmenting path. Returns whether some candidates were left out by maxEvaluations.
 */
export function rankFixes(
  problem: EvacuationProblem,
  steady: SteadyStateNetwork,
  result: MaxFlowResult,
  options: FixOptions,
): { fixes: RoadFix[]; truncated: boolean } {
  const { network, source, sink } = steady;
  const candidates: Omit<RoadFix, 'gainVehPerHour'>[] = [];
  for (const arc of result.minCut.cutArcs) {
    if (arc >= problem.roads.length) continue;
    const road = problem.roads[arc]!;
    const added = steady.roadClosed[arc] ? floorCapacity(road.capacityVehPerHour) : floorCapacity(laneCapacity(road));
    if (added > 0) candidates.push({ kind: steady.roadClosed[arc] ? 'reopen' : 'add-lane', road: arc, addedVehPerHour: added });
  }
  candidates.sort((a, b) => b.addedVehPerHour - a.addedVehPerHour || a.road - b.road);
  const truncated = candidates.length > options.maxEvaluations;
  const chosen = candidates.slice(0, options.maxEvaluations);
  const base = result.value;
  const fixes: RoadFix[] = [];

  if (options.algorithm === 'incremental-bfs') {
    // Keep the search trees between what-ifs: each one then costs only its own augmentations.
    const work = copyFlowState(result.state);
    const solver = createIncrementalBfs(network, work.residual, source, sink, network.nodeCount);
    solver.maximise(emptyStats(), options.shouldAbort);
    const saved = solver.save();
    chosen.forEach((candidate, k) => {
      if (options.shouldAbort?.()) throw new FlowAbortedError('fix ranking aborted by the caller');
      solver.raiseCapacity(network.residualOfArc[candidate.road]!, candidate.addedVehPerHour);
      const gain = solver.maximise(emptyStats(), options.shouldAbort);
      fixes.push({ ...candidate, gainVehPerHour: gain });
      solver.restore(saved);
      options.onEvaluated?.(k + 1, chosen.length);
    });
  } else {
    chosen.forEach((candidate, k) => {
      const work = copyFlowState(result.state);
      const r = network.residualOfArc[candidate.road]!;
      work.residual[r] = raisedResidual(work.residual, network.mate, r, candidate.addedVehPerHour);
      maximiseInPlace(network, source, sink, work, { algorithm: options.algorithm, shouldAbort: options.shouldAbort });
      // Road arcs never touch the super source, so its net outflow still reads correctly.
      fixes.push({ ...candidate, gainVehPerHour: netOutflow(network, work, source) - base });
      options.onEvaluated?.(k + 1, chosen.length);
    });
  }
  fixes.sort((a, b) => b.gainVehPerHour - a.gainVehPerHour || a.road - b.road);
  return { fixes, truncated };
}

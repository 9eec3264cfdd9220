// The evacuation curve (evacuation-curve.ts) on the implicit time-expanded network with
// incremental BFS: horizons 0..T solved in turn, each from the previous one's maximum flow, the
// delivered count kept as the running sum of the flow each horizon adds, and the residual of the
// horizon before clearance rebuilt in place from an undo log of the clearing horizon's changes.

import { FlowAbortedError } from './errors';
import { curveMarks, type CurveComputation } from './evacuation-curve';
import type { ImplicitExpandedNetwork } from './implicit-expanded';
import { ImplicitIncrementalBfs, type ResidualChangeNote } from './implicit-incremental-bfs';
import { emptyStats } from './solve-context';

/** ResidualUndoLog (residual-undo-log.ts) with mates computed by the implicit network. */
class ImplicitUndoLog implements ResidualChangeNote {
  private readonly logged: Uint32Array;
  private arcs = new Int32Array(1024);
  private before = new Int32Array(2048);
  private count = 0;

  constructor(
    private readonly net: ImplicitExpandedNetwork,
    private readonly residual: Int32Array,
  ) {
    this.logged = new Uint32Array((residual.length + 31) >>> 5);
  }

  note(a: number): void {
    const { logged } = this;
    if ((logged[a >>> 5]! & (1 << (a & 31))) !== 0) return;
    const m = this.net.mateOf(a);
    logged[a >>> 5]! |= 1 << (a & 31);
    logged[m >>> 5]! |= 1 << (m & 31);
    if (this.count === this.arcs.length) {
      const arcs = new Int32Array(this.arcs.length * 2);
      arcs.set(this.arcs);
      const before = new Int32Array(this.before.length * 2);
      before.set(this.before);
      this.arcs = arcs;
      this.before = before;
    }
    this.arcs[this.count] = a;
    this.before[2 * this.count] = this.residual[a]!;
    this.before[2 * this.count + 1] = this.residual[m]!;
    this.count++;
  }

  startRound(): void {
    const { logged, arcs } = this;
    for (let i = 0; i < this.count; i++) {
      const a = arcs[i]!;
      const m = this.net.mateOf(a);
      logged[a >>> 5]! &= ~(1 << (a & 31));
      logged[m >>> 5]! &= ~(1 << (m & 31));
    }
    this.count = 0;
  }

  undoInto(target: Int32Array): void {
    const { arcs, before } = this;
    for (let i = 0; i < this.count; i++) {
      const a = arcs[i]!;
      target[a] = before[2 * i]!;
      target[this.net.mateOf(a)] = before[2 * i + 1]!;
    }
  }
}

export interface ImplicitCurveOptions {
  /** The horizon whose cut to keep; default: the last horizon before clearance, else T. */
  cutHorizon?: number;
  onHorizon?: (horizon: number) => void;
  shouldAbort?: () => boolean;
}

/**
 * Solves horizons 0..T in turn on `residual` (net.createResidual(); it ends holding the final
 * horizon's maximum flow). takeCutResidual() gives the residual of the cut horizon, as in
 * computeEvacuationCurve (read the final flow first: it may be rebuilt in `residual` itself).
 */
export function computeImplicitCurve(
  net: ImplicitExpandedNetwork,
  demand: number,
  residual: Int32Array,
  options: ImplicitCurveOptions = {},
): CurveComputation {
  const T = net.horizonSteps;
  const stats = emptyStats();
  const deliveredByStep: number[] = [];
  const explicitCut = options.cutHorizon;
  const undoLog = new ImplicitUndoLog(net, residual);
  const solver = new ImplicitIncrementalBfs(net, residual, 0, undoLog);
  let snapshot: Int32Array | null = null;
  let clearanceStep: number | null = null;
  let delivered = 0;
  let horizon = 0;
  for (; horizon <= T; horizon++) {
    if (options.shouldAbort?.()) throw new FlowAbortedError('evacuation curve aborted by the caller');
    undoLog.startRound();
    if (horizon > 0) solver.extendToHorizon(horizon);
    delivered += solver.maximise(stats, options.shouldAbort);
    deliveredByStep.push(delivered);
    options.onHorizon?.(horizon);
    if (delivered >= demand) {
      clearanceStep = horizon;
      break;
    }
    if (explicitCut === horizon) snapshot = residual.slice();
  }
  const finalHorizon = Math.min(horizon, T);
  while (deliveredByStep.length <= T) deliveredByStep.push(deliveredByStep[deliveredByStep.length - 1] ?? 0);

  const beforeClearance = explicitCut === undefined && clearanceStep !== null && clearanceStep > 0;
  let cutHorizon: number;
  let cut: () => Int32Array;
  if (explicitCut !== undefined && snapshot !== null) {
    cutHorizon = explicitCut;
    cut = () => snapshot!;
  } else if (beforeClearance) {
    cutHorizon = clearanceStep! - 1;
    let undone = false;
    cut = () => {
      if (!undone) undoLog.undoInto(residual);
      undone = true;
      return residual;
    };
  } else {
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

// The closures' clearance on the implicit time-expanded network (implicit-plan.ts), for plans whose
// written-out network would not fit. One base flow serves every road, without a copy of it:
//  1. the plan's flow at its last horizon (its clearance step, or T) is split into paths once; the
//     paths that depart on a tested road once it is closed are kept with their arcs;
//  2. per road, those paths are cancelled whole (source to sink), which leaves a feasible flow
//     with nothing on the closed departures, whose residual is then set to 0: a feasible flow of
//     the network with the road closed, at the same horizon;
//  3. incremental BFS maximises it horizon by horizon from 0, as the evacuation curve does (the
//     flow already in place above the current horizon is left alone: conservation holds at every
//     node either way, and the trees stay valid as layers are added), up to the base's last
//     horizon, where it is a maximum flow of the closed network (exact from any feasible flow).
//     One maximisation at that horizon straight away gives the same flow value but cost about
//     three times as much CPU on the demo town (its augmentations along paths that span the whole
//     horizon kept re-rooting large parts of both search trees). If the demand is not met, the
//     horizon grows on, one step at a time, until everyone arrives or T: a closed road can only
//     delay the clearance, so the first horizon that reaches the demand is the clearance;
//  4. every change, the solver's included, went into a journal, which puts the base flow back.
// Where some flow on a closed departure is not on any path (a circulation within a step), the road
// gets a fresh solve with the closure instead (`fresh`).

import {
  closedAtStep,
  emptyStats,
  ExpandedArcKind,
  ImplicitIncrementalBfs,
  type EvacuationProblem,
} from '../flow';
import { forEachImplicitPath, implicitCurve, ResidualJournal, type ImplicitPlan } from './implicit-plan';

export interface ImplicitClosureOutcome {
  clearanceStep: number | null;
  /** Vehicles delivered by the clearance step, or by T when it does not clear. */
  delivered: number;
  /** True when this road was solved afresh instead of from the base flow. */
  fresh: boolean;
}

export function implicitClosedClearances(
  problem: EvacuationProblem,
  plan: ImplicitPlan,
  roads: readonly number[],
  atSeconds: number,
  shouldAbort?: () => boolean,
  onRoadDone?: () => void,
): Map<number, ImplicitClosureOutcome> {
  const { net, residual } = plan;
  const dt = problem.timeStepSeconds;
  const T = problem.horizonSteps;
  const closed = [{ fromSeconds: atSeconds, untilSeconds: null }];
  const demand = problem.zones.reduce((sum, zone) => sum + zone.vehicles, 0);
  const roadSlot = new Int32Array(problem.roads.length).fill(-1);
  for (let j = 0; j < net.slotsPerLayer; j++) if (net.slotKind[j] === ExpandedArcKind.Road) roadSlot[net.slotRef[j]!] = j;

  const wanted = new Set(roads);
  const paths: { arcs: Int32Array; vehicles: number }[] = [];
  const pathsOf = new Map<number, number[]>();
  forEachImplicitPath(
    net,
    residual,
    (path) => {
      const users = new Set<number>();
      for (const r of path.arcs) {
        if (r < net.prefix) continue;
        const { step, slot } = net.slotOfArc(r);
        if (net.slotKind[slot] !== ExpandedArcKind.Road) continue;
        const e = net.slotRef[slot]!;
        if (wanted.has(e) && closedAtStep(closed, step, dt)) users.add(e);
      }
      if (users.size === 0) return;
      const id = paths.length;
      paths.push({ arcs: Int32Array.from(path.arcs), vehicles: path.vehicles });
      for (const e of users) (pathsOf.get(e) ?? pathsOf.set(e, []).get(e)!).push(id);
    },
    { withArcs: true },
  );

  const journal = new ResidualJournal(net, residual);
  const outcomes = new Map<number, ImplicitClosureOutcome>();
  for (const e of wanted) {
    let cancelled = 0;
    for (const id of pathsOf.get(e) ?? []) {
      const { arcs, vehicles } = paths[id]!;
      for (const r of arcs) {
        journal.note(r);
        residual[r]! += vehicles;
        residual[net.mateOf(r)]! -= vehicles;
      }
      cancelled += vehicles;
    }
    let leftover = false;
    const j = roadSlot[e]!;
    for (let step = 0; j >= 0 && step <= T; step++) {
      if (!net.isPresent(step, j) || !closedAtStep(closed, step, dt)) continue;
      const forward = net.forwardArc(step, j);
      if (residual[net.mateOf(forward)] !== 0) leftover = true;
      journal.note(forward);
      residual[forward] = 0;
    }
    if (leftover) {
      journal.undo();
      const copy = { ...problem, roads: problem.roads.map((road, i) => (i === e ? { ...road, closures: [...(road.closures ?? []), ...closed] } : road)) };
      const fresh = implicitCurve(copy, shouldAbort);
      outcomes.set(e, { clearanceStep: fresh.clearanceStep, delivered: fresh.deliveredAtHorizon, fresh: true });
      onRoadDone?.();
      continue;
    }
    const stats = emptyStats();
    let horizon = 0;
    const solver = new ImplicitIncrementalBfs(net, residual, horizon, journal);
    let delivered = plan.deliveredAtHorizon - cancelled + solver.maximise(stats, shouldAbort);
    while (horizon < plan.finalHorizon) {
      horizon++;
      solver.extendToHorizon(horizon);
      delivered += solver.maximise(stats, shouldAbort);
    }
    while (delivered < demand && horizon < T) {
      horizon++;
      solver.extendToHorizon(horizon);
      delivered += solver.maximise(stats, shouldAbort);
    }
    journal.undo();
    outcomes.set(e, { clearanceStep: delivered >= demand ? horizon : null, delivered, fresh: false });
    onRoadDone?.();
  }
  return outcomes;
}

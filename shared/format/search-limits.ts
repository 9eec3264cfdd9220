// Where a search for the best change stopped at a limit (the run's horizon, the number of roads
// it tests, the size of the exact program) or ran out of its budget: what was limited, in the
// planner's words, and what to do about it. Stored with each answer (solveProposal) and shown
// with it in the Findings tab; the budget words go into a stopped search's failure reason.
import type { ProposalAnswer, SearchLimit } from '../api/proposals';
import { formatDuration } from './numbers';

export interface SearchLimitContext {
  /** The run's horizon in minutes. */
  horizonMinutes: number;
  /** Closures: the most roads asked for. */
  maxRoads?: number;
}

const longerHorizon =
  'run the search again with a longer horizon in the run assumptions; if the longer run is refused as too large, use a coarser time step as well.';

export function searchLimits(answer: ProposalAnswer, context: SearchLimitContext): SearchLimit[] {
  const horizon = formatDuration(context.horizonMinutes);
  const limits: SearchLimit[] = [];
  switch (answer.kind) {
    case 'release-order':
      if (answer.quickestClearanceMinutes === null) {
        limits.push({
          kind: 'horizon',
          message: `Not everyone can arrive within the horizon of ${horizon}, even with every zone free to leave at the order: the search stopped at the horizon, and the order shown delivers the most by then. To find the quickest order, ${longerHorizon}`,
        });
      }
      break;
    case 'contraflow': {
      const te = answer.timeExpanded;
      if (te && (te.boundClearanceMinutes === null || te.chosenClearanceMinutes === null)) {
        limits.push({
          kind: 'horizon',
          message: `With the one-way roads found, not everyone arrives within the horizon of ${horizon}: over time they are compared by the vehicles delivered by then, not by clearance time. For clearance times, ${longerHorizon}`,
        });
      }
      break;
    }
    case 'closures': {
      if (answer.baseClearanceMinutes === null) {
        limits.push({
          kind: 'horizon',
          message: `The plan does not clear within the horizon of ${horizon}, so the closures are ranked by the vehicles delivered by then, not by clearance time. For clearance times, ${longerHorizon}`,
        });
      }
      if (answer.truncated) {
        limits.push({
          kind: 'candidates',
          message: `Only the ${answer.roads.length} roads carrying the most vehicles were tested; more roads carry traffic in the plan. To test others, narrow the search to road classes or to chosen roads (bridges, ramps)${context.maxRoads !== undefined && context.maxRoads < 500 ? ', or raise the number of roads to test (at most 500)' : ''}.`,
        });
      }
      const untested = answer.roads.filter((r) => !r.clearanceTested).length;
      if (untested > 0) {
        limits.push({
          kind: 'clearance-tests',
          message: `Clearance time was computed for the ${answer.roads.length - untested} roads that lose the most evacuees per hour; the other ${untested} show the loss per hour only (—). For the clearance time of a particular road, search again with that road chosen (up to 20 chosen roads all get it).`,
        });
      }
      break;
    }
    case 'lanes':
      if (answer.method === 'greedy') {
        limits.push({
          kind: 'size',
          message: `The plan is too large for the exact program, or it did not finish in time: ${answer.note} For an exact answer, search fewer roads (road classes or a drawn area).`,
        });
      }
      break;
    case 'zone-routes':
      if (answer.clearanceMinutes === null) {
        limits.push({
          kind: 'horizon',
          message: `Not everyone arrives within the horizon of ${horizon}: the routes shown are those of the vehicles that do. To route everyone, ${longerHorizon}`,
        });
      }
      break;
  }
  return limits;
}

/** The reason stored when a search is stopped at the runs' time or memory budget. */
export function searchBudgetReason(kind: 'time' | 'memory', budget: { timeSeconds: number; memoryMegabytes: number }): string {
  const what =
    kind === 'time'
      ? `The search took longer than its time budget of ${budget.timeSeconds} s and was stopped.`
      : `The search needed more than its memory budget of ${budget.memoryMegabytes} MB and was stopped.`;
  return `${what} To finish within it, use a coarser time step or a shorter horizon in the run assumptions, or search fewer roads (road classes, a drawn area, fewer roads to test); an administrator can raise the budget (RUN_TIME_BUDGET_SECONDS, RUN_MEMORY_BUDGET_MEGABYTES).`;
}

const overTime: Record<'contraflow' | 'closures' | 'release-order' | 'zone-routes', string> = {
  contraflow: 'The search for one-way roads evaluates them over time, which',
  closures: 'The ranking of closures computes each closure’s clearance time over time, which',
  'release-order': 'The search for the quickest departure order solves the evacuation over time, which',
  'zone-routes': 'Following where each zone goes solves the evacuation over time, which',
};

/**
 * A search over time refused before it starts because what it builds does not fit the run budget
 * (shared/model/search-budget.ts): what it builds, and the refusal's own advice (a coarser step,
 * a shorter horizon), plus the steady-state searches that remain possible.
 */
export function searchTooLargeReason(search: keyof typeof overTime, refusal: string): string {
  return `${overTime[search]} needs more than the run budget allows even without writing the network out. ${refusal} Contraflow in the steady state and added lanes do not look over time and stay available.`;
}

// One proposal computed from its stored input: the optimisation of shared/plan-optimization on
// the engine problem, mapped back to segments, zones and shelters, with the change as a
// scenario overlay ready to save. Pure apart from the LP solver it is given; runs in a worker thread.
import type { ProposalAnswer, ProposalResult, ProposalSegmentRef } from '../../shared/api/proposals';
import { proposalCaution } from '../../shared/api/proposals';
import type { ScenarioOverlay } from '../../shared/api/scenarios';
import {
  bestContraflow,
  bestLaneImprovements,
  bestReleaseOrder,
  rankClosures,
  zoneRoutes,
  type LinearSolver,
  type PairOrientation,
  type RoadPair,
} from '../../shared/plan-optimization';
import { searchLimits, searchTooLargeReason } from '../../shared/format/search-limits';
import { FlowInputError } from '../../shared/flow';
import { chooseSearchLayout, type SearchLayout } from '../../shared/model/search-budget';
import { ENGINE_VERSION } from '../run-execution/engine-version';
import type { ProposalInput } from './proposal-input';

const emptyOverlay = (): ScenarioOverlay => ({
  closures: [],
  laneChanges: [],
  contraflow: [],
  classFactors: [],
  removedShelterIds: [],
  addedShelters: [],
  departureDelays: [],
  departureSchedules: [],
});

/** server/config.ts's defaults of RUN_MAX_EXPANDED_ARCS and RUN_MAX_EXPANDED_MEGABYTES. */
const DEFAULT_RUN_BUDGET = { maxExpandedArcs: 600_000_000, maxBytes: 6144 * 2 ** 20 };

export type ProposalHooks = { onProgress?: (fraction: number) => void; shouldAbort?: () => boolean };

export function solveProposal(input: ProposalInput, solver: LinearSolver | undefined, hooks: ProposalHooks = {}): ProposalResult {
  const started = performance.now();
  const { run, request } = input;
  const problem = run.problem;
  const minutesPerStep = problem.timeStepSeconds / 60;
  const minutes = (step: number | null) => (step === null ? null : step * minutesPerStep);
  const roadRef = (road: number): ProposalSegmentRef => {
    const origin = run.roadOrigins[road]!;
    const segment = run.segments[origin.segment]!;
    return { segmentId: segment.id, direction: origin.direction, name: segment.name, roadClass: segment.roadClass };
  };
  const allowed = input.candidateSegmentIds ? new Set(input.candidateSegmentIds) : null;
  const roadAllowed = (road: number) => !allowed || allowed.has(run.segments[run.roadOrigins[road]!.segment]!.id);

  let answer: ProposalAnswer;
  let overlay: ScenarioOverlay | null = null;
  // The searches over time run on the written-out network where it fits the run budget, else on
  // the implicit one (shared/model/search-budget.ts); an input stored without its budget gets the
  // server's defaults (server/config.ts).
  let expandedLayout: SearchLayout | null = null;
  if (request.kind !== 'lanes') {
    const choice = chooseSearchLayout(request.kind, problem, input.budget ?? DEFAULT_RUN_BUDGET);
    if (choice.layout === null) throw new FlowInputError(searchTooLargeReason(request.kind, choice.refusal));
    expandedLayout = choice.layout;
  }
  const layout = expandedLayout ?? undefined;

  if (request.kind === 'contraflow') {
    // Pairs: the two carriageways of one segment.
    const bySegment = new Map<number, { forward?: number; backward?: number }>();
    run.roadOrigins.forEach((o, road) => {
      const entry = bySegment.get(o.segment) ?? {};
      entry[o.direction] = road;
      bySegment.set(o.segment, entry);
    });
    const pairs: RoadPair[] = [];
    for (const entry of bySegment.values()) {
      if (entry.forward !== undefined && entry.backward !== undefined) pairs.push({ forward: entry.forward, backward: entry.backward });
    }
    const candidates = pairs.map((_, i) => i).filter((i) => roadAllowed(pairs[i]!.forward));
    const result = bestContraflow(problem, pairs, {
      candidates,
      maxCorridors: request.maxCorridors ?? undefined,
      layout,
      onProgress: hooks.onProgress,
      shouldAbort: hooks.shouldAbort,
    });
    const refOf = (o: PairOrientation): ProposalSegmentRef => roadRef(o.direction === 'forward' ? pairs[o.pair]!.forward : pairs[o.pair]!.backward);
    const te = result.timeExpanded;
    answer = {
      kind: 'contraflow',
      baseVehiclesPerHour: result.steady.baseVehPerHour,
      boundVehiclesPerHour: result.steady.boundVehPerHour,
      achievedVehiclesPerHour: result.steady.achievedVehPerHour,
      method: result.steady.method,
      corridorsNeeded: result.steady.corridorsNeeded,
      candidatePairs: result.candidates.length,
      corridors: result.steady.corridors.map((c) => ({ segments: c.orientations.map(refOf), gainVehiclesPerHour: c.gainVehPerHour })),
      timeExpanded: te
        ? {
            baseClearanceMinutes: minutes(te.base.clearanceStep),
            boundClearanceMinutes: minutes(te.bound.clearanceStep),
            chosenClearanceMinutes: minutes(te.chosen.clearanceStep),
            chosenFrom: te.chosen.from,
            gapMinutes: te.gapSteps === null ? null : te.gapSteps * minutesPerStep,
            gapVehicles: te.gapVehicles,
            segments: te.chosen.orientations.map(refOf),
          }
        : null,
    };
    // The steady-state answer becomes the scenario: one overlay corridor per corridor and direction.
    overlay = emptyOverlay();
    answer.corridors.forEach((c, i) => {
      for (const direction of ['forward', 'backward'] as const) {
        const ids = c.segments.filter((s) => s.direction === direction).map((s) => s.segmentId);
        if (ids.length > 0) overlay!.contraflow.push({ name: `Proposed corridor ${i + 1}${direction === 'backward' ? ' (against drawing)' : ''}`, segmentIds: ids, direction });
      }
    });
    if (overlay.contraflow.length === 0) overlay = null;
  } else if (request.kind === 'closures') {
    const candidates = problem.roads.map((_, e) => e).filter(roadAllowed);
    const ranking = rankClosures(problem, {
      closeAtSeconds: request.closeAtMinutes * 60,
      candidates: allowed ? candidates : undefined,
      maxCandidates: request.maxRoads,
      layout,
      onProgress: hooks.onProgress,
      shouldAbort: hooks.shouldAbort,
    });
    answer = {
      kind: 'closures',
      closeAtMinutes: request.closeAtMinutes,
      baseVehiclesPerHour: ranking.baseVehPerHour,
      baseClearanceMinutes: minutes(ranking.baseClearanceStep),
      truncated: ranking.truncated,
      roads: ranking.impacts.map((i) => ({
        ...roadRef(i.road),
        baseFlowVehiclesPerHour: i.baseFlowVehPerHour,
        lossVehiclesPerHour: i.lossVehPerHour,
        clearanceMinutes: minutes(i.clearanceStep),
        clearanceLossMinutes: i.clearanceLossSteps === null ? null : i.clearanceLossSteps * minutesPerStep,
        deliveredLossVehicles: i.deliveredLossVehicles,
        stopsClearance: i.clearanceTested && ranking.baseClearanceStep !== null && i.clearanceStep === null,
        clearanceTested: i.clearanceTested,
      })),
    };
    // A ranking, not one change: the scenario closes the road the planner picks (saveProposal).
    overlay = null;
  } else if (request.kind === 'lanes') {
    const candidates = problem.roads
      .map((_, e) => e)
      .filter(roadAllowed)
      .map((road) => ({ road, maxLanes: request.maxLanesPerRoad }));
    const result = bestLaneImprovements(
      problem,
      { budget: request.budgetLanes, maxLanesPerRoad: request.maxLanesPerRoad, candidates, onProgress: hooks.onProgress, shouldAbort: hooks.shouldAbort },
      solver,
    );
    answer = {
      kind: 'lanes',
      baseVehiclesPerHour: result.baseVehPerHour,
      achievedVehiclesPerHour: result.achievedVehPerHour,
      boundVehiclesPerHour: result.boundVehPerHour,
      method: result.method,
      exact: result.exact,
      budgetLanes: request.budgetLanes,
      spentLanes: result.spent,
      note: result.note,
      picks: result.picks.map((p) => ({ ...roadRef(p.road), lanes: p.lanes, addedVehiclesPerHour: p.addedVehPerHour })),
      steps: result.steps.map((s) => ({ ...roadRef(s.road), throughputVehiclesPerHour: s.throughputVehPerHour, gainVehiclesPerHour: s.gainVehPerHour })),
    };
    overlay = emptyOverlay();
    const bySegment = new Map<number, { lanesForward?: number; lanesBackward?: number }>();
    for (const p of result.picks) {
      const ref = roadRef(p.road);
      const lanesNow = problem.roads[p.road]!.lanes ?? 1;
      const patch = bySegment.get(ref.segmentId) ?? {};
      if (ref.direction === 'forward') patch.lanesForward = Math.round(lanesNow + p.lanes);
      else patch.lanesBackward = Math.round(lanesNow + p.lanes);
      bySegment.set(ref.segmentId, patch);
    }
    for (const [segmentId, patch] of bySegment) overlay.laneChanges.push({ segmentId, patch });
    if (overlay.laneChanges.length === 0) overlay = null;
  } else if (request.kind === 'release-order') {
    const order = bestReleaseOrder(problem, { ...hooks, layout });
    answer = {
      kind: 'release-order',
      stepMinutes: minutesPerStep,
      quickestClearanceMinutes: minutes(order.quickestClearanceStep),
      expectedClearanceMinutes: minutes(order.expectedClearanceStep),
      scheduleClearanceMinutes: minutes(order.scheduleClearanceStep),
      waitsMovedHome: order.waitsMovedHome,
      demandVehicles: problem.zones.reduce((s, z) => s + z.vehicles, 0),
      quickestDeliveredByStep: order.quickestDeliveredByStep,
      expectedDeliveredByStep: order.expectedDeliveredByStep,
      zones: order.zones.map((z, i) => ({
        zoneId: run.zones[i]!.id,
        name: run.zones[i]!.name,
        vehicles: z.vehicles,
        firstDepartureMinutes: minutes(z.firstDepartureStep),
        lastDepartureMinutes: minutes(z.lastDepartureStep),
        departuresByStep: z.departuresByStep,
      })),
    };
    overlay = emptyOverlay();
    overlay.departureSchedules = answer.zones
      .filter((z) => z.departuresByStep.some((n) => n > 0))
      .map((z) => ({ zoneId: z.zoneId, stepMinutes: minutesPerStep, departuresByStep: z.departuresByStep }));
  } else {
    const routes = zoneRoutes(problem, { ...hooks, layout });
    const window = (w: { firstStep: number; lastStep: number } | null): [number, number] | null =>
      w ? [w.firstStep * minutesPerStep, (w.lastStep + 1) * minutesPerStep] : null;
    answer = {
      kind: 'zone-routes',
      clearanceMinutes: minutes(routes.clearanceStep),
      zones: routes.zones.map((z, i) => ({
        zoneId: run.zones[i]!.id,
        name: run.zones[i]!.name,
        vehicles: z.vehicles,
        deliveredVehicles: z.deliveredVehicles,
        shelters: z.shelters.map((s) => {
          const index = problem.shelters.findIndex((x) => x.id === s.shelter);
          return { shelterId: run.shelters[index]!.id, name: run.shelters[index]!.name, vehicles: s.vehicles };
        }),
        mainRoads: z.mainRoads.map((r) => ({ ...roadRef(r.road), vehicles: r.vehicles })),
        roads: z.roads.slice(0, 200).map((r) => ({ ...roadRef(r.road), vehicles: r.vehicles })),
        departureWindowMinutes: window(z.departureWindow),
        arrivalWindowMinutes: window(z.arrivalWindow),
      })),
    };
  }
  const limits = searchLimits(answer, {
    horizonMinutes: problem.horizonSteps * minutesPerStep,
    maxRoads: request.kind === 'closures' ? request.maxRoads : undefined,
  });
  return { answer, limits, expandedLayout, overlay, caution: proposalCaution, engineVersion: ENGINE_VERSION, solveMs: performance.now() - started };
}

// Starting runs: the one service behind a single run, a run under a scenario and a sweep.
// The request records what defines each run (plan, parameters, scenario, sweep value) and queues
// it in the same transaction; a worker then prepares it (snapshot, attachments, problem, hash,
// reuse of an identical result: server/run-execution/prepare-runs.ts) and solves it. What is checked here
// is cheap and bounded (counts and indexed look-ups), so the request answers at once on a county.
import { and, count, eq, inArray } from 'drizzle-orm';
import { budgetRefusal, type RunBudget } from '../../shared/model/run-budget';
import { runBudget } from '../run-execution/run-budget';
import type { z } from 'zod';
import type { Config } from '../config';
import type { Database, Tx } from '../db/client';
import { sweeps, plans, roadLayers, roadSegments, runs, shelters, zones } from '../db/schema';
import type { Run, RunParameters } from '../../shared/api/runs';
import type { sweepCreateSchema, SweepParameter } from '../../shared/api/sweeps';
import type { Scenario } from '../../shared/api/scenarios';
import { BadRequestError, NotFoundError } from '../errors';
import { queueSqlOf, type RunEnqueuer } from '../queue/run-enqueuer';
import { recordAudit, type Actor } from './audit';
import { assertRunQuota } from './run-quota';
import { getScenario } from './scenarios';
import { toRun } from './runs';

export type RunStart = {
  parameters: RunParameters;
  scenarioId: string | null;
  /** A sweep: one run per value of one parameter, prepared from one snapshot. */
  sweep?: { name: string; parameter: SweepParameter; values: number[] } | undefined;
};

export type StartedRuns = { runs: Run[]; sweepId: string | null };

/** Refusals a planner can act on, decided before anything is written. */
async function checkRunnable(tx: Tx, organizationId: string, planId: string, parameters: RunParameters[], scenario: Scenario | null, budget: RunBudget) {
  const [plan] = await tx.select({ dataVersion: plans.dataVersion }).from(plans).where(and(eq(plans.id, planId), eq(plans.organizationId, organizationId)));
  if (!plan) throw new NotFoundError('plan');
  const [layer] = await tx
    .select({ id: roadLayers.id, nodeCount: roadLayers.nodeCount, segmentCount: roadLayers.segmentCount })
    .from(roadLayers)
    .where(and(eq(roadLayers.planId, planId), eq(roadLayers.active, true)));
  if (!layer) throw new BadRequestError('This plan has no road layer yet: upload one first.');
  const [zoneCount] = await tx.select({ n: count() }).from(zones).where(eq(zones.planId, planId));
  const [shelterCount] = await tx.select({ n: count() }).from(shelters).where(eq(shelters.planId, planId));
  if (zoneCount!.n === 0) throw new BadRequestError('Add at least one evacuation zone before running.');
  if (scenario) await checkScenarioReferences(tx, planId, layer.id, scenario);
  const removed = scenario?.overlay.removedShelterIds.length ?? 0;
  const added = scenario?.overlay.addedShelters.length ?? 0;
  if (shelterCount!.n - removed + added <= 0) throw new BadRequestError('Add at least one shelter or exit before running.');
  // A lower bound of the time-expanded size (every junction and at least one direction of every
  // segment at every step): what is surely too large is refused now, with a coarser step that
  // fits; the worker checks the exact size when it builds the problem.
  for (const p of parameters) {
    // Offers are sized on at most two directions per segment, so the worker accepts them.
    const refusal = budgetRefusal({ nodeCount: layer.nodeCount, roads: layer.segmentCount }, p, budget, 'more than', {
      nodeCount: layer.nodeCount,
      roads: 2 * layer.segmentCount,
    });
    if (refusal) throw new BadRequestError(refusal);
  }
  return { dataVersion: plan.dataVersion, layerId: layer.id };
}

/** Every segment, zone and shelter a scenario names must be in the plan (indexed look-ups, at most a few thousand ids). */
async function checkScenarioReferences(tx: Tx, planId: string, layerId: number, scenario: Scenario) {
  const o = scenario.overlay;
  const segmentIds = [...new Set([...o.closures.map((c) => c.segmentId), ...o.laneChanges.map((l) => l.segmentId), ...o.contraflow.flatMap((c) => c.segmentIds)])];
  if (segmentIds.length > 0) {
    const found = await tx
      .select({ id: roadSegments.id })
      .from(roadSegments)
      .where(and(eq(roadSegments.layerId, layerId), inArray(roadSegments.id, segmentIds)));
    const known = new Set(found.map((r) => r.id));
    const missing = segmentIds.filter((id) => !known.has(id));
    if (missing.length > 0) {
      throw new BadRequestError(`The plan's data cannot be analysed: the scenario names segment ${missing.slice(0, 10).join(', ')}, which is not on the plan's road layer.`);
    }
  }
  if (o.removedShelterIds.length > 0) {
    const found = await tx.select({ id: shelters.id }).from(shelters).where(and(eq(shelters.planId, planId), inArray(shelters.id, o.removedShelterIds)));
    const known = new Set(found.map((r) => r.id));
    const unknown = o.removedShelterIds.filter((id) => !known.has(id));
    if (unknown.length > 0) throw new BadRequestError(`The scenario removes shelter ${unknown.join(', ')}, which is not in the plan.`);
  }
  const zoneIds = [...new Set(o.departureDelays.map((d) => d.zoneId))];
  if (zoneIds.length > 0) {
    const found = await tx.select({ id: zones.id }).from(zones).where(and(eq(zones.planId, planId), inArray(zones.id, zoneIds)));
    const known = new Set(found.map((r) => r.id));
    const unknown = zoneIds.filter((id) => !known.has(id));
    if (unknown.length > 0) throw new BadRequestError(`The plan's data cannot be analysed: a departure delay names zone ${unknown.join(', ')}, which is not in the plan.`);
  }
}

/**
 * Records and queues a run, or a sweep's runs. Refused (4xx, nothing written) when a limit of
 * run-quota.ts would be passed or the plan cannot be run; if the job cannot be queued the
 * transaction rolls back, so no run is left without a job.
 */
export async function startRuns(
  db: Database,
  queue: RunEnqueuer,
  config: Pick<Config, 'RUN_STARTS_PER_MINUTE' | 'RUNS_IN_FLIGHT_PER_ORGANIZATION' | 'RUN_MAX_EXPANDED_ARCS' | 'RUN_MAX_EXPANDED_MEGABYTES'>,
  actor: Actor,
  planId: string,
  start: RunStart,
): Promise<StartedRuns> {
  const { sweep } = start;
  const each = sweep
    ? sweep.values.map((v) => ({ sweepValue: v as number | null, parameters: sweep.parameter === 'capacityFactor' ? { ...start.parameters, capacityFactor: v } : start.parameters }))
    : [{ sweepValue: null, parameters: start.parameters }];
  await assertRunQuota(db, actor, each.length, config);
  const scenario = start.scenarioId ? await getScenario(db, actor.organizationId, planId, start.scenarioId) : null;
  return db.transaction(async (tx) => {
    const { dataVersion, layerId } = await checkRunnable(
      tx,
      actor.organizationId,
      planId,
      each.map((e) => e.parameters),
      scenario,
      runBudget(config),
    );
    let sweepId: string | null = null;
    if (sweep) {
      const [inserted] = await tx
        .insert(sweeps)
        .values({ planId, name: sweep.name, scenarioId: start.scenarioId, parameter: sweep.parameter, values: sweep.values, createdBy: actor.userId })
        .returning({ id: sweeps.id });
      sweepId = inserted!.id;
      await recordAudit(tx, actor, 'sweep.create', 'sweep', sweepId, { planId, parameter: sweep.parameter, values: sweep.values });
    }
    const rows = await tx
      .insert(runs)
      .values(
        each.map((e) => ({
          planId,
          parameters: e.parameters,
          // What the plan was when the run was asked for; the worker records the version it reads.
          dataVersion,
          roadLayerId: layerId,
          scenarioId: start.scenarioId,
          sweepId,
          sweepValue: e.sweepValue,
          createdBy: actor.userId,
        })),
      )
      .returning();
    for (const row of rows) await recordAudit(tx, actor, 'run.start', 'run', row.id, { planId, parameters: row.parameters, sweepId });
    // A sweep is one job: its worker loads the snapshot once and queues each prepared run.
    await queue.enqueue(sweepId ? { sweepId } : { runId: rows[0]!.id }, queueSqlOf(tx));
    return { runs: rows.map(toRun), sweepId };
  });
}

/** The route's shape of a sweep request as a RunStart. */
export function sweepStart(input: z.output<typeof sweepCreateSchema>): RunStart {
  return { parameters: input.parameters, scenarioId: input.scenarioId, sweep: { name: input.name, parameter: input.sweep.parameter, values: input.sweep.values } };
}

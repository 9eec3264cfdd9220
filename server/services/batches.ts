// Batches: one run per sweep value, all queued at once; the workers share them.
import { and, asc, desc, eq } from 'drizzle-orm';
import type { z } from 'zod';
import type { Database } from '../db/client';
import { batches, runs } from '../db/schema';
import type { Batch, batchCreateSchema } from '../../shared/api/batches';
import { NotFoundError } from '../errors';
import { recordAudit, type Actor } from './audit';
import { assertPlanInOrganization } from './plan-access';
import { createRun, prepareRun, toRun } from './runs';
import { getScenario } from './scenarios';
import { limitPlusOne, type Page } from '../../shared/api/pagination';

export async function createBatch(
  db: Database,
  actor: Actor,
  planId: string,
  input: z.output<typeof batchCreateSchema>,
  maxExpandedArcs: number,
  enqueue: (runId: string) => Promise<void>,
): Promise<string> {
  const scenario = input.scenarioId ? await getScenario(db, actor.organizationId, planId, input.scenarioId) : null;
  // Every problem is built (and refused, if one cannot be) before anything is written.
  const prepared = await Promise.all(
    input.sweep.values.map((v) =>
      input.sweep.parameter === 'capacityFactor'
        ? prepareRun(db, actor.organizationId, planId, { ...input.parameters, capacityFactor: v }, maxExpandedArcs, scenario)
        : prepareRun(db, actor.organizationId, planId, input.parameters, maxExpandedArcs, scenario, v),
    ),
  );
  const [batch] = await db.transaction(async (tx) => {
    const rows = await tx
      .insert(batches)
      .values({ planId, name: input.name, scenarioId: input.scenarioId, parameter: input.sweep.parameter, values: input.sweep.values, createdBy: actor.userId })
      .returning();
    await recordAudit(tx, actor, 'batch.create', 'batch', rows[0]!.id, { planId, parameter: input.sweep.parameter, values: input.sweep.values });
    return rows;
  });
  for (const [i, v] of input.sweep.values.entries()) {
    const parameters = input.sweep.parameter === 'capacityFactor' ? { ...input.parameters, capacityFactor: v } : input.parameters;
    const { row, reused } = await createRun(db, actor, planId, parameters, prepared[i]!, input.scenarioId, { batchId: batch!.id, sweepValue: v });
    if (!reused) await enqueue(row.id);
  }
  return batch!.id;
}

export async function getBatch(db: Database, organizationId: string, planId: string, batchId: string): Promise<Batch> {
  await assertPlanInOrganization(db, organizationId, planId);
  const [b] = await db.select().from(batches).where(and(eq(batches.id, batchId), eq(batches.planId, planId)));
  if (!b) throw new NotFoundError('batch');
  const rows = await db.select().from(runs).where(eq(runs.batchId, batchId)).orderBy(asc(runs.sweepValue));
  return {
    id: b.id,
    planId: b.planId,
    name: b.name,
    scenarioId: b.scenarioId,
    parameter: b.parameter,
    values: b.values,
    createdAt: b.createdAt.toISOString(),
    runs: rows.map((r) => ({ ...toRun(r), sweepValue: r.sweepValue ?? 0, headline: r.result?.headline ?? null })),
  };
}

export async function listBatches(db: Database, organizationId: string, planId: string, page: Page) {
  await assertPlanInOrganization(db, organizationId, planId);
  const rows = await db
    .select()
    .from(batches)
    .where(eq(batches.planId, planId))
    .orderBy(desc(batches.createdAt), asc(batches.id))
    .limit(limitPlusOne(page))
    .offset(page.offset);
  return rows.map((b) => ({ id: b.id, planId: b.planId, name: b.name, scenarioId: b.scenarioId, parameter: b.parameter, values: b.values, createdAt: b.createdAt.toISOString() }));
}

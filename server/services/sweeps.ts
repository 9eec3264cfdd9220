// Batches (sweeps): one run per sweep value; started by services/start-runs.ts, read here.
import { and, asc, desc, eq } from 'drizzle-orm';
import type { Database } from '../db/client';
import { batches, runs } from '../db/schema';
import type { Batch } from '../../shared/api/sweeps';
import { NotFoundError } from '../errors';
import { assertPlanInOrganization } from './plan-access';
import { toRun } from './runs';
import { limitPlusOne, type Page } from '../../shared/api/pagination';

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

// Sweeps (sweeps): one run per sweep value; started by services/start-runs.ts, read here.
import { and, asc, desc, eq } from 'drizzle-orm';
import type { Database } from '../db/client';
import { sweeps, runs } from '../db/schema';
import type { Sweep } from '../../shared/api/sweeps';
import { NotFoundError } from '../errors';
import { assertPlanInOrganization } from './plan-access';
import { toRun } from './runs';
import { limitPlusOne, type Page } from '../../shared/api/pagination';

export async function getSweep(db: Database, organizationId: string, planId: string, sweepId: string): Promise<Sweep> {
  await assertPlanInOrganization(db, organizationId, planId);
  const [b] = await db.select().from(sweeps).where(and(eq(sweeps.id, sweepId), eq(sweeps.planId, planId)));
  if (!b) throw new NotFoundError('sweep');
  const rows = await db.select().from(runs).where(eq(runs.sweepId, sweepId)).orderBy(asc(runs.sweepValue));
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

export async function listSweeps(db: Database, organizationId: string, planId: string, page: Page) {
  await assertPlanInOrganization(db, organizationId, planId);
  const rows = await db
    .select()
    .from(sweeps)
    .where(eq(sweeps.planId, planId))
    .orderBy(desc(sweeps.createdAt), asc(sweeps.id))
    .limit(limitPlusOne(page))
    .offset(page.offset);
  return rows.map((b) => ({ id: b.id, planId: b.planId, name: b.name, scenarioId: b.scenarioId, parameter: b.parameter, values: b.values, createdAt: b.createdAt.toISOString() }));
}

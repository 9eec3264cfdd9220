// The identity every export carries (shared/model/export-identity.ts): the plan, its data version,
// the road layer and, for results, the run with its scenario and assumptions. Read here, written
// by each format.
import { and, eq } from 'drizzle-orm';
import type { Database } from '../db/client';
import { plans, roadLayers, scenarios } from '../db/schema';
import type { ExportIdentity } from '../../shared/model/export-identity';
import type { RunRow } from './runs';
import { NotFoundError } from '../errors';

async function planHead(db: Database, organizationId: string, planId: string) {
  const [plan] = await db.select({ name: plans.name, dataVersion: plans.dataVersion }).from(plans).where(and(eq(plans.id, planId), eq(plans.organizationId, organizationId)));
  if (!plan) throw new NotFoundError('plan');
  return plan;
}

async function layerHead(db: Database, layerId: number | null) {
  if (layerId === null) return null;
  const [layer] = await db.select({ name: roadLayers.name, sourceFileName: roadLayers.sourceFileName }).from(roadLayers).where(eq(roadLayers.id, layerId));
  return layer ?? null;
}

export async function runExportIdentity(db: Database, organizationId: string, planId: string, row: RunRow, contents: string): Promise<ExportIdentity> {
  const plan = await planHead(db, organizationId, planId);
  let scenarioName: string | null = null;
  if (row.scenarioId) {
    const [s] = await db.select({ name: scenarios.name }).from(scenarios).where(eq(scenarios.id, row.scenarioId));
    scenarioName = s?.name ?? '(deleted scenario)';
  }
  return {
    contents,
    planId,
    planName: plan.name,
    // The run's own data version: the figures reflect the plan as it was when the run started.
    dataVersion: row.dataVersion,
    exportedAt: new Date().toISOString(),
    roadLayer: await layerHead(db, row.roadLayerId),
    run: {
      id: row.id,
      finishedAt: row.finishedAt?.toISOString() ?? null,
      scenarioName,
      parameters: row.parameters,
      engineVersion: row.result?.stats.engineVersion ?? null,
    },
  };
}

export async function planExportIdentity(db: Database, organizationId: string, planId: string, layerId: number | null, contents: string, notes: string[] = []): Promise<ExportIdentity> {
  const plan = await planHead(db, organizationId, planId);
  return { contents, planId, planName: plan.name, dataVersion: plan.dataVersion, exportedAt: new Date().toISOString(), roadLayer: await layerHead(db, layerId), run: null, notes };
}

// /api/plans/:planId/export/…: the plan's inputs as they stand (road layer after edits and
// closures, zones, shelters) as one GeoPackage, one zip of Shapefiles, or a GeoJSON per layer;
// each with the caution and the plan's identity.
import { Router } from 'express';
import { planParamsSchema } from '../../shared/api/plans';
import type { Config } from '../config';
import type { Database } from '../db/client';
import { exportContentTypes, type ExportFormat } from '../export/write-export';
import { writeExportFile } from '../export/write-export-in-worker';
import { actorOf, requireMember } from '../middleware/require-member';
import { planInputsBundle } from '../services/plan-inputs-export';

/** File name in the route → format, and for GeoJSON the one layer it holds. */
export const planInputFiles: Record<string, { format: ExportFormat; table?: string }> = {
  'plan-inputs.gpkg': { format: 'gpkg' },
  'plan-inputs.zip': { format: 'shp.zip' },
  'roads.geojson': { format: 'geojson', table: 'roads' },
  'zones.geojson': { format: 'geojson', table: 'zones' },
  'shelters.geojson': { format: 'geojson', table: 'shelters' },
};

export function planExportsRouter(db: Database, config: Config): Router {
  const router = Router({ mergeParams: true });
  for (const [file, { format, table }] of Object.entries(planInputFiles)) {
    router.get(`/export/${file}`, requireMember('plans:read'), async (req, res) => {
      const { planId } = planParamsSchema.parse(req.params);
      const bundle = await planInputsBundle(db, actorOf(req).organizationId, planId, config.BRIEFING_TIME_ZONE);
      const bytes = await writeExportFile({ format, bundle, ...(table ? { table } : {}) });
      res.attachment(`plan-${planId.slice(0, 8)}-${file}`).type(exportContentTypes[format]).send(Buffer.from(bytes));
    });
  }
  return router;
}

// The plan's inputs as they stand (active road layer with every edit and closure, zones,
// shelters) as export tables with the caution and the plan's identity, read in one snapshot.
// Lengths and speeds follow the organisation's unit setting.
import { asc, eq, sql } from 'drizzle-orm';
import type { Database } from '../db/client';
import { roadSegments } from '../db/schema';
import type { ExportBundle } from '../../shared/format/export-tables';
import { roadInputsTable, shelterInputsTable, unitColumns, zoneInputsTable, type RoadInput } from '../../shared/format/inputs-export';
import { identityEntries } from '../../shared/model/export-identity';
import { getCapacityTable } from './capacity-table';
import { planExportIdentity } from './export-identity';
import { organizationPreferences } from './organization-settings';
import { assertPlanInOrganization } from './plan-access';
import { activeLayerId, segmentAttributeColumns } from './road-layers';
import { zonesAndSheltersOfPlan } from './zones-shelters';

/** The active layer's segments with their geometry (9 decimals of a degree: below a millimetre). */
async function roadInputs(db: Database, layerId: number | null): Promise<RoadInput[]> {
  if (layerId === null) return [];
  const rows = await db
    .select({
      id: roadSegments.id,
      geometry: sql<string>`ST_AsGeoJSON(${roadSegments.geom}, 9)`,
      lengthMeters: roadSegments.lengthMeters,
      sourceId: roadSegments.sourceId,
      ...segmentAttributeColumns,
    })
    .from(roadSegments)
    .where(eq(roadSegments.layerId, layerId))
    .orderBy(asc(roadSegments.id));
  return rows.map(({ id, geometry, lengthMeters, sourceId, ...attributes }) => ({
    id,
    coordinates: (JSON.parse(geometry) as { coordinates: [number, number][] }).coordinates,
    lengthMeters,
    sourceId,
    attributes: attributes as RoadInput['attributes'],
  }));
}

export async function planInputsBundle(db: Database, organizationId: string, planId: string, defaultTimeZone: string): Promise<ExportBundle> {
  return db.transaction(
    async (tx) => {
      const txDb = tx as unknown as Database;
      await assertPlanInOrganization(tx, organizationId, planId);
      const { unitSystem } = await organizationPreferences(txDb, organizationId, defaultTimeZone);
      const layerId = await activeLayerId(tx, planId);
      const capacityTable = await getCapacityTable(txDb, organizationId, planId);
      const { zones, shelters } = await zonesAndSheltersOfPlan(txDb, planId);
      const u = unitColumns(unitSystem);
      const identity = await planExportIdentity(txDb, organizationId, planId, layerId, 'Plan inputs: road layer after edits and closures, evacuation zones, shelters', [
        `Coordinates: WGS 84 longitude/latitude (EPSG:4326). Lengths in ${u.lengthUnit === 'm' ? 'metres' : 'feet'} (${u.length}), speeds in ${u.speedUnit} (${u.speed}, ${u.speedUsed}), capacities in vehicles per hour; each column's unit is listed with it.`,
        `Capacity factor of the plan's capacity table: ${capacityTable.capacityFactor} (${capacityTable.capacityFactorNote}); cap_ln_use, cap_fwd and cap_bwd include it.`,
        `To read the roads back into Cutline, map road_class, lanes_fwd, lanes_bwd, oneway, ${u.speed} (${u.speedUnit}), name, bridge, tunnel, level, closed and cap_lane in the upload's column step.`,
      ]);
      return {
        identity: identityEntries(identity),
        tables: [roadInputsTable(await roadInputs(txDb, layerId), capacityTable, unitSystem), zoneInputsTable(zones), shelterInputsTable(shelters)],
      };
    },
    { isolationLevel: 'repeatable read', accessMode: 'read only' },
  );
}

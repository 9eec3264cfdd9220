// A finished run's results as export tables (roads, zones, shelters, curve) with the caution
// and the run's identity and assumptions. Roads are drawn on the layer the run read; zones and
// shelters on their present outline and position (the run's figures are its own).
import { eq, sql } from 'drizzle-orm';
import type { Database } from '../db/client';
import { roadSegments } from '../db/schema';
import type { RunResult } from '../../shared/api/runs';
import type { ExportBundle } from '../../shared/format/export-tables';
import { curveTable, roadResultsTable, shelterResultsTable, zoneResultsTable, type RoadOfRun } from '../../shared/format/results-export';
import { unitColumns } from '../../shared/format/inputs-export';
import { identityEntries } from '../../shared/model/export-identity';
import { runExportIdentity } from './export-identity';
import { organizationPreferences } from './organization-settings';
import { roadResultsOf } from './road-results';
import type { RunRow } from './runs';
import { zonesAndSheltersOfPlan } from './zones-shelters';

async function roadsOfLayer(db: Database, layerId: number | null): Promise<Map<number, RoadOfRun>> {
  const out = new Map<number, RoadOfRun>();
  if (layerId === null) return out;
  const rows = await db
    .select({ id: roadSegments.id, g: sql<string>`ST_AsGeoJSON(${roadSegments.geom}, 9)`, name: roadSegments.name, roadClass: roadSegments.roadClass, lengthMeters: roadSegments.lengthMeters })
    .from(roadSegments)
    .where(eq(roadSegments.layerId, layerId));
  for (const r of rows) out.set(r.id, { id: r.id, coordinates: JSON.parse(r.g).coordinates, name: r.name, roadClass: r.roadClass, lengthMeters: r.lengthMeters });
  return out;
}

export async function runResultsBundle(db: Database, organizationId: string, planId: string, row: RunRow, result: RunResult, defaultTimeZone: string): Promise<ExportBundle> {
  const { unitSystem } = await organizationPreferences(db, organizationId, defaultTimeZone);
  const u = unitColumns(unitSystem);
  const identity = await runExportIdentity(db, organizationId, planId, row, 'Run results: roads, zones, shelters, curve');
  identity.notes = [
    `Coordinates: WGS 84 longitude/latitude (EPSG:4326). Flows and capacities in vehicles per hour, lengths in ${u.lengthUnit === 'm' ? 'metres' : 'feet'} (${u.length}); each column's unit is listed with it.`,
    'Roads are drawn on the road layer the run read; zones and shelters on their present outline and position.',
  ];
  const { zones, shelters } = await zonesAndSheltersOfPlan(db, planId);
  const zoneGeometry = new Map(zones.map((z) => [z.id, z.geometry]));
  const shelterPosition = new Map(shelters.map((s) => [s.id, [s.lon, s.lat] as [number, number]]));
  return {
    identity: identityEntries(identity),
    tables: [
      roadResultsTable(await roadResultsOf(db, row.id), await roadsOfLayer(db, row.roadLayerId), row.parameters.timeStepSeconds, unitSystem),
      zoneResultsTable(result, (id) => zoneGeometry.get(id) ?? null),
      shelterResultsTable(result, (id) => shelterPosition.get(id) ?? null),
      curveTable(result),
    ],
  };
}

// Gathers what a new briefing prints from the database: the run and its result, the plan and
// organisation, the run's road layer (geometry from PostGIS), zones, shelters and the capacity
// table. The content is frozen into the briefing row at drafting; later steps re-render from
// that stored content, never from the live plan, so the signed figures are the reviewed ones.
import { and, asc, eq, sql } from 'drizzle-orm';
import type { Database, Tx } from '../../db/client';
import { organizations, plans, roadLayers, runs, scenarios, shelters, users, zones } from '../../db/schema';
import { roleLabels, type Role } from '../../../shared/api/roles';
import type { ZoneGeometry } from '../../../shared/api/zones-shelters';
import { storedOverlay } from '../../../shared/api/scenarios';
import type { BriefingInput, BriefingMapInput, LonLat, MapSegment, MapZone } from './briefing-input';
import { boundsOf, EARTH_MEAN_RADIUS_M, equirectangularAbout } from './map-projection';
import { planMapRoads } from './map-roads';
import { formatCount, formatDate, formatDecimal, formatShare } from '../../../shared/format/numbers';
import { ZONE_DEFAULTS } from '../../../shared/model/zone-defaults';
import { meanPersonsPerVehicle } from '../../../shared/model/vehicles';
import { ConflictError, NotFoundError } from '../../errors';
import { getCapacityTable } from '../capacity-table';
import { toRun } from '../runs';
import { searchesOfRun } from '../proposals';
import { zoneRouteLines } from '../../../shared/format/search-answers';

type RunRow = typeof runs.$inferSelect;
import { departureCurvesDescription } from './departure-words';
import { scenarioChanges } from './scenario-words';

function zoneRings(geometry: ZoneGeometry): LonLat[][] {
  return geometry.type === 'Polygon' ? geometry.coordinates : geometry.coordinates.flat();
}

export type BriefingSourceOptions = {
  briefingId: string;
  version: number;
  createdAt: Date;
  preparer: { userId: string; role: Role };
  timeZone: string;
  verificationUrl: string;
};

/** The run of this organisation, checked to be finished with a stored result. */
export async function finishedRun(db: Database | Tx, organizationId: string, runId: string): Promise<RunRow> {
  const [row] = await db
    .select({ run: runs })
    .from(runs)
    .innerJoin(plans, eq(plans.id, runs.planId))
    .where(and(eq(runs.id, runId), eq(plans.organizationId, organizationId)));
  if (!row) throw new NotFoundError('run');
  if (row.run.status !== 'succeeded' || !row.run.result) throw new ConflictError('Only a finished analysis can be briefed: this run has not succeeded.');
  return row.run;
}

const idArray = (ids: Iterable<number>) => `{${[...new Set(ids)].filter(Number.isInteger).join(',')}}`;

/**
 * The roads the map draws (map-roads.ts): the classes the page can show, one by one for a town
 * or merged and simplified per class for a county, plus the choke points and fixes (`keepIds`)
 * as their own segments whatever their class, so they are drawn and their direction can be told.
 */
async function mapRoads(db: Database | Tx, layerId: number, keepIds: number[]): Promise<Pick<BriefingMapInput, 'segments' | 'leftOut'>> {
  const classes = await db.execute<{ road_class: string; segments: number; length_m: number; minx: number; miny: number; maxx: number; maxy: number }>(sql`
    SELECT road_class, count(*)::int AS segments, sum(length_meters)::float8 AS length_m,
           ST_XMin(ST_Extent(geom)) AS minx, ST_YMin(ST_Extent(geom)) AS miny, ST_XMax(ST_Extent(geom)) AS maxx, ST_YMax(ST_Extent(geom)) AS maxy
    FROM road_segments WHERE layer_id = ${layerId} GROUP BY road_class`);
  if (classes.rows.length === 0) return { segments: [] };
  const corners = boundsOf(classes.rows.flatMap((r) => [[r.minx, r.miny], [r.maxx, r.maxy]] as [number, number][]))!;
  const toMetres = equirectangularAbout([(corners.minX + corners.maxX) / 2, (corners.minY + corners.maxY) / 2]).toMetres;
  const [x0, y0] = toMetres([corners.minX, corners.minY]);
  const [x1, y1] = toMetres([corners.maxX, corners.maxY]);
  const plan = planMapRoads(
    classes.rows.map((r) => ({ roadClass: r.road_class, segments: r.segments, lengthMeters: r.length_m })),
    { widthMeters: x1 - x0, heightMeters: y1 - y0 },
  );
  const drawn = `{${plan.drawn.map((c) => `"${c.replace(/["\\]/g, '')}"`).join(',')}}`;
  const keep = idArray(keepIds);
  const parse = (g: string) => JSON.parse(g) as { type: string; coordinates: LonLat[] | LonLat[][] };
  if (!plan.merge) {
    const rows = await db.execute<{ id: string; road_class: string; g: string }>(sql`
      SELECT id, road_class, ST_AsGeoJSON(geom, 7) AS g FROM road_segments
      WHERE layer_id = ${layerId} AND (road_class = ANY(${drawn}::text[]) OR id = ANY(${keep}::bigint[])) ORDER BY id`);
    return { segments: rows.rows.map((r) => ({ id: Number(r.id), roadClass: r.road_class, coordinates: parse(r.g).coordinates as LonLat[] })), leftOut: plan.leftOut };
  }
  // Degrees of latitude per metre, for a tolerance given on the ground (a little finer east–west).
  const toleranceDegrees = plan.toleranceMeters / ((Math.PI / 180) * EARTH_MEAN_RADIUS_M);
  const merged = await db.execute<{ road_class: string; g: string }>(sql`
    SELECT road_class, ST_AsGeoJSON(ST_Simplify(ST_LineMerge(ST_Collect(geom)), ${toleranceDegrees}), 6) AS g
    FROM road_segments WHERE layer_id = ${layerId} AND road_class = ANY(${drawn}::text[]) AND NOT (id = ANY(${keep}::bigint[]))
    GROUP BY road_class ORDER BY road_class`);
  const kept = await db.execute<{ id: string; road_class: string; g: string }>(sql`
    SELECT id, road_class, ST_AsGeoJSON(geom, 7) AS g FROM road_segments WHERE layer_id = ${layerId} AND id = ANY(${keep}::bigint[]) ORDER BY id`);
  const segments: MapSegment[] = [];
  for (const r of merged.rows) {
    const g = parse(r.g);
    const lines = g.type === 'LineString' ? [g.coordinates as LonLat[]] : (g.coordinates as LonLat[][]);
    for (const coordinates of lines) segments.push({ id: -(segments.length + 1), roadClass: r.road_class, coordinates });
  }
  for (const r of kept.rows) segments.push({ id: Number(r.id), roadClass: r.road_class, coordinates: parse(r.g).coordinates as LonLat[] });
  return { segments, leftOut: plan.leftOut };
}

/** Names of the roads a scenario's changes name (and only those: a county has many). */
async function segmentNames(db: Database | Tx, layerId: number, ids: number[]): Promise<Map<number, string>> {
  if (ids.length === 0) return new Map();
  const rows = await db.execute<{ id: string; name: string | null }>(sql`
    SELECT id, name FROM road_segments WHERE layer_id = ${layerId} AND id = ANY(${idArray(ids)}::bigint[])`);
  return new Map(rows.rows.map((r) => [Number(r.id), r.name ?? `segment ${r.id}`]));
}

/** The run's scenario, refused if it changed after the run: the briefing would describe other changes than the figures rest on. */
async function scenarioOfRun(db: Database | Tx, run: RunRow) {
  if (!run.scenarioId) return null;
  const [scenario] = await db.select().from(scenarios).where(and(eq(scenarios.id, run.scenarioId), eq(scenarios.planId, run.planId)));
  if (!scenario) throw new ConflictError('The scenario of this analysis no longer exists, so its changes cannot be stated.');
  if (scenario.updatedAt > run.createdAt) {
    throw new ConflictError(`The scenario “${scenario.name}” changed after this analysis. Analyse it again and brief the new run.`);
  }
  return { ...scenario, overlay: storedOverlay(scenario.overlay) };
}

/**
 * Everything the briefing prints, for a draft. Refuses a run whose plan data changed since it
 * ran: the capacity table, zones and shelters would then not be the ones the figures rest on.
 */
export async function gatherBriefingInput(db: Database, organizationId: string, run: RunRow, o: BriefingSourceOptions): Promise<BriefingInput> {
  const [plan] = await db
    .select({ name: plans.name, dataVersion: plans.dataVersion, organizationName: organizations.name })
    .from(plans)
    .innerJoin(organizations, eq(organizations.id, plans.organizationId))
    .where(and(eq(plans.id, run.planId), eq(plans.organizationId, organizationId)));
  if (!plan) throw new NotFoundError('plan');
  if (plan.dataVersion !== run.dataVersion) {
    throw new ConflictError(
      `The plan's roads, zones, shelters or capacity table changed after this analysis (data version ${run.dataVersion}, now ${plan.dataVersion}). ` +
        'Analyse again and brief the new run, so that the briefing states the assumptions its figures rest on.',
    );
  }
  if (run.roadLayerId === null) throw new ConflictError('The road layer this analysis used no longer exists, so its map cannot be drawn.');
  const [layer] = await db.select().from(roadLayers).where(eq(roadLayers.id, run.roadLayerId));
  if (!layer) throw new ConflictError('The road layer this analysis used no longer exists, so its map cannot be drawn.');

  const [preparer] = await db.select({ name: users.displayName }).from(users).where(eq(users.id, o.preparer.userId));
  const zoneRows = await db.select().from(zones).where(eq(zones.planId, run.planId)).orderBy(asc(zones.id));
  const shelterRows = await db.select().from(shelters).where(eq(shelters.planId, run.planId)).orderBy(asc(shelters.id));
  const table = await getCapacityTable(db, organizationId, run.planId);
  const result = run.result!;
  const searches = await searchesOfRun(db, run.planId, run.inputHash);
  // Zone routes' corridors are drawn on their page whatever their class, so their geometry is kept.
  const routeIds = searches.flatMap((r) => (r.answer.kind === 'zone-routes' ? zoneRouteLines(r.answer).map((l) => l.segmentId) : []));
  const { segments, leftOut } = await mapRoads(db, layer.id, [...result.bottlenecks, ...result.fixes].map((r) => r.segmentId).concat(routeIds));
  const scenario = await scenarioOfRun(db, run);
  // Two passes: the first only learns which roads the words name, so only their names are read.
  const named: number[] = [];
  if (scenario) scenarioChanges(scenario.overlay, { segment: (id) => (named.push(id), ''), zone: () => '', shelter: () => '' });
  const names = await segmentNames(db, layer.id, named);
  const changes = scenario
    ? scenarioChanges(scenario.overlay, {
        segment: (id) => names.get(id) ?? `segment ${id}`,
        zone: (id) => zoneRows.find((z) => z.id === id)?.name ?? `zone ${id}`,
        shelter: (id) => shelterRows.find((sh) => sh.id === id)?.name ?? `shelter ${id}`,
      })
    : [];
  const removed = new Set(scenario?.overlay.removedShelterIds ?? []);
  // Added shelters have no row of their own; negative ids keep them apart from the plan's.
  const mapShelters = [
    ...shelterRows.filter((sh) => !removed.has(sh.id)).map((sh) => ({ id: sh.id, name: sh.name, location: [sh.lon, sh.lat] as LonLat })),
    ...(scenario?.overlay.addedShelters ?? []).map((sh, i) => ({ id: -(i + 1), name: sh.name, location: [sh.lon, sh.lat] as LonLat })),
  ];

  const tableFactor = table.capacityFactor === 1 ? '' : `the plan's capacity table adds × ${formatDecimal(table.capacityFactor)}`;
  const factorNote = [tableFactor, table.capacityFactorNote].filter(Boolean).join('; ');
  const mapZones: MapZone[] = zoneRows.map((z) => ({ id: z.id, name: z.name, rings: zoneRings(z.geometry) }));

  return {
    briefingId: o.briefingId,
    version: o.version,
    organizationName: plan.organizationName,
    planName: plan.name,
    scenarioName: scenario?.name ?? null,
    createdAt: o.createdAt,
    preparedBy: { name: preparer?.name ?? 'unknown', role: roleLabels[o.preparer.role] },
    status: 'draft',
    run: toRun(run),
    result,
    ...(searches.length ? { searches } : {}),
    assumptions: {
      dataDescription:
        `road layer “${layer.name}” imported ${formatDate(layer.createdAt, o.timeZone)} from ${layer.sourceFileName} ` +
        `(${formatCount(layer.segmentCount)} segments), ${zoneRows.length} evacuation zones, ${shelterRows.length} shelters and exits` +
        (scenario ? `; scenario “${scenario.name}”${changes.length ? ` — ${changes.join('; ')}` : ', no changes'}${scenario.description ? ` (${scenario.description})` : ''}` : ''),
      capacityTable: table.rows.map((r) => ({ ...r })),
      capacityFactorNote: factorNote,
      personsPerVehicle: meanPersonsPerVehicle(zoneRows),
      personsPerVehicleSource:
        zoneRows.length === 1
          ? `the zone's own figure`
          : `vehicle-weighted mean of the zones' figures (${[...new Set(zoneRows.map((z) => formatDecimal(z.personsPerVehicle)))].join(', ')} persons per vehicle)`,
      participation:
        `${[...new Set(zoneRows.map((z) => formatShare(z.participationRate)))].join(', ')} of residents leave` +
        `${zoneRows.length > 1 ? ' (by zone)' : ''}; the default of ${formatShare(ZONE_DEFAULTS.participationRate)} follows ${ZONE_DEFAULTS.participationRateSource}`,
      departureCurve: departureCurvesDescription(zoneRows),
    },
    map: {
      segments,
      ...(leftOut?.length ? { leftOut } : {}),
      zones: mapZones,
      shelters: mapShelters,
    },
    verificationUrl: o.verificationUrl,
    timeZone: o.timeZone,
  };
}

// Road layers in PostgreSQL: saving a built network in one transaction, reading it back for the
// map (by viewport, simplified by zoom) and the table (paged, sorted, filtered), and edits.
import { and, asc, count, desc, eq, ilike, inArray, sql, type SQL } from 'drizzle-orm';
import type { Database, Tx } from '../db/client';
import { plans, roadLayers, roadNodes, roadSegments } from '../db/schema';
import { segmentAttributesSchema, type SegmentAttributes, type SegmentAttributesPatch } from '../../shared/api/road-attributes';
import { type ImportOptions } from '../../shared/api/road-import';
import type { RoadLayer, Segment, SegmentPage, SegmentBulkUpdate, segmentPageQuerySchema } from '../../shared/api/road-layers';
import type { RoadGraph } from '../../shared/geo/build-road-graph';
import type { z } from 'zod';
import { BadRequestError, NotFoundError, zodFields } from '../errors';
import { recordAudit, type Actor } from './audit';
import { assertPlanInOrganization, bumpDataVersion } from './plan-access';

const insertBatch = 5000;

// Drizzle's sql`` spreads a JS array into a tuple; a param sends it as one PostgreSQL array.
const array = (values: unknown[]) => sql.param(values);

function lineWkt(coordinates: readonly (readonly [number, number])[]): string {
  return `LINESTRING(${coordinates.map(([x, y]) => `${x} ${y}`).join(',')})`;
}

// unnest() over parallel arrays: one statement per batch instead of one per row.
type Written = (rows: number) => Promise<void> | undefined;

async function insertNodes(tx: Tx, layerId: number, network: RoadGraph, written?: Written) {
  for (let start = 0; start < network.nodes.length; start += insertBatch) {
    const slice = network.nodes.slice(start, start + insertBatch);
    await tx.execute(sql`
      INSERT INTO road_nodes (layer_id, node_index, lon, lat)
      SELECT ${layerId}, i, lon, lat FROM unnest(
        ${array(slice.map((_, i) => start + i))}::int[], ${array(slice.map((n) => n.lon))}::float8[], ${array(slice.map((n) => n.lat))}::float8[]
      ) AS t(i, lon, lat)`);
    await written?.(start + slice.length);
  }
}

async function insertSegments(tx: Tx, layerId: number, network: RoadGraph, written?: Written) {
  for (let start = 0; start < network.segments.length; start += insertBatch) {
    const s = network.segments.slice(start, start + insertBatch);
    const a = s.map((x) => x.attributes);
    await tx.execute(sql`
      INSERT INTO road_segments (layer_id, from_node, to_node, road_class, lanes_forward, lanes_backward, oneway, speed_kmh,
        name, bridge, tunnel, layer, closed, capacity_override_veh_per_hour_per_lane, length_meters, component,
        source_feature_index, source_id, geom)
      SELECT ${layerId}, f, t, c, lf, lb, o, sp, n, b, tu, l, cl, co, len, comp, sfi, sid, ST_GeomFromText(g, 4326)
      FROM unnest(
        ${array(s.map((x) => x.fromNode))}::int[], ${array(s.map((x) => x.toNode))}::int[], ${array(a.map((x) => x.roadClass))}::text[],
        ${array(a.map((x) => x.lanesForward))}::int[], ${array(a.map((x) => x.lanesBackward))}::int[], ${array(a.map((x) => x.oneway))}::bool[],
        ${array(a.map((x) => x.speedKmh))}::real[], ${array(a.map((x) => x.name))}::text[], ${array(a.map((x) => x.bridge))}::bool[],
        ${array(a.map((x) => x.tunnel))}::bool[], ${array(a.map((x) => x.layer))}::int[], ${array(a.map((x) => x.closed))}::bool[],
        ${array(a.map((x) => x.capacityOverrideVehPerHourPerLane))}::real[], ${array(s.map((x) => x.lengthMeters))}::float8[],
        ${array(s.map((x) => x.component))}::int[], ${array(s.map((x) => x.sourceFeatureIndex))}::int[], ${array(s.map((x) => x.sourceId))}::text[],
        ${array(s.map((x) => lineWkt(x.coordinates)))}::text[]
      ) AS u(f, t, c, lf, lb, o, sp, n, b, tu, l, cl, co, len, comp, sfi, sid, g)`);
    await written?.(start + s.length);
  }
}

/** Saves a built network as the plan's active road layer; the previous one is kept, inactive. */
export async function saveRoadLayer(
  db: Database,
  actor: Actor,
  planId: string,
  network: RoadGraph,
  meta: { name: string; sourceFileName: string; importOptions: ImportOptions },
  // An import job's hooks: the share of rows written so far, and a last word before the commit
  // (a cancel that came in meanwhile throws there and rolls everything back).
  hooks: { onProgress?: (share: number) => Promise<void>; beforeCommit?: (tx: Tx) => Promise<void> } = {},
): Promise<RoadLayer> {
  const layerId = await db.transaction(async (tx) => {
    await bumpDataVersion(tx, actor.organizationId, planId);
    await tx.update(roadLayers).set({ active: false }).where(eq(roadLayers.planId, planId));
    const [layer] = await tx
      .insert(roadLayers)
      .values({
        planId,
        name: meta.name,
        sourceFileName: meta.sourceFileName,
        importOptions: meta.importOptions,
        report: network.report,
        nodeCount: network.nodes.length,
        segmentCount: network.segments.length,
        createdBy: actor.userId,
      })
      .returning({ id: roadLayers.id });
    const rows = network.nodes.length + network.segments.length || 1;
    await insertNodes(tx, layer!.id, network, (n) => hooks.onProgress?.(n / rows));
    await insertSegments(tx, layer!.id, network, (n) => hooks.onProgress?.((network.nodes.length + n) / rows));
    await recordAudit(tx, actor, 'road-layer.import', 'road_layer', String(layer!.id), {
      planId,
      file: meta.sourceFileName,
      segments: network.segments.length,
      nodes: network.nodes.length,
    });
    await hooks.beforeCommit?.(tx);
    return layer!.id;
  });
  const layer = await getActiveRoadLayer(db, actor.organizationId, planId);
  if (!layer || layer.id !== layerId) throw new Error('the saved road layer is not the active one');
  return layer;
}

export async function activeLayerId(db: Database | Tx, planId: string): Promise<number | null> {
  const [row] = await db
    .select({ id: roadLayers.id })
    .from(roadLayers)
    .where(and(eq(roadLayers.planId, planId), eq(roadLayers.active, true)));
  return row?.id ?? null;
}

export async function getActiveRoadLayer(db: Database, organizationId: string, planId: string): Promise<RoadLayer | null> {
  await assertPlanInOrganization(db, organizationId, planId);
  const [row] = await db
    .select()
    .from(roadLayers)
    .where(and(eq(roadLayers.planId, planId), eq(roadLayers.active, true)));
  if (!row) return null;
  const extent = await db.execute<{ w: number | null; s: number | null; e: number | null; n: number | null }>(sql`
    SELECT ST_XMin(x) AS w, ST_YMin(x) AS s, ST_XMax(x) AS e, ST_YMax(x) AS n
    FROM (SELECT ST_Extent(geom)::geometry AS x FROM road_segments WHERE layer_id = ${row.id}) q`);
  const b = extent.rows[0];
  return {
    id: row.id,
    planId: row.planId,
    name: row.name,
    sourceFileName: row.sourceFileName,
    nodeCount: row.nodeCount,
    segmentCount: row.segmentCount,
    report: row.report,
    bbox: b && b.w !== null ? [b.w, b.s!, b.e!, b.n!] : null,
    createdAt: row.createdAt.toISOString(),
  };
}

/**
 * The plan's active road layer and data version, in one query that also checks the plan's
 * organization. Every change to a plan's roads moves its data version on (plan-access.ts), so
 * the two name the map's content.
 */
export async function activeLayerVersion(db: Database | Tx, organizationId: string, planId: string): Promise<{ layerId: number; dataVersion: number }> {
  const [row] = await db
    .select({ dataVersion: plans.dataVersion, layerId: roadLayers.id })
    .from(plans)
    .leftJoin(roadLayers, and(eq(roadLayers.planId, plans.id), eq(roadLayers.active, true)))
    .where(and(eq(plans.id, planId), eq(plans.organizationId, organizationId)));
  if (!row) throw new NotFoundError('plan');
  if (row.layerId === null) throw new NotFoundError('road layer (upload one first)');
  return { layerId: row.layerId, dataVersion: row.dataVersion };
}

async function requireActiveLayer(db: Database | Tx, organizationId: string, planId: string): Promise<number> {
  return (await activeLayerVersion(db, organizationId, planId)).layerId;
}

/** A segment's editable attributes as stored: every reader of the layer selects these the same way. */
export const segmentAttributeColumns = {
  roadClass: roadSegments.roadClass,
  lanesForward: roadSegments.lanesForward,
  lanesBackward: roadSegments.lanesBackward,
  oneway: roadSegments.oneway,
  speedKmh: roadSegments.speedKmh,
  name: roadSegments.name,
  bridge: roadSegments.bridge,
  tunnel: roadSegments.tunnel,
  layer: roadSegments.layer,
  closed: roadSegments.closed,
  capacityOverrideVehPerHourPerLane: roadSegments.capacityOverrideVehPerHourPerLane,
};

const segmentColumns = {
  id: roadSegments.id,
  fromNode: roadSegments.fromNode,
  toNode: roadSegments.toNode,
  ...segmentAttributeColumns,
  lengthMeters: roadSegments.lengthMeters,
  component: roadSegments.component,
  sourceId: roadSegments.sourceId,
};

type SegmentRow = { [K in keyof typeof segmentColumns]: unknown };
function toSegment(row: SegmentRow): Segment {
  return row as Segment;
}

/** A page of a road layer's segments; the caller has checked that the layer is its plan's (activeLayerVersion). */
export async function segmentPageOfLayer(db: Database, layerId: number, query: z.output<typeof segmentPageQuerySchema>): Promise<SegmentPage> {
  const filters: SQL[] = [eq(roadSegments.layerId, layerId)];
  if (query.roadClass) filters.push(eq(roadSegments.roadClass, query.roadClass));
  if (query.name) filters.push(ilike(roadSegments.name, `%${query.name.replaceAll(/[%_\\]/g, (c) => `\\${c}`)}%`));
  if (query.closed !== undefined) filters.push(eq(roadSegments.closed, query.closed));
  if (query.bridge !== undefined) filters.push(eq(roadSegments.bridge, query.bridge));
  const where = and(...filters);
  const column = roadSegments[query.sortBy];
  const order = query.sortOrder === 'asc' ? asc(column) : desc(column);
  const [items, [total]] = await Promise.all([
    db
      .select(segmentColumns)
      .from(roadSegments)
      .where(where)
      .orderBy(order, asc(roadSegments.id))
      .limit(query.pageSize)
      .offset((query.page - 1) * query.pageSize),
    db.select({ n: count() }).from(roadSegments).where(where),
  ]);
  return { items: items.map(toSegment), total: total?.n ?? 0 };
}

export async function getSegment(db: Database, organizationId: string, planId: string, segmentId: number): Promise<Segment> {
  const layerId = await requireActiveLayer(db, organizationId, planId);
  const [row] = await db
    .select(segmentColumns)
    .from(roadSegments)
    .where(and(eq(roadSegments.layerId, layerId), eq(roadSegments.id, segmentId)));
  if (!row) throw new NotFoundError('segment');
  return toSegment(row);
}

function mergeAttributes(current: Segment, patch: SegmentAttributesPatch): SegmentAttributes {
  const merged = { ...pickAttributes(current), ...patch };
  // Turning a two-way road one-way (or back) moves the lanes with it unless the edit said otherwise.
  if (patch.oneway === true && patch.lanesBackward === undefined) merged.lanesBackward = 0;
  if (patch.oneway === false && patch.lanesBackward === undefined && current.lanesBackward === 0) merged.lanesBackward = null;
  const parsed = segmentAttributesSchema.safeParse(merged);
  if (!parsed.success) throw new BadRequestError(`Segment ${current.id}: ${parsed.error.issues.map((i) => i.message).join('; ')}`, zodFields(parsed.error));
  return parsed.data;
}

function pickAttributes(s: Segment): SegmentAttributes {
  const { roadClass, lanesForward, lanesBackward, oneway, speedKmh, name, bridge, tunnel, layer, closed, capacityOverrideVehPerHourPerLane } = s;
  return { roadClass, lanesForward, lanesBackward, oneway, speedKmh, name, bridge, tunnel, layer, closed, capacityOverrideVehPerHourPerLane };
}

/** Applies one patch to several segments (one of them is a single edit), all or nothing. */
export async function updateSegments(db: Database, actor: Actor, planId: string, update: SegmentBulkUpdate): Promise<Segment[]> {
  return db.transaction(async (tx) => {
    const layerId = await requireActiveLayer(tx, actor.organizationId, planId);
    const rows = await tx
      .select(segmentColumns)
      .from(roadSegments)
      .where(and(eq(roadSegments.layerId, layerId), inArray(roadSegments.id, update.ids)))
      .for('update');
    const found = new Set(rows.map((r) => r.id));
    const missing = update.ids.filter((id) => !found.has(id));
    if (missing.length > 0) throw new NotFoundError(`segment ${missing.slice(0, 5).join(', ')}${missing.length > 5 ? '…' : ''}`);
    const updated: Segment[] = [];
    for (const row of rows.map(toSegment)) {
      const attributes = mergeAttributes(row, update.patch);
      await tx.update(roadSegments).set({ ...attributes, updatedAt: new Date() }).where(eq(roadSegments.id, row.id));
      updated.push({ ...row, ...attributes });
    }
    const version = await bumpDataVersion(tx, actor.organizationId, planId);
    await recordAudit(tx, actor, 'segment.update', 'road_segment', update.ids.length === 1 ? String(update.ids[0]) : null, {
      planId,
      ids: update.ids.slice(0, 100),
      count: update.ids.length,
      patch: update.patch,
      dataVersion: version,
    });
    return updated;
  });
}

/** The active layer's nodes and segments, as the model needs them to build the engine's problem. */
export async function loadNetwork(db: Database | Tx, layerId: number) {
  const nodes = await db
    .select({ lon: roadNodes.lon, lat: roadNodes.lat })
    .from(roadNodes)
    .where(eq(roadNodes.layerId, layerId))
    .orderBy(asc(roadNodes.nodeIndex));
  const segments = await db.select(segmentColumns).from(roadSegments).where(eq(roadSegments.layerId, layerId)).orderBy(asc(roadSegments.id));
  return { nodes, segments: segments.map(toSegment) };
}

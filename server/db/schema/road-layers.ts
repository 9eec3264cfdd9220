// A plan's road data: road layers (one active at a time; older ones stay so that past runs can
// still be drawn), their nodes and segments, the plan's capacity table, zones and shelters.
import { bigserial, boolean, doublePrecision, index, integer, jsonb, pgTable, primaryKey, real, serial, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import type { CapacityTable } from '../../../shared/api/capacity-table';
import type { DepartureCurve } from '../../../shared/api/zone-shelter-attributes';
import type { ImportOptions, ImportReport } from '../../../shared/api/road-import';
import type { ZoneGeometry } from '../../../shared/api/zones-shelters';
import { plans } from './plans';
import { users } from './organizations';
import { geometry } from './postgis';

export const roadLayers = pgTable(
  'road_layers',
  {
    id: serial().primaryKey(),
    planId: uuid()
      .notNull()
      .references(() => plans.id, { onDelete: 'cascade' }),
    name: text().notNull(),
    sourceFileName: text().notNull(),
    importOptions: jsonb().$type<ImportOptions>().notNull(),
    report: jsonb().$type<ImportReport>().notNull(),
    active: boolean().notNull().default(true),
    nodeCount: integer().notNull(),
    segmentCount: integer().notNull(),
    createdBy: uuid().references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp({ withTimezone: true, mode: 'date' }).notNull().defaultNow(),
  },
  (t) => [index().on(t.planId, t.active)],
);

export const roadNodes = pgTable(
  'road_nodes',
  {
    layerId: integer()
      .notNull()
      .references(() => roadLayers.id, { onDelete: 'cascade' }),
    // The node's index in the built network (0..n-1): segments refer to nodes by it.
    nodeIndex: integer().notNull(),
    lon: doublePrecision().notNull(),
    lat: doublePrecision().notNull(),
  },
  (t) => [primaryKey({ columns: [t.layerId, t.nodeIndex] })],
);

const lineString = geometry('LineString');

export const roadSegments = pgTable(
  'road_segments',
  {
    id: bigserial({ mode: 'number' }).primaryKey(),
    layerId: integer()
      .notNull()
      .references(() => roadLayers.id, { onDelete: 'cascade' }),
    fromNode: integer().notNull(),
    toNode: integer().notNull(),
    roadClass: text().notNull(),
    lanesForward: integer(),
    lanesBackward: integer(),
    oneway: boolean().notNull(),
    // Double precision so that a speed entered in mph (35 → 56.32704 km/h) converts back to
    // exactly what was entered (shared/format/units.ts).
    speedKmh: doublePrecision(),
    name: text(),
    bridge: boolean().notNull(),
    tunnel: boolean().notNull(),
    layer: integer().notNull(),
    closed: boolean().notNull().default(false),
    capacityOverrideVehPerHourPerLane: real(),
    lengthMeters: doublePrecision().notNull(),
    component: integer().notNull(),
    sourceFeatureIndex: integer().notNull(),
    sourceId: text(),
    geom: lineString().notNull(),
    updatedAt: timestamp({ withTimezone: true, mode: 'date' }).notNull().defaultNow(),
  },
  (t) => [
    index().on(t.layerId, t.id),
    index().on(t.layerId, t.roadClass),
    index('road_segments_geom_idx').using('gist', t.geom),
  ],
);

export const capacityTables = pgTable('capacity_tables', {
  planId: uuid()
    .primaryKey()
    .references(() => plans.id, { onDelete: 'cascade' }),
  table: jsonb().$type<CapacityTable>().notNull(),
  updatedAt: timestamp({ withTimezone: true, mode: 'date' }).notNull().defaultNow(),
});

export const zones = pgTable(
  'zones',
  {
    id: serial().primaryKey(),
    planId: uuid()
      .notNull()
      .references(() => plans.id, { onDelete: 'cascade' }),
    name: text().notNull(),
    population: integer().notNull(),
    participationRate: real().notNull(),
    personsPerVehicle: real().notNull(),
    departureCurve: jsonb().$type<DepartureCurve>().notNull(),
    // GeoJSON Polygon or MultiPolygon, WGS84. Zones are few: no spatial index needed.
    geometry: jsonb().$type<ZoneGeometry>().notNull(),
    updatedAt: timestamp({ withTimezone: true, mode: 'date' }).notNull().defaultNow(),
  },
  (t) => [index().on(t.planId)],
);

export const shelters = pgTable(
  'shelters',
  {
    id: serial().primaryKey(),
    planId: uuid()
      .notNull()
      .references(() => plans.id, { onDelete: 'cascade' }),
    name: text().notNull(),
    // null: an exit at the study-area edge, unbounded.
    capacityPersons: integer(),
    lon: doublePrecision().notNull(),
    lat: doublePrecision().notNull(),
    updatedAt: timestamp({ withTimezone: true, mode: 'date' }).notNull().defaultNow(),
  },
  (t) => [index().on(t.planId)],
);

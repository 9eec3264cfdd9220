// Runs: one analysis each, with the exact inputs it used and its full result.
import { bigint, boolean, customType, index, integer, jsonb, pgEnum, pgTable, primaryKey, real, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import type { RunParameters, RunResult } from '../../../shared/api/runs';
import type { RunInput } from '../../../shared/model/run-input';
import type { SweepParameter } from '../../../shared/api/sweeps';
import { plans } from './plans';
import { users } from './organizations';
import { roadLayers } from './road-layers';

export const runStatusEnum = pgEnum('run_status', ['queued', 'running', 'succeeded', 'failed', 'cancelled']);

export const runs = pgTable(
  'runs',
  {
    id: uuid().primaryKey().defaultRandom(),
    planId: uuid()
      .notNull()
      .references(() => plans.id, { onDelete: 'cascade' }),
    scenarioId: uuid(),
    sweepId: uuid('batch_id'),
    sweepValue: real(),
    status: runStatusEnum().notNull().default('queued'),
    phase: text().notNull().default('queued'),
    progress: real().notNull().default(0),
    parameters: jsonb().$type<RunParameters>().notNull(),
    // The plan's data version and road layer the run read; the hash identifies its exact input.
    dataVersion: integer().notNull(),
    roadLayerId: integer().references(() => roadLayers.id, { onDelete: 'set null' }),
    // Null until a worker has prepared the run (built its problem and hashed it).
    inputHash: text(),
    result: jsonb().$type<RunResult>(),
    failureReason: text(),
    createdBy: uuid().references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp({ withTimezone: true, mode: 'date' }).notNull().defaultNow(),
    startedAt: timestamp({ withTimezone: true, mode: 'date' }),
    finishedAt: timestamp({ withTimezone: true, mode: 'date' }),
  },
  (t) => [index().on(t.planId, t.createdAt), index().on(t.planId, t.inputHash)],
);

// What a worker needs to solve a run, stored with it: any worker on any machine can pick the
// run up (or retry it after a crash) and solve exactly the input the planner started.
export const runInputs = pgTable('run_inputs', {
  runId: uuid()
    .primaryKey()
    .references(() => runs.id, { onDelete: 'cascade' }),
  input: jsonb().$type<RunInput>().notNull(),
});

// Each road's figures in a finished run (RoadResult in shared/api/runs), one row per segment:
// the map's tiles, a road's popup and the arcs export read them; the result itself stays small.
export const runRoadResults = pgTable(
  'run_road_results',
  {
    runId: uuid()
      .notNull()
      .references(() => runs.id, { onDelete: 'cascade' }),
    // A segment of the run's road layer (runs.road_layer_id).
    segmentId: bigint({ mode: 'number' }).notNull(),
    // Vehicles per hour in the steady state; capacity null where the road has no lane that way.
    flowForward: real().notNull(),
    flowBackward: real().notNull(),
    capacityForward: real(),
    capacityBackward: real(),
    utilisation: real().notNull(),
    cutForward: boolean().notNull(),
    cutBackward: boolean().notNull(),
    shareOfCut: real().notNull(),
    limitingMinutes: real().notNull(),
  },
  (t) => [primaryKey({ columns: [t.runId, t.segmentId] })],
);

// A sweep of one parameter over a scenario: its runs carry sweepId and their sweep value. The table
// and column keep their first names (batches, runs.batch_id) so no migration renames them.
export const sweeps = pgTable('batches', {
  id: uuid().primaryKey().defaultRandom(),
  planId: uuid()
    .notNull()
    .references(() => plans.id, { onDelete: 'cascade' }),
  name: text().notNull(),
  scenarioId: uuid(),
  parameter: text().$type<SweepParameter>().notNull(),
  values: jsonb().$type<number[]>().notNull(),
  createdBy: uuid().references(() => users.id, { onDelete: 'set null' }),
  createdAt: timestamp({ withTimezone: true, mode: 'date' }).notNull().defaultNow(),
});

// A run's map tiles at the zooms that show a whole plan (few tiles, each costly to build: every
// road of the shown classes in it), kept in PostgreSQL so that every API process and machine
// shares them: the worker draws them when the run finishes, and an API process stores one it had
// to build. Keyed by the plan's data version as well (a closure edited after the run shows on
// the run's map), and dropped with the run.
const bytea = customType<{ data: Buffer; driverData: Buffer }>({ dataType: () => 'bytea' });

export const runTiles = pgTable(
  'run_tiles',
  {
    runId: uuid()
      .notNull()
      .references(() => runs.id, { onDelete: 'cascade' }),
    dataVersion: integer().notNull(),
    layerId: integer().notNull(),
    z: integer().notNull(),
    x: integer().notNull(),
    y: integer().notNull(),
    tile: bytea().notNull(),
  },
  (t) => [primaryKey({ columns: [t.runId, t.dataVersion, t.layerId, t.z, t.x, t.y] })],
);

// Imports of road, zone and shelter files, queued like runs: the upload's bytes are kept here
// until a worker (on any machine with the same database) has read them, with the job's phase,
// progress and outcome.
import { customType, index, integer, jsonb, pgEnum, pgTable, real, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import type { ImportFailure, ImportJobOptions } from '../../../shared/api/road-import';
import { plans } from './plans';
import { users } from './organizations';

const bytea = customType<{ data: Buffer; driverData: Buffer }>({ dataType: () => 'bytea' });

export const importKindEnum = pgEnum('import_kind', ['road-layer', 'zones', 'shelters']);
export const importStatusEnum = pgEnum('import_status', ['queued', 'running', 'succeeded', 'failed', 'cancelled']);

export const imports = pgTable(
  'imports',
  {
    id: uuid().primaryKey().defaultRandom(),
    planId: uuid()
      .notNull()
      .references(() => plans.id, { onDelete: 'cascade' }),
    kind: importKindEnum().notNull(),
    status: importStatusEnum().notNull().default('queued'),
    phase: text().notNull().default('queued'),
    progress: real().notNull().default(0),
    fileName: text().notNull(),
    sizeBytes: integer().notNull(),
    // The road layer's name (road layers only) and the import options of the file's kind.
    layerName: text(),
    options: jsonb().$type<ImportJobOptions>(),
    // The upload; emptied once the import has finished, whatever its outcome.
    bytes: bytea(),
    failure: jsonb().$type<ImportFailure>(),
    // What was written: { layerId } or { created: n }, with the reader's notes.
    outcome: jsonb().$type<Record<string, unknown>>(),
    createdBy: uuid().references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp({ withTimezone: true, mode: 'date' }).notNull().defaultNow(),
    startedAt: timestamp({ withTimezone: true, mode: 'date' }),
    finishedAt: timestamp({ withTimezone: true, mode: 'date' }),
  },
  (t) => [index().on(t.planId, t.createdAt)],
);

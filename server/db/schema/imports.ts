// Imports of road, zone and shelter files, queued like runs: the upload's bytes are kept in
// import_chunks until a worker (on any machine with the same database) has read them, with the
// job's phase, progress and outcome here.
import { customType, index, integer, jsonb, pgEnum, pgTable, primaryKey, real, text, timestamp, uuid } from 'drizzle-orm/pg-core';
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

// The upload's bytes in the order they arrived, about 1 MB a row: the request writes each piece as
// it comes off the socket (inside the import's transaction, so a refused or broken upload leaves
// none), and never holds the whole file. Deleted once the import has finished, whatever its outcome.
// Stored uncompressed (STORAGE EXTERNAL in the migration): compressing tens of megabytes in the
// upload's transaction made the request wait for it; the rows live minutes.
export const importChunks = pgTable(
  'import_chunks',
  {
    importId: uuid()
      .notNull()
      .references(() => imports.id, { onDelete: 'cascade' }),
    seq: integer().notNull(),
    bytes: bytea().notNull(),
  },
  (t) => [primaryKey({ columns: [t.importId, t.seq] })],
);

// Field-mapping presets, per organisation: the column choices for a kind of file under a name.
import { jsonb, pgTable, text, timestamp, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import type { FieldMapping } from '../../../shared/api/road-import';
import { organizations, users } from './organizations';

export const mappingPresets = pgTable(
  'mapping_presets',
  {
    id: uuid().primaryKey().defaultRandom(),
    organizationId: uuid()
      .notNull()
      .references(() => organizations.id, { onDelete: 'cascade' }),
    name: text().notNull(),
    kind: text().$type<'roads' | 'zones' | 'shelters'>().notNull(),
    fieldNames: jsonb().$type<string[]>().notNull(),
    mapping: jsonb().$type<FieldMapping>().notNull(),
    createdBy: uuid().references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp({ withTimezone: true, mode: 'date' }).notNull().defaultNow(),
    updatedAt: timestamp({ withTimezone: true, mode: 'date' }).notNull().defaultNow(),
  },
  // Saving under a name the organisation already uses for that kind replaces it.
  (t) => [uniqueIndex().on(t.organizationId, t.kind, t.name)],
);

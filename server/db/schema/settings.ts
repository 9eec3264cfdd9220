// Settings an organization's administrator changes at run time (e.g. the basemap tiles), one
// row per organization and key: one office's choice never reaches another.
import { jsonb, pgTable, primaryKey, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { organizations } from './organizations';

export const appSettings = pgTable(
  'app_settings',
  {
    organizationId: uuid()
      .notNull()
      .references(() => organizations.id, { onDelete: 'cascade' }),
    key: text().notNull(),
    value: jsonb().notNull(),
    updatedAt: timestamp({ withTimezone: true, mode: 'date' }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.organizationId, t.key] })],
);

// Plans belong to one organization; every other planning record hangs off a plan.
import { index, integer, pgTable, text, uuid } from 'drizzle-orm/pg-core';
import { timestamps } from './columns';
import { organizations, users } from './organizations';

export const plans = pgTable(
  'plans',
  {
    id: uuid().primaryKey().defaultRandom(),
    organizationId: uuid()
      .notNull()
      .references(() => organizations.id, { onDelete: 'cascade' }),
    name: text().notNull(),
    description: text().notNull().default(''),
    createdBy: uuid().references(() => users.id, { onDelete: 'set null' }),
    // Goes up by one with every change to the plan's road data, zones, shelters or capacity
    // table; a run records the version it read.
    dataVersion: integer().notNull().default(0),
    ...timestamps,
  },
  (t) => [index().on(t.organizationId)],
);

// Plans belong to one organization; every other planning record hangs off a plan.
import { index, pgTable, text, uuid } from 'drizzle-orm/pg-core';
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
    ...timestamps,
  },
  (t) => [index().on(t.organizationId)],
);

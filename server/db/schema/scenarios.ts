// Scenarios: named overlays on a plan's base data (closures, contraflow, lane changes, capacity
// factors, shelters added or removed, staggered departures).
import { index, jsonb, pgTable, text, uuid } from 'drizzle-orm/pg-core';
import type { ScenarioOverlay } from '../../../shared/api/scenarios';
import { timestamps } from './columns';
import { plans } from './plans';
import { users } from './organizations';

export const scenarios = pgTable(
  'scenarios',
  {
    id: uuid().primaryKey().defaultRandom(),
    planId: uuid()
      .notNull()
      .references(() => plans.id, { onDelete: 'cascade' }),
    name: text().notNull(),
    description: text().notNull().default(''),
    overlay: jsonb().$type<ScenarioOverlay>().notNull(),
    createdBy: uuid().references(() => users.id, { onDelete: 'set null' }),
    ...timestamps,
  },
  (t) => [index().on(t.planId)],
);

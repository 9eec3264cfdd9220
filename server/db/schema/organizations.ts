// Organizations (a city or county office), their users, and each user's role there.
import { index, pgEnum, pgTable, primaryKey, text, timestamp, uuid, boolean, integer } from 'drizzle-orm/pg-core';
import { timestamps } from './columns';

export const roleEnum = pgEnum('role', ['admin', 'planner', 'official', 'viewer']);
export const unitSystemEnum = pgEnum('unit_system', ['metric', 'us-customary']);

export const organizations = pgTable('organizations', {
  id: uuid().primaryKey().defaultRandom(),
  name: text().notNull(),
  slug: text().notNull().unique(),
  // What its screens, forms, exports and briefings use: lengths and speeds, and the zone times
  // are given in (null: the deployment's BRIEFING_TIME_ZONE).
  unitSystem: unitSystemEnum().notNull().default('metric'),
  timeZone: text(),
  ...timestamps,
});

export const users = pgTable('users', {
  id: uuid().primaryKey().defaultRandom(),
  // Stored lower-case; sign-in lower-cases what is typed.
  email: text().notNull().unique(),
  displayName: text().notNull(),
  passwordHash: text().notNull(),
  disabled: boolean().notNull().default(false),
  // Failed sign-ins in a row, from any address; enough of them lock the account for a while.
  failedSignIns: integer().notNull().default(0),
  lockedUntil: timestamp({ withTimezone: true, mode: 'date' }),
  ...timestamps,
});

export const memberships = pgTable(
  'memberships',
  {
    userId: uuid()
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    organizationId: uuid()
      .notNull()
      .references(() => organizations.id, { onDelete: 'cascade' }),
    role: roleEnum().notNull(),
    joinedAt: timestamp({ withTimezone: true, mode: 'date' }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.userId, t.organizationId] }), index().on(t.organizationId)],
);

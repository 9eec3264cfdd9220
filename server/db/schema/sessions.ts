// The table connect-pg-simple keeps sessions in (its documented layout), owned by our migrations.
import { index, json, pgTable, timestamp, varchar } from 'drizzle-orm/pg-core';

export const sessions = pgTable(
  'sessions',
  {
    sid: varchar().primaryKey(),
    sess: json().notNull(),
    expire: timestamp({ precision: 6, mode: 'date' }).notNull(),
  },
  (t) => [index('sessions_expire_idx').on(t.expire)],
);

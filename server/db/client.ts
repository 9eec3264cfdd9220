// One pg Pool and the Drizzle instance over it. Column names are snake_case in SQL,
// camelCase in TypeScript: the casing is set here, once.
import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import pg from 'pg';
import * as schema from './schema';

export type Database = NodePgDatabase<typeof schema>;
// A transaction has the same query surface as the database.
export type Tx = Parameters<Parameters<Database['transaction']>[0]>[0];

export function createDatabase(url: string): { pool: pg.Pool; db: Database } {
  const pool = new pg.Pool({ connectionString: url, max: 10 });
  const db = drizzle(pool, { schema, casing: 'snake_case' });
  return { pool, db };
}

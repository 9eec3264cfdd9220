// Applies the committed migrations in drizzle/ to DATABASE_URL.
import { fileURLToPath } from 'node:url';
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import { createDatabase } from './client';
import { loadConfig } from '../config';

export const migrationsFolder = fileURLToPath(new URL('../../drizzle', import.meta.url));

export async function migrateDatabase(url: string): Promise<void> {
  const { db, pool } = createDatabase(url);
  try {
    await migrate(db, { migrationsFolder });
  } finally {
    await pool.end();
  }
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  await migrateDatabase(loadConfig().DATABASE_URL);
}

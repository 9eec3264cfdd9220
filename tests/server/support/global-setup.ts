// Once per test run: (re)create the template database from the committed migrations, and drop
// databases that earlier interrupted runs left behind.
import { migrateDatabase } from '../../../server/db/migrate';
import { databaseUrl, templateDatabase, withAdminClient } from './database';

export default async function setup() {
  await withAdminClient(async (c) => {
    const { rows } = await c.query<{ datname: string }>("SELECT datname FROM pg_database WHERE datname LIKE 'cutline_test_%'");
    for (const { datname } of rows) await c.query(`DROP DATABASE IF EXISTS "${datname}" WITH (FORCE)`);
    await c.query(`CREATE DATABASE "${templateDatabase}"`);
  });
  await migrateDatabase(databaseUrl(templateDatabase));
}

// Once per test run: a template database migrated from the committed migrations, which every
// test file clones. Each run gets its own template, so test runs side by side (a developer's
// and CI's, say) never drop each other's databases; leftovers of interrupted runs that nobody
// is connected to are removed.
import { randomBytes } from 'node:crypto';
import { migrateDatabase } from '../../../server/db/migrate';
import { databaseUrl, withAdminClient } from './database';

export default async function setup() {
  const template = `cutline_test_template_${randomBytes(4).toString('hex')}`;
  process.env.CUTLINE_TEST_TEMPLATE = template;
  await withAdminClient(async (c) => {
    const { rows } = await c.query<{ datname: string }>(
      `SELECT datname FROM pg_database d WHERE datname LIKE 'cutline_test_%'
         AND NOT EXISTS (SELECT 1 FROM pg_stat_activity a WHERE a.datname = d.datname)`,
    );
    for (const { datname } of rows) await c.query(`DROP DATABASE IF EXISTS "${datname}"`).catch(() => undefined);
    await c.query(`CREATE DATABASE "${template}"`);
  });
  await migrateDatabase(databaseUrl(template));
  return async () => {
    await withAdminClient((c) => c.query(`DROP DATABASE IF EXISTS "${template}" WITH (FORCE)`)).catch(() => undefined);
  };
}

// Once per test run: a template database migrated from the committed migrations, which every
// test file clones. Each run gets its own template, so test runs side by side (a developer's
// and CI's, say) never drop each other's databases; leftovers of interrupted runs, named with
// a creation time, are removed once they are a day old.
import { migrateDatabase } from '../../../server/db/migrate';
import { databaseUrl, testDatabaseStamp, withAdminClient } from './database';

export default async function setup() {
  const template = `cutline_test_template_${testDatabaseStamp()}`;
  process.env.CUTLINE_TEST_TEMPLATE = template;
  await withAdminClient(async (c) => {
    const { rows } = await c.query<{ datname: string }>("SELECT datname FROM pg_database WHERE datname LIKE 'cutline_test_%'");
    const dayAgo = Math.floor(Date.now() / 1000) - 86_400;
    for (const { datname } of rows) {
      const created = Number(/_(\d{10})_[0-9a-f]+$/.exec(datname)?.[1] ?? 0);
      if (created < dayAgo) await c.query(`DROP DATABASE IF EXISTS "${datname}" WITH (FORCE)`).catch(() => undefined);
    }
    await c.query(`CREATE DATABASE "${template}"`);
  });
  await migrateDatabase(databaseUrl(template));
  return async () => {
    await withAdminClient((c) => c.query(`DROP DATABASE IF EXISTS "${template}" WITH (FORCE)`)).catch(() => undefined);
  };
}

// `npm run db:seed`: the demo organization, its accounts and its ready plan.
import { loadConfig } from '../config';
import { createDatabase } from '../db/client';
import { demoAccounts, demoOrganization } from './demo-accounts';
import { seedDemo } from './seed-demo';

const config = loadConfig();
const { db, pool } = createDatabase(config.DATABASE_URL);
try {
  await seedDemo(db, config.PASSWORD_HASH_ROUNDS);
  console.log(`Seeded "${demoOrganization.name}" with ${demoAccounts.length} accounts.`);
} finally {
  await pool.end();
}

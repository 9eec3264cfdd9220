// `npm run db:seed [-- --demo]`: the demo organization, its accounts and its ready plan, where
// wanted (server/seed/seed-command.ts).
import { loadConfig } from '../config';
import { createDatabase } from '../db/client';
import { runSeed } from './seed-command';

const config = loadConfig();
const { db, pool } = createDatabase(config.DATABASE_URL);
try {
  const { message } = await runSeed(db, config, process.argv.includes('--demo'));
  console.log(message);
} finally {
  await pool.end();
}

// What `npm run db:seed` (and `npm start`) seeds: the demo organization, whose passwords are
// published in the code, only where NODE_ENV is not production — or when asked for explicitly
// (`--demo` or SEED_DEMO=yes). A production installation starts with no organization; its
// first administrator is made with `npm run org:create` (server/cli/create-organization.ts).
import type { Config } from '../config';
import type { Database } from '../db/client';
import { seedDemo } from './seed-demo';

export function demoWanted(config: Pick<Config, 'NODE_ENV' | 'SEED_DEMO'>, askedFor: boolean): boolean {
  if (askedFor || config.SEED_DEMO === 'yes') return true;
  if (config.SEED_DEMO === 'no') return false;
  return config.NODE_ENV !== 'production';
}

export async function runSeed(db: Database, config: Config, askedFor: boolean): Promise<{ seeded: boolean; message: string }> {
  if (!demoWanted(config, askedFor)) {
    return {
      seeded: false,
      message:
        config.NODE_ENV === 'production'
          ? 'NODE_ENV=production: the demo organization is not seeded (its passwords are public). Create your organization and its first administrator with `npm run org:create`.'
          : 'SEED_DEMO=no: the demo organization is not seeded.',
    };
  }
  const { created } = await seedDemo(db, config.PASSWORD_HASH_ROUNDS);
  return {
    seeded: true,
    message: created ? 'Seeded the demo organization "Veltmoor Emergency Management" and its plan.' : 'The demo organization is already there; left as it is.',
  };
}

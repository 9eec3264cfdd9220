// Limits on starting runs: so many per person per minute, and so many waiting or running per
// organization. Solves are the one expensive thing a signed-in user can ask for; without these
// one account (or one office) could fill the queue and starve everyone else.
// Counted in the database, so the limits hold across every API process.
import { and, count, eq, gt, inArray } from 'drizzle-orm';
import type { Database } from '../db/client';
import type { Config } from '../config';
import { plans, runs } from '../db/schema';
import { HttpError } from '../errors';
import type { Actor } from './audit';

export type RunQuotaConfig = Pick<Config, 'RUN_STARTS_PER_MINUTE' | 'RUNS_IN_FLIGHT_PER_ORGANIZATION'>;

/** Throws a 429 with the reason when starting `wanted` more runs would pass a limit. */
export async function assertRunQuota(db: Database, actor: Actor, wanted: number, config: RunQuotaConfig): Promise<void> {
  if (actor.userId) {
    const [recent] = await db
      .select({ n: count() })
      .from(runs)
      .where(and(eq(runs.createdBy, actor.userId), gt(runs.createdAt, new Date(Date.now() - 60_000))));
    if (recent!.n + wanted > config.RUN_STARTS_PER_MINUTE) {
      throw new HttpError(
        429,
        'rate_limited',
        `You have started ${recent!.n} ${recent!.n === 1 ? 'analysis' : 'analyses'} in the last minute; at most ${config.RUN_STARTS_PER_MINUTE} a minute are allowed${wanted > 1 ? ` and this sweep adds ${wanted}` : ''}. Wait a minute and try again.`,
      );
    }
  }
  const [inFlight] = await db
    .select({ n: count() })
    .from(runs)
    .innerJoin(plans, eq(plans.id, runs.planId))
    .where(and(eq(plans.organizationId, actor.organizationId), inArray(runs.status, ['queued', 'running'])));
  if (inFlight!.n + wanted > config.RUNS_IN_FLIGHT_PER_ORGANIZATION) {
    throw new HttpError(
      429,
      'rate_limited',
      `Your organization has ${inFlight!.n} ${inFlight!.n === 1 ? 'analysis' : 'analyses'} waiting or running; at most ${config.RUNS_IN_FLIGHT_PER_ORGANIZATION} are allowed at once${wanted > 1 ? ` and this sweep adds ${wanted}` : ''}. Wait for some to finish, or cancel some.`,
    );
  }
}

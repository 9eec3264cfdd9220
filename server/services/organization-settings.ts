// An organisation's unit system and time zone. Everyone signed in reads them (every screen
// formats with them); its administrators change them. The time zone falls back to the
// deployment's BRIEFING_TIME_ZONE while the organisation has chosen none.
import { eq } from 'drizzle-orm';
import type { Database } from '../db/client';
import { organizations } from '../db/schema';
import type { OrganizationSettings, OrganizationSettingsInput } from '../../shared/api/settings';
import type { UnitSystem } from '../../shared/api/units';
import { NotFoundError } from '../errors';
import { recordAudit, type Actor } from './audit';

type Reader = Pick<Database, 'select'>;

export type OrganizationPreferences = { unitSystem: UnitSystem; timeZone: string };

/** The units and the zone in force for one organisation (for a briefing, a mail, an export). */
export async function organizationPreferences(db: Reader, organizationId: string, defaultTimeZone: string): Promise<OrganizationPreferences> {
  const [row] = await db
    .select({ unitSystem: organizations.unitSystem, timeZone: organizations.timeZone })
    .from(organizations)
    .where(eq(organizations.id, organizationId));
  if (!row) throw new NotFoundError('Organization not found.');
  return { unitSystem: row.unitSystem, timeZone: row.timeZone ?? defaultTimeZone };
}

export async function getOrganizationSettings(db: Database, organizationId: string, defaultTimeZone: string): Promise<OrganizationSettings> {
  const [row] = await db
    .select({ unitSystem: organizations.unitSystem, timeZone: organizations.timeZone })
    .from(organizations)
    .where(eq(organizations.id, organizationId));
  if (!row) throw new NotFoundError('Organization not found.');
  return { unitSystem: row.unitSystem, timeZone: row.timeZone, defaultTimeZone, effectiveTimeZone: row.timeZone ?? defaultTimeZone };
}

export async function putOrganizationSettings(db: Database, actor: Actor, input: OrganizationSettingsInput, defaultTimeZone: string): Promise<OrganizationSettings> {
  await db.transaction(async (tx) => {
    await tx
      .update(organizations)
      .set({ unitSystem: input.unitSystem, timeZone: input.timeZone, updatedAt: new Date() })
      .where(eq(organizations.id, actor.organizationId));
    await recordAudit(tx, actor, 'settings.organization', 'settings', 'organization', input);
  });
  return getOrganizationSettings(db, actor.organizationId, defaultTimeZone);
}

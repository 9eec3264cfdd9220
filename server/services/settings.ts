// Map settings, per organization: the database value when its administrator set one, else the
// TILE_URL variable. The Content-Security-Policy is written before the session is read, so it
// allows the tile origins of every organization; that set is cached briefly and refreshed
// in the background, since the policy is on every response.
import { and, eq } from 'drizzle-orm';
import type { Database } from '../db/client';
import { appSettings } from '../db/schema';
import { mapSettingsSchema, type MapSettings } from '../../shared/api/settings';
import { recordAudit, type Actor } from './audit';
import { cspImageOrigin as originOf } from './tile-origin';

const cacheMs = 10_000;

export function createSettings(db: Database, environmentTileUrl: string, log: (err: unknown) => void = () => undefined) {
  const fallback: MapSettings = { tileUrl: environmentTileUrl, attribution: '' };
  let origins: { at: number; value: string[] } = { at: 0, value: [originOf(environmentTileUrl)].filter((o): o is string => o !== null) };
  let refreshing = false;

  async function getMapSettings(organizationId: string): Promise<MapSettings> {
    const [row] = await db
      .select()
      .from(appSettings)
      .where(and(eq(appSettings.organizationId, organizationId), eq(appSettings.key, 'map')));
    const parsed = row ? mapSettingsSchema.safeParse(row.value) : null;
    return parsed?.success ? parsed.data : fallback;
  }

  async function putMapSettings(actor: Actor, value: MapSettings): Promise<MapSettings> {
    await db.transaction(async (tx) => {
      await tx
        .insert(appSettings)
        .values({ organizationId: actor.organizationId, key: 'map', value })
        .onConflictDoUpdate({ target: [appSettings.organizationId, appSettings.key], set: { value, updatedAt: new Date() } });
      await recordAudit(tx, actor, 'settings.map', 'settings', 'map', value);
    });
    await refreshOrigins();
    return value;
  }

  async function refreshOrigins(): Promise<void> {
    const rows = await db.select({ value: appSettings.value }).from(appSettings).where(eq(appSettings.key, 'map'));
    const urls = [environmentTileUrl, ...rows.map((r) => mapSettingsSchema.safeParse(r.value)).flatMap((p) => (p.success ? [p.data.tileUrl] : []))];
    origins = { at: Date.now(), value: [...new Set(urls.map(originOf).filter((o): o is string => o !== null))].sort() };
  }

  /** The origins the CSP must allow images from (possibly none); never waits for the database. */
  function tileOrigins(): string[] {
    if (Date.now() - origins.at > cacheMs && !refreshing) {
      refreshing = true;
      refreshOrigins()
        .catch(log)
        .finally(() => (refreshing = false));
    }
    return origins.value;
  }

  return { getMapSettings, putMapSettings, refreshOrigins, tileOrigins };
}
export type Settings = ReturnType<typeof createSettings>;

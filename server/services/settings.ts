// Map settings: the database value when an administrator set one, else the TILE_URL variable.
// Cached briefly because the Content-Security-Policy reads it on every response.
import { eq } from 'drizzle-orm';
import type { Database } from '../db/client';
import { appSettings } from '../db/schema';
import { mapSettingsSchema, type MapSettings } from '../../shared/api/settings';
import { recordAudit, type Actor } from './audit';

const cacheMs = 10_000;

export function createSettings(db: Database, environmentTileUrl: string) {
  let cached: { at: number; value: MapSettings } | null = null;

  async function getMapSettings(): Promise<MapSettings> {
    if (cached && Date.now() - cached.at < cacheMs) return cached.value;
    const [row] = await db.select().from(appSettings).where(eq(appSettings.key, 'map'));
    const parsed = row ? mapSettingsSchema.safeParse(row.value) : null;
    const value = parsed?.success ? parsed.data : { tileUrl: environmentTileUrl, attribution: '' };
    cached = { at: Date.now(), value };
    return value;
  }

  async function putMapSettings(actor: Actor, value: MapSettings): Promise<MapSettings> {
    await db.transaction(async (tx) => {
      await tx
        .insert(appSettings)
        .values({ key: 'map', value })
        .onConflictDoUpdate({ target: appSettings.key, set: { value, updatedAt: new Date() } });
      await recordAudit(tx, actor, 'settings.map', 'settings', 'map', value);
    });
    cached = { at: Date.now(), value };
    return value;
  }

  /** The origin the CSP must allow images from, or none. */
  function tileOrigin(): string | null {
    const url = cached?.value.tileUrl ?? environmentTileUrl;
    if (!url) return null;
    try {
      return new URL(url.replaceAll(/\{[a-z]\}/g, 'a')).origin;
    } catch {
      return null;
    }
  }

  return { getMapSettings, putMapSettings, tileOrigin };
}
export type Settings = ReturnType<typeof createSettings>;

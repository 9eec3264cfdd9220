// A small map whose entries live for a fixed time, oldest dropped first. Used for what every
// signed-in request reads and rarely changes (its session, its user), so a burst of requests
// from one person reads the database once; `forget` drops an entry this process has changed.
export function createRecentCache<V>(ttlMs: number, maxEntries = 10_000) {
  const entries = new Map<string, { at: number; value: V }>();

  function get(key: string): V | undefined {
    const hit = entries.get(key);
    if (!hit) return undefined;
    if (Date.now() - hit.at >= ttlMs) {
      entries.delete(key);
      return undefined;
    }
    return hit.value;
  }

  function set(key: string, value: V): void {
    if (ttlMs <= 0) return;
    const now = Date.now();
    entries.delete(key);
    entries.set(key, { at: now, value });
    // Insertion order is age order: drop the stale and the overflow from the front.
    for (const [oldKey, old] of entries) {
      if (now - old.at < ttlMs && entries.size <= maxEntries) break;
      entries.delete(oldKey);
    }
  }

  return { get, set, forget: (key: string) => void entries.delete(key), clear: () => entries.clear() };
}

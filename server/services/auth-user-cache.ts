// The signed-in user (with memberships and roles) as each request sees it, kept for
// AUTH_CACHE_MILLISECONDS. A change this process makes (a role, a removed member) is forgotten
// at once; a change made by another API process shows within that time.
import { createRecentCache } from './recent-cache';

// One per process, so the member services can forget a user they changed.
let cache = createRecentCache<Express.User | null>(0);

export function configureAuthUserCache(ttlMs: number): void {
  cache = createRecentCache<Express.User | null>(ttlMs);
}

export async function cachedAuthUser(userId: string, load: (userId: string) => Promise<Express.User | null>): Promise<Express.User | null> {
  const hit = cache.get(userId);
  if (hit !== undefined) return hit;
  const user = await load(userId);
  cache.set(userId, user);
  return user;
}

export function forgetAuthUser(userId: string): void {
  cache.forget(userId);
}

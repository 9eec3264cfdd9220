// The time-limited map behind the session and user caches.
import { afterEach, describe, expect, it, vi } from 'vitest';
import { createRecentCache } from '../../server/services/recent-cache';

afterEach(() => vi.useRealTimers());

describe('createRecentCache', () => {
  it('keeps an entry for its time, then forgets it', () => {
    vi.useFakeTimers();
    const cache = createRecentCache<string>(1000);
    cache.set('a', 'one');
    vi.advanceTimersByTime(999);
    expect(cache.get('a')).toBe('one');
    vi.advanceTimersByTime(1);
    expect(cache.get('a')).toBeUndefined();
  });

  it('forgets on request, and keeps nothing with a time of zero', () => {
    const cache = createRecentCache<string>(1000);
    cache.set('a', 'one');
    cache.forget('a');
    expect(cache.get('a')).toBeUndefined();
    const off = createRecentCache<string>(0);
    off.set('a', 'one');
    expect(off.get('a')).toBeUndefined();
  });

  it('drops the oldest entries beyond its size', () => {
    const cache = createRecentCache<number>(60_000, 3);
    for (let i = 0; i < 5; i++) cache.set(`k${i}`, i);
    expect(['k0', 'k1', 'k2', 'k3', 'k4'].map((k) => cache.get(k))).toEqual([undefined, undefined, 2, 3, 4]);
  });
});

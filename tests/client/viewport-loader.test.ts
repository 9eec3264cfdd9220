// Loading by viewport: a pan waits for the map to settle, a newer view aborts the older
// request, a late answer for an old view is dropped, a covered view is not fetched again.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { createViewportLoader } from '../../src/map/viewport-loader';
import type { Bbox } from '../../src/map/viewport';

type Call = { bbox: Bbox; zoom: number; signal: AbortSignal; resolve: (v: { truncated: boolean; id: number }) => void; reject: (e: unknown) => void };

function setup(delayMs = 200, honourAbort = true, extent: Bbox | null = null) {
  const calls: Call[] = [];
  const loaded: number[] = [];
  const errors: unknown[] = [];
  const busy: boolean[] = [];
  const loader = createViewportLoader<{ truncated: boolean; id: number }>({
    fetch: (bbox, zoom, signal) =>
      new Promise((resolve, reject) => {
        calls.push({ bbox, zoom, signal, resolve, reject });
        if (honourAbort) signal.addEventListener('abort', () => reject(new DOMException('aborted', 'AbortError')));
      }),
    onLoaded: (r) => loaded.push(r.id),
    onError: (e) => errors.push(e),
    onBusy: (b) => busy.push(b),
    isComplete: (r) => !r.truncated,
    extent: () => extent,
    delayMs,
  });
  return { loader, calls, loaded, errors, busy };
}

const view = (west: number) => ({ west, south: 50, east: west + 0.1, north: 50.1 });

beforeEach(() => vi.useFakeTimers());
afterEach(() => vi.useRealTimers());

describe('viewport loader', () => {
  it('waits until the map has settled: many moves, one request', () => {
    const { loader, calls } = setup();
    for (let i = 0; i < 10; i++) {
      loader.request(view(10 + i * 0.01), 14);
      vi.advanceTimersByTime(50);
    }
    expect(calls).toHaveLength(0);
    vi.advanceTimersByTime(200);
    expect(calls).toHaveLength(1);
    expect(calls[0]!.zoom).toBe(14);
  });

  it('aborts the older request when a newer view is asked, and keeps only the newer answer', async () => {
    const { loader, calls, loaded } = setup();
    loader.request(view(10), 14);
    vi.advanceTimersByTime(200);
    loader.request(view(20), 14);
    vi.advanceTimersByTime(200);
    expect(calls).toHaveLength(2);
    expect(calls[0]!.signal.aborted).toBe(true);
    calls[1]!.resolve({ truncated: false, id: 2 });
    await vi.runAllTimersAsync();
    expect(loaded).toEqual([2]);
  });

  it('drops an answer that arrives after a newer request started', async () => {
    const { loader, calls, loaded } = setup(200, false);
    loader.request(view(10), 14);
    vi.advanceTimersByTime(200);
    // The first fetch ignores its abort signal and answers late anyway.
    const late = calls[0]!;
    loader.request(view(20), 15);
    vi.advanceTimersByTime(200);
    late.resolve({ truncated: false, id: 1 });
    await vi.runAllTimersAsync();
    expect(loaded).toEqual([]);
    calls[1]!.resolve({ truncated: false, id: 2 });
    await vi.runAllTimersAsync();
    expect(loaded).toEqual([2]);
  });

  it('does not fetch a view inside the last padded load at the same zoom', async () => {
    const { loader, calls } = setup();
    loader.request(view(10), 14);
    vi.advanceTimersByTime(200);
    calls[0]!.resolve({ truncated: false, id: 1 });
    await vi.runAllTimersAsync();
    loader.request(view(10.01), 14);
    vi.advanceTimersByTime(500);
    expect(calls).toHaveLength(1);
    loader.request(view(10.01), 15);
    vi.advanceTimersByTime(200);
    expect(calls).toHaveLength(2);
  });

  it('fetches nothing more at that zoom once a complete load held the whole extent', async () => {
    const { loader, calls } = setup(200, true, [10.02, 50.02, 10.08, 50.08]);
    loader.request(view(10), 14);
    vi.advanceTimersByTime(200);
    calls[0]!.resolve({ truncated: false, id: 1 });
    await vi.runAllTimersAsync();
    loader.request(view(12), 14);
    vi.advanceTimersByTime(500);
    expect(calls).toHaveLength(1);
  });

  it('asks again for a covered view when the last answer was cut short', async () => {
    const { loader, calls } = setup();
    loader.request(view(10), 12);
    vi.advanceTimersByTime(200);
    calls[0]!.resolve({ truncated: true, id: 1 });
    await vi.runAllTimersAsync();
    loader.request(view(10.01), 12);
    vi.advanceTimersByTime(200);
    expect(calls).toHaveLength(2);
  });

  it('reloads at once after an edit, even a covered view', async () => {
    const { loader, calls } = setup();
    loader.request(view(10), 14);
    vi.advanceTimersByTime(200);
    calls[0]!.resolve({ truncated: false, id: 1 });
    await vi.runAllTimersAsync();
    loader.reload();
    expect(calls).toHaveLength(2);
  });

  it('reports errors but not aborts, and says when it is busy', async () => {
    const { loader, calls, errors, busy } = setup();
    loader.request(view(10), 14);
    vi.advanceTimersByTime(200);
    loader.request(view(30), 14);
    vi.advanceTimersByTime(200);
    calls[1]!.reject(new Error('server down'));
    await vi.runAllTimersAsync();
    expect(errors).toHaveLength(1);
    expect(busy.at(-1)).toBe(false);
  });

  it('stops everything on dispose', () => {
    const { loader, calls } = setup();
    loader.request(view(10), 14);
    vi.advanceTimersByTime(200);
    loader.dispose();
    expect(calls[0]!.signal.aborted).toBe(true);
    loader.request(view(20), 14);
    vi.advanceTimersByTime(500);
    expect(calls).toHaveLength(1);
  });
});

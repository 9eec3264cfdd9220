// Polling for runs: one look per interval while there is more to wait for, a failed look retried,
// and nothing more after stop.
import { afterEach, beforeEach, expect, it, vi } from 'vitest';
import { usePolling } from '../../src/composables/use-polling';

beforeEach(() => vi.useFakeTimers());
afterEach(() => vi.useRealTimers());

it('looks again each interval until the tick says it is done', async () => {
  let calls = 0;
  const poll = usePolling(async () => ++calls < 3, 500);
  poll.start();
  expect(calls).toBe(0);
  await vi.advanceTimersByTimeAsync(500);
  expect(calls).toBe(1);
  await vi.advanceTimersByTimeAsync(1000);
  expect(calls).toBe(3);
  expect(poll.polling.value).toBe(false);
  await vi.advanceTimersByTimeAsync(5000);
  expect(calls).toBe(3);
});

it('keeps going through a failed look, and stops when told', async () => {
  let calls = 0;
  const poll = usePolling(async () => {
    calls++;
    if (calls === 1) throw new Error('dropped');
    return true;
  }, 100);
  poll.start();
  await vi.advanceTimersByTimeAsync(100);
  expect(poll.lastError.value).toBeInstanceOf(Error);
  await vi.advanceTimersByTimeAsync(100);
  expect(calls).toBe(2);
  expect(poll.lastError.value).toBeNull();
  poll.stop();
  await vi.advanceTimersByTimeAsync(1000);
  expect(calls).toBe(2);
});

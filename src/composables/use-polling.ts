// Asks again every `intervalMs` while `tick` says there is more to wait for (runs queued or
// working); one tick at a time, a dropped answer retried on the next, stopped on unmount.
import { getCurrentInstance, onBeforeUnmount, ref } from 'vue';

export function usePolling(tick: () => Promise<boolean>, intervalMs = 1000) {
  const polling = ref(false);
  const lastError = ref<unknown>(null);
  let timer: ReturnType<typeof setTimeout> | null = null;
  let stopped = false;

  function stop() {
    stopped = true;
    polling.value = false;
    if (timer) clearTimeout(timer);
    timer = null;
  }

  async function once() {
    timer = null;
    let more = true;
    try {
      more = await tick();
      lastError.value = null;
    } catch (e) {
      lastError.value = e;
    }
    if (stopped) return;
    if (more) timer = setTimeout(() => void once(), intervalMs);
    else polling.value = false;
  }

  /** Starts (or restarts) polling; the first look comes after one interval. */
  function start() {
    if (timer) clearTimeout(timer);
    stopped = false;
    polling.value = true;
    timer = setTimeout(() => void once(), intervalMs);
  }

  if (getCurrentInstance()) onBeforeUnmount(stop);
  return { polling, lastError, start, stop };
}

// Loads what a map view needs, at most one request in flight: a view change waits `delayMs`
// for the map to settle (moveend fires repeatedly while a user pans), a newer view aborts the
// older request, and an answer arrives only if it is still the latest one asked for. A view
// inside the last padded load at the same zoom is not fetched again (nor any view, once a load
// held the data's whole extent), unless the last answer was cut short (truncated) or
// `reload()` is called after an edit.
import { bboxContains, paddedBbox, type Bbox, type BoundsLike } from './viewport';

export type ViewRequest = { view: BoundsLike; zoom: number };

export type ViewportLoaderOptions<T> = {
  fetch: (bbox: Bbox, zoom: number, signal: AbortSignal) => Promise<T>;
  onLoaded: (result: T, request: { bbox: Bbox; zoom: number }) => void;
  onError?: (error: unknown) => void;
  onBusy?: (busy: boolean) => void;
  /** Whether an answer left features out; then the same view is asked again on the next move. */
  isComplete?: (result: T) => boolean;
  delayMs?: number;
  padShare?: number;
  /** Where the data lies, if known: a complete load that holds all of it covers every view. */
  extent?: () => Bbox | null;
};

export type ViewportLoader = {
  /** A view changed: load it after the debounce, unless it is already covered. */
  request: (view: BoundsLike, zoom: number) => void;
  /** Forget what was loaded and load this view (or the last requested one) now, after an edit. */
  reload: (view?: BoundsLike, zoom?: number) => void;
  dispose: () => void;
};

const isAbort = (e: unknown) => e instanceof DOMException && e.name === 'AbortError';

export function createViewportLoader<T>(options: ViewportLoaderOptions<T>): ViewportLoader {
  const delayMs = options.delayMs ?? 200;
  let timer: ReturnType<typeof setTimeout> | null = null;
  let inFlight: AbortController | null = null;
  let latest: ViewRequest | null = null;
  let loaded: { bbox: Bbox; zoom: number; complete: boolean } | null = null;
  let sequence = 0;
  let disposed = false;

  function covered(req: ViewRequest): boolean {
    if (loaded === null || !loaded.complete || loaded.zoom !== req.zoom) return false;
    if (bboxContains(loaded.bbox, req.view)) return true;
    const extent = options.extent?.();
    return extent !== null && extent !== undefined && bboxContains(loaded.bbox, { west: extent[0], south: extent[1], east: extent[2], north: extent[3] });
  }

  async function load(req: ViewRequest) {
    inFlight?.abort();
    const controller = new AbortController();
    inFlight = controller;
    const mine = ++sequence;
    const bbox = paddedBbox(req.view, options.padShare);
    options.onBusy?.(true);
    try {
      const result = await options.fetch(bbox, req.zoom, controller.signal);
      if (mine !== sequence || disposed) return;
      loaded = { bbox, zoom: req.zoom, complete: options.isComplete ? options.isComplete(result) : true };
      options.onLoaded(result, { bbox, zoom: req.zoom });
    } catch (e) {
      if (isAbort(e) || controller.signal.aborted || mine !== sequence || disposed) return;
      options.onError?.(e);
    } finally {
      if (mine === sequence && !disposed) {
        inFlight = null;
        options.onBusy?.(false);
      }
    }
  }

  return {
    request(view, zoom) {
      if (disposed) return;
      latest = { view, zoom };
      if (timer) clearTimeout(timer);
      if (covered(latest)) {
        // A newer covered view makes any older request for elsewhere pointless.
        if (inFlight) {
          inFlight.abort();
          inFlight = null;
          sequence++;
          options.onBusy?.(false);
        }
        return;
      }
      timer = setTimeout(() => {
        timer = null;
        if (latest) void load(latest);
      }, delayMs);
    },
    reload(view, zoom) {
      if (disposed) return;
      if (view && zoom !== undefined) latest = { view, zoom };
      loaded = null;
      if (timer) clearTimeout(timer);
      timer = null;
      if (latest) void load(latest);
    },
    dispose() {
      disposed = true;
      if (timer) clearTimeout(timer);
      inFlight?.abort();
    },
  };
}

// The one Leaflet the workspace uses: the ES module build that vue-leaflet's LMap is made of,
// so that our layers, the map and the drawing plugin share the same classes. Import L from
// here, never from 'leaflet' (that is the UMD build, a second copy with its own classes).
import * as L from 'leaflet/dist/leaflet-src.esm';
import type {} from '@geoman-io/leaflet-geoman-free';
import 'leaflet/dist/leaflet.css';
import '@/styles/map.css';

export { L };

let geoman: Promise<void> | null = null;
let vectorTiles: Promise<typeof import('protomaps-leaflet')> | null = null;

/** The global `L` that plugins written for Leaflet's script build extend or read: a mutable copy
 *  of this module's exports, so the classes are the very ones LMap uses. */
function exposeGlobalLeaflet() {
  const global = window as unknown as { L?: Record<string, unknown> };
  global.L ??= { ...L };
}

/** Loads the vector-tile layer (protomaps-leaflet). It subclasses the global `L.GridLayer` when
 *  a layer is made, so the global must exist by then. */
export function loadVectorTiles(): Promise<typeof import('protomaps-leaflet')> {
  exposeGlobalLeaflet();
  vectorTiles ??= import('protomaps-leaflet');
  return vectorTiles;
}

/**
 * Loads leaflet-geoman (drawing). It extends the global `L`, so it gets a mutable copy of this
 * module's exports: the same classes, so its init hook reaches maps made by LMap. Call it
 * before the map is created.
 */
export function loadGeoman(): Promise<void> {
  geoman ??= (async () => {
    const global = window as unknown as { L?: Record<string, unknown> };
    global.L = { ...L };
    await import('@geoman-io/leaflet-geoman-free');
    await import('@geoman-io/leaflet-geoman-free/dist/leaflet-geoman.css');
  })();
  return geoman;
}

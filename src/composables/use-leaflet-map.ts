// The workspace map's Leaflet object and its fixed furniture: panes in drawing order (zones under
// roads, results over them, choke points on top), one canvas renderer for the many road lines,
// SVG for the few things that need DOM events. The map lives in a shallowRef and is marked raw:
// Vue proxies break Leaflet's identity checks.
import { markRaw, onBeforeUnmount, ref, shallowRef, watch } from 'vue';
import { L } from '@/map/leaflet';
import type { Bbox } from '@/map/viewport';

export const panes = {
  zones: { name: 'cutline-zones', zIndex: 405 },
  roads: { name: 'cutline-roads', zIndex: 410 },
  attachments: { name: 'cutline-attachments', zIndex: 415 },
  chokePoints: { name: 'cutline-choke-points', zIndex: 430 },
  selection: { name: 'cutline-selection', zIndex: 440 },
} as const;

export type WorkspaceMap = {
  map: L.Map;
  /** Draws the road layer: canvas, with a generous click tolerance for thin lines. */
  roadRenderer: L.Canvas;
  zoneRenderer: L.SVG;
  chokeRenderer: L.SVG;
  selectionRenderer: L.SVG;
};

export function useLeafletMap() {
  const handle = shallowRef<WorkspaceMap | null>(null);
  const zoom = ref(0);
  // The last extent fitted and the view it gave: a resize refits it unless the planner moved on.
  let lastFit: { bbox: Bbox; maxZoom: number; view: { zoom: number; lat: number; lng: number } | null } | null = null;

  function attach(map: L.Map) {
    markRaw(map);
    for (const pane of Object.values(panes)) {
      const element = map.getPane(pane.name) ?? map.createPane(pane.name);
      element.style.zIndex = String(pane.zIndex);
    }
    handle.value = markRaw({
      map,
      roadRenderer: markRaw(L.canvas({ pane: panes.roads.name, padding: 0.3, tolerance: 6 })),
      zoneRenderer: markRaw(L.svg({ pane: panes.zones.name })),
      chokeRenderer: markRaw(L.svg({ pane: panes.chokePoints.name })),
      selectionRenderer: markRaw(L.svg({ pane: panes.selection.name })),
    });
    zoom.value = map.getZoom();
    map.on('zoomend', () => {
      zoom.value = map.getZoom();
    });
    map.on('moveend', () => {
      if (lastFit && lastFit.view === null) {
        const c = map.getCenter();
        lastFit.view = { zoom: map.getZoom(), lat: c.lat, lng: c.lng };
      }
    });
    map.on('resize', () => {
      const fit = lastFit;
      if (!fit?.view) return;
      // Keeping the centre through a resize moves it by a pixel or so: compare in pixels.
      const moved = map.latLngToContainerPoint(map.getCenter()).distanceTo(map.latLngToContainerPoint([fit.view.lat, fit.view.lng]));
      if (map.getZoom() === fit.view.zoom && moved < 4) fitBbox(fit.bbox, fit.maxZoom);
    });
  }

  function fitBbox(bbox: Bbox, maxZoom = 17) {
    const map = handle.value?.map;
    if (!map) return;
    const [w, s, e, n] = bbox;
    lastFit = { bbox, maxZoom, view: null };
    map.fitBounds(
      [
        [s, w],
        [n, e],
      ],
      { padding: [32, 32], maxZoom },
    );
  }

  /** Fits the extent once the map exists, and again whenever the extent changes. */
  function fitWhenReady(extent: () => Bbox | null | undefined) {
    watch(
      [handle, extent],
      ([h, bbox]) => {
        if (h && bbox) fitBbox(bbox);
      },
      { immediate: true },
    );
  }

  onBeforeUnmount(() => {
    // LMap removes the map itself; dropping the handle stops our watchers from touching it.
    handle.value = null;
  });

  return { handle, zoom, attach, fitBbox, fitWhenReady };
}

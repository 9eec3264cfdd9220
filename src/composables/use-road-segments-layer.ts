// The road layer on the map, loaded by viewport: on every settled move the visible extent (plus a
// margin) is asked from the server, simplified for the zoom, older requests aborted. Lines are
// kept by segment id, so a pan only adds and removes what changed. Before a run roads are styled
// by class and lanes, after it by utilisation. Geometry seen so far is remembered for the
// choke points and for zooming to a road from a table.
import { onBeforeUnmount, ref, watch, type Ref, type ShallowRef } from 'vue';
import type { SegmentMap, SegmentMapProperties } from '@shared/api/road-layers';
import { getSegmentMap } from '@/api/road-layers';
import { L } from '@/map/leaflet';
import { roadStyle, roadWeight, type LineStyle } from '@/map/road-style';
import { utilisationStyle } from '@/map/utilisation-scale';
import { createViewportLoader } from '@/map/viewport-loader';
import type { SegmentLoad } from '@/format/run-result';
import { messageOf } from '@/format/error-message';
import type { WorkspaceMap } from './use-leaflet-map';

type Coordinates = [number, number][];

export type RoadSegmentsLayerOptions = {
  planId: Ref<string>;
  /** False while the plan has no road layer. */
  enabled: Ref<boolean>;
  /** Moves on every edit or upload: reload what is shown. */
  version: Ref<number>;
  /** Utilisation per segment from the shown result, or null before any run. */
  loads: Ref<Map<number, SegmentLoad> | null>;
  selectedId: Ref<number | null>;
  /** The road layer's extent, [w, s, e, n], when known: once all of it is loaded, pans at the
   *  same zoom need no request. */
  extent?: Ref<[number, number, number, number] | null>;
  onSelect: (segmentId: number) => void;
};

function sameLook(a: SegmentMapProperties, b: SegmentMapProperties): boolean {
  return a.roadClass === b.roadClass && a.lanesForward === b.lanesForward && a.lanesBackward === b.lanesBackward && a.closed === b.closed;
}

const selectedStyle: LineStyle = { color: '#e8743b', weight: 7, opacity: 1, lineCap: 'round' };

export function useRoadSegmentsLayer(handle: ShallowRef<WorkspaceMap | null>, options: RoadSegmentsLayerOptions) {
  const busy = ref(false);
  const truncated = ref(false);
  const shown = ref(0);
  const error = ref('');
  /** Moves when new geometry was remembered (watchers redraw what depends on it). */
  const geometryVersion = ref(0);

  const geometry = new Map<number, Coordinates>();
  const properties = new Map<number, SegmentMapProperties>();
  const lines = new Map<number, L.Polyline>();
  let group: L.LayerGroup | null = null;
  let loadedZoom = -1;
  let currentZoom = 0;

  function styleOf(p: SegmentMapProperties): LineStyle {
    if (options.selectedId.value === p.id) return selectedStyle;
    const loads = options.loads.value;
    if (loads) {
      const load = loads.get(p.id);
      if (p.closed) return roadStyle(p, currentZoom);
      return utilisationStyle(load?.utilisation ?? 0, roadWeight(p, currentZoom));
    }
    return roadStyle(p, currentZoom);
  }

  function restyleAll() {
    for (const [id, line] of lines) {
      const p = properties.get(id);
      if (p) line.setStyle(styleOf(p));
    }
    const selected = options.selectedId.value;
    if (selected !== null) lines.get(selected)?.bringToFront();
  }

  function show(result: SegmentMap, zoom: number) {
    const h = handle.value;
    if (!h) return;
    if (!group) group = L.layerGroup().addTo(h.map);
    // Another zoom means other simplification, but most lines keep their vertices: only a line
    // whose vertex count changed gets new ones, so zooming does not rebuild the whole layer.
    const rezoomed = zoom !== loadedZoom;
    loadedZoom = zoom;
    const keep = new Set<number>();
    let added = false;
    for (const feature of result.features) {
      const p = feature.properties;
      keep.add(p.id);
      const coordinates = feature.geometry.coordinates as Coordinates;
      const known = geometry.get(p.id);
      if (!known) added = true;
      geometry.set(p.id, coordinates);
      const before = properties.get(p.id);
      properties.set(p.id, p);
      const existing = lines.get(p.id);
      if (existing && rezoomed && known?.length !== coordinates.length) {
        existing.setLatLngs(coordinates.map(([lon, lat]) => [lat, lon] as [number, number]));
      }
      if (existing) {
        // An edit came back: restyle only the lines whose attributes changed.
        if (before && !sameLook(before, p)) existing.setStyle(styleOf(p));
        continue;
      }
      const line = L.polyline(
        coordinates.map(([lon, lat]) => [lat, lon] as [number, number]),
        { ...styleOf(p), renderer: h.roadRenderer, pane: h.roadRenderer.options.pane, interactive: true, smoothFactor: 1 },
      );
      line.on('click', () => options.onSelect(p.id));
      lines.set(p.id, line);
      group.addLayer(line);
    }
    for (const [id, line] of lines) {
      if (keep.has(id)) continue;
      group.removeLayer(line);
      lines.delete(id);
    }
    truncated.value = result.truncated;
    shown.value = lines.size;
    if (added) geometryVersion.value++;
  }

  const loader = createViewportLoader<SegmentMap>({
    fetch: (bbox, zoom, signal) => getSegmentMap(options.planId.value, bbox, zoom, signal),
    onLoaded: (result, request) => {
      error.value = '';
      show(result, request.zoom);
    },
    onError: (e) => {
      error.value = messageOf(e);
    },
    onBusy: (b) => {
      busy.value = b;
    },
    isComplete: (result) => !result.truncated,
    extent: () => options.extent?.value ?? null,
    delayMs: 180,
  });

  function currentView() {
    const map = handle.value?.map;
    if (!map) return null;
    const b = map.getBounds();
    return { view: { west: b.getWest(), south: b.getSouth(), east: b.getEast(), north: b.getNorth() }, zoom: Math.round(map.getZoom()) };
  }

  function requestView() {
    const current = currentView();
    if (current && options.enabled.value) loader.request(current.view, current.zoom);
  }

  function clear() {
    group?.clearLayers();
    lines.clear();
    loadedZoom = -1;
    shown.value = 0;
    truncated.value = false;
  }

  watch(
    handle,
    (h, _old, onCleanup) => {
      if (!h) return;
      currentZoom = h.map.getZoom();
      const onMoveEnd = () => requestView();
      const onZoomEnd = () => {
        currentZoom = h.map.getZoom();
        restyleAll();
      };
      h.map.on('moveend', onMoveEnd);
      h.map.on('zoomend', onZoomEnd);
      requestView();
      onCleanup(() => {
        h.map.off('moveend', onMoveEnd);
        h.map.off('zoomend', onZoomEnd);
      });
    },
    { immediate: true },
  );

  watch([options.version, options.enabled, options.planId], () => {
    if (!options.enabled.value) {
      clear();
      return;
    }
    // Edited attributes change styles: ask again for the same view (lines stay until then).
    const current = currentView();
    if (current) loader.reload(current.view, current.zoom);
  });

  watch([options.loads, options.selectedId], () => restyleAll());

  onBeforeUnmount(() => loader.dispose());

  return {
    busy,
    truncated,
    shown,
    error,
    geometryVersion,
    geometryOf: (segmentId: number) => geometry.get(segmentId),
    /** Adds geometry learnt elsewhere (a run's export) for roads not loaded yet. */
    remember: (more: Map<number, Coordinates>) => {
      let added = false;
      for (const [id, coordinates] of more) {
        if (geometry.has(id)) continue;
        geometry.set(id, coordinates);
        added = true;
      }
      if (added) geometryVersion.value++;
    },
    propertiesOf: (segmentId: number) => properties.get(segmentId),
  };
}

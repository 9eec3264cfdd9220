// The road layer on the map as vector tiles (server/routes/map-tiles.ts), drawn on canvas by
// protomaps-leaflet: the map asks only for the tiles on screen, keeps a bounded cache of them and
// never holds a list of every road, so a county draws as fast as a town. Before a run roads are
// styled by class and lanes, with a run's tiles by utilisation (src/map/road-tile-style.ts). A
// click picks the road under the pointer from the tile's own features. Geometry of single roads
// (the selected one, choke points, a scenario's changes) is asked for by id and remembered.
import { onBeforeUnmount, ref, watch, type Ref, type ShallowRef } from 'vue';
import type { LeafletLayerOptions, PaintRule } from 'protomaps-leaflet';
import { roadTileLayer } from '@shared/api/map-tiles';
import { getSegmentGeometry, roadTileUrl, runTileUrl } from '@/api/map-tiles';
import { L, loadVectorTiles } from '@/map/leaflet';
import { closedRoadColor } from '@/map/road-style';
import { roadOfTile, roadTileStyle } from '@/map/road-tile-style';
import type { RoadClass } from '@shared/api/road-attributes';
import { messageOf } from '@/format/error-message';
import { panes, type WorkspaceMap } from './use-leaflet-map';

type Coordinates = [number, number][];

/** What a click on a road knows of it, from the tile. */
export type PickedRoadProperties = { id: number; roadClass: RoadClass; name: string | null };

export type RoadSegmentsLayerOptions = {
  planId: Ref<string>;
  /** False while the plan has no road layer. */
  enabled: Ref<boolean>;
  /** Moves on every edit or upload: the tiles are asked for again. */
  version: Ref<number>;
  /** The run whose figures colour the roads, or null before any run. */
  runId?: Ref<string | null>;
  selectedId: Ref<number | null>;
  onSelect: (segmentId: number) => void;
};

const selectedStyle = { color: '#b5521f', weight: 7, opacity: 1, lineCap: 'round' as const };
/** Pixels around the pointer within which a click picks a road. */
const pickRadius = 7;
// Tiles are asked for up to this zoom (the layer draws 512-pixel tiles one zoom below the map's,
// so this covers the map's 19): enlarged tiles would scale the line widths too.
const maxDataZoom = 18;
// Clicks on these panes belong to what is drawn there (choke points, markers, popups).
const ownClickPanes = [panes.chokePoints.name, panes.selection.name, 'marker', 'popup', 'tooltip'];

/**
 * The layer draws each tile asynchronously (fetch, then paint), and its label index may ask for
 * a tile again later; a layer taken off the map meanwhile (a new run, an edit) has no map left
 * to ask. Those late calls are dropped instead of throwing.
 */
function quietOnceRemoved(layer: Record<string, unknown>) {
  const onMap = () => Boolean(layer._map);
  for (const name of ['rerenderTile', 'rerenderTiles'] as const) {
    const original = (layer[name] as (...args: unknown[]) => unknown).bind(layer);
    layer[name] = (...args: unknown[]) => (onMap() ? original(...args) : undefined);
  }
  const render = (layer.renderTile as (...args: unknown[]) => Promise<void>).bind(layer);
  layer.renderTile = async (...args: unknown[]) => {
    if (!onMap()) return;
    try {
      await render(...args);
    } catch (e) {
      if (onMap()) throw e;
    }
  };
}

export function useRoadSegmentsLayer(handle: ShallowRef<WorkspaceMap | null>, options: RoadSegmentsLayerOptions) {
  const busy = ref(false);
  /** Tiles drawn at the moment. */
  const shown = ref(0);
  const error = ref('');
  /** Moves when new geometry was remembered (watchers redraw what depends on it). */
  const geometryVersion = ref(0);

  const geometry = new Map<number, Coordinates>();
  const properties = new Map<number, PickedRoadProperties>();
  let layer: (L.GridLayer & { queryTileFeaturesDebug: (lng: number, lat: number, brush: number) => Map<string, { feature: { props: Record<string, unknown> } }[]> }) | null = null;
  let selectedLine: L.Polyline | null = null;
  let made = 0;

  function remember(more: Map<number, Coordinates>) {
    let added = false;
    for (const [id, coordinates] of more) {
      if (geometry.has(id)) continue;
      geometry.set(id, coordinates);
      added = true;
    }
    if (added) geometryVersion.value++;
  }

  /** Asks for the geometry of the roads not known yet; resolves once it is remembered. */
  async function ensureGeometry(ids: readonly number[]): Promise<void> {
    const missing = [...new Set(ids)].filter((id) => id > 0 && !geometry.has(id));
    if (missing.length === 0 || !options.enabled.value) return;
    remember(await getSegmentGeometry(options.planId.value, missing));
  }

  function paintRules(withResult: boolean): PaintRule[] {
    const look = (z: number, f?: { props: Record<string, unknown> }) => roadTileStyle(f?.props ?? {}, z, withResult);
    return [
      {
        dataLayer: roadTileLayer,
        filter: (_z, f) => f.props.closed !== true,
        symbolizer: new Symbolizers.LineSymbolizer({
          color: (z, f) => look(z, f).color,
          width: (z, f) => look(z, f).weight,
          opacity: (z, f) => look(z, f).opacity,
          lineCap: 'round',
          lineJoin: 'round',
        }),
      },
      {
        dataLayer: roadTileLayer,
        filter: (_z, f) => f.props.closed === true,
        symbolizer: new Symbolizers.LineSymbolizer({
          dash: [4, 4],
          dashColor: closedRoadColor,
          dashWidth: (z, f) => look(z, f).weight,
          opacity: 0.9,
        }),
      },
    ];
  }

  // Filled once protomaps-leaflet has loaded.
  const Symbolizers = {} as { LineSymbolizer: typeof import('protomaps-leaflet').LineSymbolizer };

  async function rebuild() {
    const h = handle.value;
    const ticket = ++made;
    removeLayer();
    if (!h || !options.enabled.value) return;
    let lib: typeof import('protomaps-leaflet');
    try {
      lib = await loadVectorTiles();
    } catch (e) {
      error.value = messageOf(e);
      return;
    }
    if (ticket !== made || handle.value !== h) return;
    Symbolizers.LineSymbolizer = lib.LineSymbolizer;
    const runId = options.runId?.value ?? null;
    const url = runId ? runTileUrl(options.planId.value, runId, options.version.value) : roadTileUrl(options.planId.value, options.version.value);
    const layerOptions: LeafletLayerOptions = {
      url,
      maxDataZoom,
      paintRules: paintRules(runId !== null),
      labelRules: [],
      attribution: '',
      pane: panes.roads.name,
    };
    layer = lib.leafletLayer(layerOptions) as unknown as typeof layer;
    const tiles = layer!;
    quietOnceRemoved(tiles as unknown as Record<string, unknown>);
    tiles.on('loading', () => {
      busy.value = true;
    });
    tiles.on('load', () => {
      busy.value = false;
      error.value = '';
    });
    tiles.on('tileload', () => shown.value++);
    tiles.on('tileunload', () => {
      shown.value = Math.max(0, shown.value - 1);
    });
    shown.value = 0;
    tiles.addTo(h.map);
  }

  function removeLayer() {
    if (layer) {
      // remove() first: Leaflet unhooks the layer from the map's events on its 'remove' event.
      layer.remove();
      layer.off('loading load tileload tileunload');
    }
    layer = null;
    shown.value = 0;
    busy.value = false;
  }

  /** The road under a click, from the tiles drawn: the nearest one within the pick radius. */
  function roadAt(latlng: L.LatLng): PickedRoadProperties | null {
    if (!layer) return null;
    const picked = layer.queryTileFeaturesDebug(latlng.lng, latlng.lat, pickRadius);
    let found: Record<string, unknown> | null = null;
    for (const features of picked.values()) {
      // Drawn last is drawn on top: the planner sees that one.
      for (const p of features) if (typeof p.feature.props.id === 'number') found = p.feature.props;
    }
    if (!found) return null;
    return { id: found.id as number, roadClass: roadOfTile(found).roadClass, name: typeof found.name === 'string' ? found.name : null };
  }

  function drawSelected() {
    const h = handle.value;
    selectedLine?.remove();
    selectedLine = null;
    const id = options.selectedId.value;
    if (!h || id === null) return;
    const coordinates = geometry.get(id);
    if (!coordinates) {
      ensureGeometry([id]).catch(() => undefined);
      return;
    }
    selectedLine = L.polyline(
      coordinates.map(([lon, lat]) => [lat, lon] as [number, number]),
      { ...selectedStyle, renderer: h.selectionRenderer, pane: h.selectionRenderer.options.pane, interactive: false },
    ).addTo(h.map);
  }

  watch(
    handle,
    (h, _old, onCleanup) => {
      if (!h) return;
      const onClick = (e: L.LeafletMouseEvent) => {
        const target = e.originalEvent?.target as Element | null;
        if (target && ownClickPanes.some((pane) => target.closest(`.leaflet-${pane}-pane`))) return;
        const road = roadAt(e.latlng);
        if (!road) return;
        properties.set(road.id, road);
        options.onSelect(road.id);
      };
      h.map.on('click', onClick);
      rebuild();
      onCleanup(() => {
        h.map.off('click', onClick);
        removeLayer();
      });
    },
    { immediate: true },
  );

  watch([options.version, options.enabled, options.planId, () => options.runId?.value ?? null], () => {
    if (!options.enabled.value) geometry.clear();
    rebuild();
  });

  watch([options.selectedId, geometryVersion, handle], drawSelected, { immediate: true });

  onBeforeUnmount(() => {
    made++;
    removeLayer();
    selectedLine?.remove();
  });

  return {
    busy,
    shown,
    error,
    geometryVersion,
    geometryOf: (segmentId: number) => geometry.get(segmentId),
    /** Adds geometry learnt elsewhere (a run's choke points) for roads not known yet. */
    remember,
    ensureGeometry,
    /** Whether a click at this point picks a road (the tiles drawn have one within the pick radius). */
    hasRoadAt: (latlng: L.LatLng) => roadAt(latlng) !== null,
    /** What the tiles said of a road picked on the map. */
    propertiesOf: (segmentId: number) => properties.get(segmentId),
  };
}

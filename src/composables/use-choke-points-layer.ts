// The choke points of the shown result (the arcs of the minimum cut), drawn on their own SVG
// pane above the roads: a white casing and a thick violet line, so they stand out on any
// utilisation colour; the one picked in the table is orange. Each has a popup with its figures.
import { watch, type Ref, type ShallowRef } from 'vue';
import type { ChokePoint } from '@shared/api/runs';
import { L } from '@/map/leaflet';
import { travelDirection } from '@/map/compass';
import { chokePointCasing, chokePointLine, chokePointSelected } from '@/map/utilisation-scale';
import { chokePointKey, chokePointPopupHtml, type ChokePointContext } from '@/format/run-result';
import type { WorkspaceMap } from './use-leaflet-map';

type Coordinates = [number, number][];

export type ChokePointsLayerOptions = {
  chokePoints: Ref<readonly ChokePoint[]>;
  context: Ref<ChokePointContext>;
  geometryOf: (segmentId: number) => Coordinates | undefined;
  /** Moves when more geometry became known. */
  geometryVersion: Ref<number>;
  selectedKey: Ref<string | null>;
  onSelect: (key: string) => void;
};

export function useChokePointsLayer(handle: ShallowRef<WorkspaceMap | null>, options: ChokePointsLayerOptions) {
  let group: L.LayerGroup | null = null;
  const drawn = new Map<string, { line: L.Polyline; casing: L.Polyline }>();

  function draw() {
    const h = handle.value;
    if (!h) return;
    group ??= L.layerGroup().addTo(h.map);
    group.clearLayers();
    drawn.clear();
    for (const b of options.chokePoints.value) {
      const coordinates = options.geometryOf(b.segmentId);
      if (!coordinates) continue;
      const key = chokePointKey(b);
      const latLngs = coordinates.map(([lon, lat]) => [lat, lon] as [number, number]);
      const casing = L.polyline(latLngs, { ...chokePointCasing, renderer: h.chokeRenderer, pane: h.chokeRenderer.options.pane, interactive: false });
      const selected = options.selectedKey.value === key;
      const line = L.polyline(latLngs, {
        ...(selected ? chokePointSelected : chokePointLine),
        renderer: h.chokeRenderer,
        pane: h.chokeRenderer.options.pane,
        className: 'cutline-choke-point',
      });
      line.bindPopup(chokePointPopupHtml(b, travelDirection(coordinates, b.direction), options.context.value), { maxWidth: 320, className: 'cutline-choke-popup' });
      line.on('click', () => options.onSelect(key));
      group.addLayer(casing);
      group.addLayer(line);
      drawn.set(key, { line, casing });
    }
  }

  /** Opens the popup of one choke point, if it is drawn. */
  function openPopup(key: string) {
    const entry = drawn.get(key);
    if (entry) entry.line.openPopup();
  }

  watch([handle, options.chokePoints, options.context, options.geometryVersion, options.selectedKey], draw, { immediate: true });

  return { openPopup, drawnCount: () => drawn.size };
}

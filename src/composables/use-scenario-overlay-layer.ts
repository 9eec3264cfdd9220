// The scenario's changes drawn over the road layer of the editor's map (see map/scenario-style),
// the road picked last as an orange ring, and the plan's shelters that the scenario takes out
// as struck-through grey pins. Drawn on the SVG panes above the road canvas, not interactive,
// so that clicks still reach the roads underneath.
import { watch, type Ref, type ShallowRef } from 'vue';
import type { ScenarioOverlay } from '@shared/api/scenarios';
import type { Shelter } from '@shared/api/zones-shelters';
import { L } from '@/map/leaflet';
import { bearingDegrees } from '@/map/compass';
import { dominantChange, pickedRoadRing, scenarioCasing, scenarioChangeLooks } from '@/map/scenario-style';
import { changesBySegment } from '@/map/scenario-style';
import type { WorkspaceMap } from './use-leaflet-map';

type Coordinates = [number, number][];

export type ScenarioOverlayLayerOptions = {
  overlay: Ref<ScenarioOverlay>;
  removedShelters: Ref<readonly Shelter[]>;
  pickedSegmentId: Ref<number | null>;
  geometryOf: (segmentId: number) => Coordinates | undefined;
  geometryVersion: Ref<number>;
};

const toLatLngs = (c: Coordinates) => c.map(([lon, lat]) => [lat, lon] as [number, number]);

function arrowIcon(degrees: number) {
  return L.divIcon({
    className: 'cutline-corridor-arrow',
    html: `<div style="transform: rotate(${Math.round(degrees)}deg)"><svg viewBox="0 0 24 24" width="20" height="20" aria-hidden="true"><path d="M12 2 L20 20 L12 15 L4 20 Z" fill="#00796b" stroke="#fff" stroke-width="1.5"/></svg></div>`,
    iconSize: [20, 20],
    iconAnchor: [10, 10],
  });
}

export function useScenarioOverlayLayer(handle: ShallowRef<WorkspaceMap | null>, options: ScenarioOverlayLayerOptions) {
  let group: L.LayerGroup | null = null;

  function draw() {
    const h = handle.value;
    if (!h) return;
    group ??= L.layerGroup().addTo(h.map);
    group.clearLayers();
    const paneOptions = { renderer: h.chokeRenderer, pane: h.chokeRenderer.options.pane, interactive: false };
    const overlay = options.overlay.value;
    for (const [segmentId, changes] of changesBySegment(overlay)) {
      const coordinates = options.geometryOf(segmentId);
      const change = dominantChange(changes);
      if (!coordinates || !change) continue;
      const latLngs = toLatLngs(coordinates);
      group.addLayer(L.polyline(latLngs, { ...scenarioCasing, ...paneOptions }));
      group.addLayer(L.polyline(latLngs, { ...scenarioChangeLooks[change].line, ...paneOptions, className: `cutline-scenario-${change}` }));
    }
    // One arrow per corridor road, pointing the way both directions' lanes now serve.
    for (const corridor of overlay.contraflow) {
      for (const id of corridor.segmentIds) {
        const c = options.geometryOf(id);
        if (!c || c.length < 2 || overlay.closures.some((x) => x.segmentId === id)) continue;
        const [a, b] = corridor.direction === 'forward' ? [c[0]!, c[c.length - 1]!] : [c[c.length - 1]!, c[0]!];
        const mid: [number, number] = [(a[1] + b[1]) / 2, (a[0] + b[0]) / 2];
        group.addLayer(L.marker(mid, { icon: arrowIcon(bearingDegrees(a, b)), interactive: false, pane: h.selectionRenderer.options.pane }));
      }
    }
    const picked = options.pickedSegmentId.value;
    const pickedGeometry = picked === null ? undefined : options.geometryOf(picked);
    if (pickedGeometry) group.addLayer(L.polyline(toLatLngs(pickedGeometry), { ...pickedRoadRing, renderer: h.selectionRenderer, pane: h.selectionRenderer.options.pane, interactive: false }));
    for (const s of options.removedShelters.value) {
      group.addLayer(
        L.marker([s.lat, s.lon], {
          icon: L.divIcon({ className: 'cutline-shelter-icon', html: '<div class="cutline-shelter-pin cutline-shelter-pin--removed" title="Taken out in this scenario">✕</div>', iconSize: [30, 30], iconAnchor: [15, 15] }),
          interactive: false,
        }),
      );
    }
  }

  watch([handle, options.overlay, options.removedShelters, options.pickedSegmentId, options.geometryVersion], draw, { immediate: true, deep: true });
}

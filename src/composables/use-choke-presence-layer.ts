// The comparison map's choke points: each road that limits in any compared run, coloured by how
// it changes between them (map of looks in format/run-comparison), over a white casing, with a
// popup saying in which runs it limits.
import { ref, watch, type Ref, type ShallowRef } from 'vue';
import type { ChokePointPresence } from '@shared/model/compare-runs';
import { L } from '@/map/leaflet';
import { presenceLooks } from '@/format/run-comparison';
import { chokePointCasing } from '@/map/utilisation-scale';
import type { WorkspaceMap } from './use-leaflet-map';

type Coordinates = [number, number][];

export type ChokePresenceLayerOptions = {
  presence: Ref<readonly ChokePointPresence[]>;
  runLabels: Ref<readonly string[]>;
  geometryOf: (segmentId: number) => Coordinates | undefined;
  geometryVersion: Ref<number>;
};

function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

export function useChokePresenceLayer(handle: ShallowRef<WorkspaceMap | null>, options: ChokePresenceLayerOptions) {
  let group: L.LayerGroup | null = null;
  const drawn = ref(0);

  function draw() {
    const h = handle.value;
    if (!h) return;
    group ??= L.layerGroup().addTo(h.map);
    group.clearLayers();
    let count = 0;
    for (const p of options.presence.value) {
      const c = options.geometryOf(p.segmentId);
      if (!c) continue;
      const look = presenceLooks[p.change];
      const latLngs = c.map(([lon, lat]) => [lat, lon] as [number, number]);
      const pane = { renderer: h.chokeRenderer, pane: h.chokeRenderer.options.pane };
      group.addLayer(L.polyline(latLngs, { ...chokePointCasing, ...pane, interactive: false }));
      const line = L.polyline(latLngs, { color: look.color, weight: 7, opacity: 1, lineCap: 'butt', dashArray: look.dashed ? '10 6' : undefined, ...pane, className: `cutline-presence cutline-presence--${p.change}` });
      const rows = options.runLabels.value.map((label, i) => `<tr><th>${escapeHtml(label)}</th><td>${p.inRun[i] ? 'limits' : '–'}</td></tr>`).join('');
      line.bindPopup(`<div class="cutline-popup"><div class="cutline-popup__title">${escapeHtml(p.name.trim() || `Road ${p.segmentId}`)}</div><div class="cutline-popup__subtitle">${escapeHtml(look.label)}</div><table>${rows}</table></div>`, { maxWidth: 340 });
      group.addLayer(line);
      count++;
    }
    drawn.value = count;
  }

  watch([handle, options.presence, options.runLabels, options.geometryVersion], draw, { immediate: true });
  return { drawn };
}

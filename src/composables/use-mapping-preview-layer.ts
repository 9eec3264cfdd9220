// The field-mapping step's map: the first features of the file as the import would take them.
// Kept roads in their class's colour, left-out roads dashed grey, features that would refuse the
// file in red; zones as outlines, shelters as dots. Each has its outcome as a tooltip.
import { ref, watch, type Ref } from 'vue';
import type { GeoJsonObject } from 'geojson';
import type { PreviewOutcome } from '@shared/geo/preview-mapping';
import { L } from '@/map/leaflet';
import { roadClassLooks } from '@/map/road-style';

const refusedColor = '#b3261e';
const droppedColor = '#8d8d8d';
const placeColor = '#2e7d4f';

export function styleOfOutcome(o: PreviewOutcome): L.PathOptions {
  if (o.state === 'refused') return { color: refusedColor, weight: 3, opacity: 0.95, fillOpacity: 0.15 };
  if (o.state === 'dropped') return { color: droppedColor, weight: 2, opacity: 0.8, dashArray: '4 4' };
  const color = o.roadClass ? roadClassLooks[o.roadClass].color : placeColor;
  return { color, weight: o.roadClass ? 2.5 + Math.min(3, (o.lanes ?? 1) - 1) : 2, opacity: 0.95, fillOpacity: 0.2 };
}

export function useMappingPreviewLayer(map: Ref<L.Map | null>, outcomes: Ref<readonly PreviewOutcome[]>, extent: Ref<[number, number, number, number] | null>) {
  let group: L.LayerGroup | null = null;
  // Features on the map (drawn on the map's canvas, so the page cannot count them otherwise).
  const drawn = ref(0);

  function draw() {
    const m = map.value;
    if (!m) return;
    group?.remove();
    group = L.layerGroup().addTo(m);
    let count = 0;
    for (const o of outcomes.value) {
      if (!o.geometry) continue;
      const style = styleOfOutcome(o);
      const layer = L.geoJSON({ type: 'Feature', geometry: o.geometry, properties: {} } as GeoJsonObject, {
        style: () => style,
        pointToLayer: (_f, latlng) => L.circleMarker(latlng, { ...style, radius: 6, fillOpacity: 0.8 }),
      });
      layer.bindTooltip(`Feature ${o.index + 1}: ${o.label}`, { sticky: true });
      layer.addTo(group);
      count += 1;
    }
    drawn.value = count;
  }

  function fit() {
    const m = map.value;
    const e = extent.value;
    if (!m || !e) return;
    // The map opens inside a dialog that is still growing: measure again before fitting.
    m.invalidateSize();
    m.fitBounds([[e[1], e[0]], [e[3], e[2]]], { padding: [16, 16], maxZoom: 17 });
  }

  watch(map, () => {
    draw();
    fit();
  });
  watch(outcomes, draw);
  watch(extent, fit);
  return { drawn };
}

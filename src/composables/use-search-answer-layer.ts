// The two search answers that change no road, drawn on the workspace map: "where each zone goes"
// as each zone's corridors in the zone's colour (wider for more vehicles, a label at each zone
// naming where its vehicles go), and the quickest departure order as the zones filled by their
// release window (dark leaves first) with the window written under the zone's name. Not
// interactive, so clicks still reach the roads and zones underneath.
import { watch, type Ref, type ShallowRef } from 'vue';
import type { Feature, MultiPolygon, Polygon } from 'geojson';
import type { Zone } from '@shared/api/zones-shelters';
import { formatDuration } from '@shared/format/numbers';
import { routeLineWidth, type ReleaseWindow, type ZoneRouteLine } from '@shared/format/search-answers';
import { L } from '@/map/leaflet';
import { escapeHtml as escapeText } from '@/map/text-tooltip';
import { scenarioCasing } from '@/map/scenario-style';
import type { WorkspaceMap } from './use-leaflet-map';

type Coordinates = [number, number][];

export type SearchAnswerLayerOptions = {
  routeLines: Ref<readonly ZoneRouteLine[]>;
  /** Per zone: the label's lines drawn under its name ("→ Shelter", "641 vehicles, +2 more"), marked in the zone's colour. */
  routeLabels: Ref<readonly { zoneId: number; lines: string[]; colour: string }[]>;
  releaseWindows: Ref<readonly ReleaseWindow[]>;
  zones: Ref<readonly Zone[]>;
  geometryOf: (segmentId: number) => Coordinates | undefined;
  geometryVersion: Ref<number>;
};

const toLatLngs = (c: Coordinates) => c.map(([lon, lat]) => [lat, lon] as [number, number]);

export function useSearchAnswerLayer(handle: ShallowRef<WorkspaceMap | null>, options: SearchAnswerLayerOptions) {
  let group: L.LayerGroup | null = null;

  function zoneShape(h: WorkspaceMap, zone: Zone, style: L.PathOptions) {
    const feature: Feature<Polygon | MultiPolygon> = { type: 'Feature', geometry: zone.geometry, properties: {} };
    return L.geoJSON(feature, { style, renderer: h.zoneRenderer, pane: h.zoneRenderer.options.pane, interactive: false } as L.GeoJSONOptions);
  }

  function draw() {
    const h = handle.value;
    if (!h) return;
    group ??= L.layerGroup().addTo(h.map);
    group.clearLayers();
    const pane = { renderer: h.chokeRenderer, pane: h.chokeRenderer.options.pane, interactive: false };

    const lines = options.routeLines.value;
    const most = lines.reduce((m, l) => Math.max(m, l.vehicles), 0);
    // Fewest vehicles first, so the busiest corridors lie on top; every casing before every line,
    // so one road's casing does not cut into the next road's line where they meet.
    const drawn = [...lines].reverse().flatMap((line) => {
      const coordinates = options.geometryOf(line.segmentId);
      return coordinates && coordinates.length >= 2 ? [{ line, latLngs: toLatLngs(coordinates), weight: routeLineWidth(line.vehicles, most) }] : [];
    });
    for (const d of drawn) group.addLayer(L.polyline(d.latLngs, { ...scenarioCasing, weight: d.weight + 4, ...pane }));
    for (const d of drawn) {
      group.addLayer(L.polyline(d.latLngs, { color: d.line.colour, weight: d.weight, opacity: 0.95, lineCap: 'round', lineJoin: 'round', ...pane, className: 'cutline-zone-route' }));
    }
    for (const label of options.routeLabels.value) {
      const zone = options.zones.value.find((z) => z.id === label.zoneId);
      if (!zone) continue;
      const shape = zoneShape(h, zone, { color: label.colour, weight: 3, fillOpacity: 0, opacity: 0.9 });
      group.addLayer(shape);
      const tip = L.tooltip({ permanent: true, direction: 'bottom', offset: [0, 10], className: 'cutline-search-label', opacity: 0.95 })
        .setLatLng(shape.getBounds().getCenter())
        .setContent(`<div style="border-left: 6px solid ${label.colour}; padding-left: 4px">${label.lines.map(escapeText).join('<br>')}</div>`);
      group.addLayer(tip);
    }

    for (const w of options.releaseWindows.value) {
      const zone = options.zones.value.find((z) => z.id === w.zoneId);
      if (!zone) continue;
      const shape = zoneShape(h, zone, { color: w.colour, weight: 3, fillColor: w.colour, fillOpacity: 0.3, opacity: 1 });
      group.addLayer(shape);
      group.addLayer(
        L.tooltip({ permanent: true, direction: 'bottom', offset: [0, 10], className: 'cutline-search-label cutline-release-window', opacity: 0.95 })
          .setLatLng(shape.getBounds().getCenter())
          .setContent(w.window && w.halfGoneMinutes !== null ? `leaves ${formatDuration(w.window[0])}–${formatDuration(w.window[1])}<br>half by ${formatDuration(w.halfGoneMinutes)}` : escapeText(w.label)),
      );
    }
  }

  watch([handle, options.routeLines, options.routeLabels, options.releaseWindows, options.zones, options.geometryVersion], draw, { immediate: true, deep: true });
}

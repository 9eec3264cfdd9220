// Zones (translucent polygons with their names) and shelters (round pins, an exit shown with an
// arrow) on the map, with the road nodes each one attaches to when asked for, and the draft
// being drawn. Clicking one selects it in the side panel.
import { bindTextTooltip } from '@/map/text-tooltip';
import { watch, type Ref, type ShallowRef } from 'vue';
import { mdiExitRun, mdiHome } from '@mdi/js';
import type { Feature, Polygon, MultiPolygon } from 'geojson';
import type { Attachments, Shelter, Zone } from '@shared/api/zones-shelters';
import type { Draft } from '@/stores/workspace';
import { L } from '@/map/leaflet';
import type { WorkspaceMap } from './use-leaflet-map';

export type ZonesSheltersLayerOptions = {
  zones: Ref<readonly Zone[]>;
  shelters: Ref<readonly Shelter[]>;
  attachments: Ref<Attachments | null>;
  showAttachments: Ref<boolean>;
  draft: Ref<Draft>;
  selectedZoneId: Ref<number | null>;
  selectedShelterId: Ref<number | null>;
  onSelectZone: (zoneId: number) => void;
  /** True where a click belongs to something drawn over the zones (a road): the zone lets it be. */
  clickTakenAt?: (latlng: L.LatLng) => boolean;
  onSelectShelter: (shelterId: number) => void;
};

const zoneColor = '#2e7d4f';
const selectedColor = '#b5521f';


function shelterIcon(shelter: Pick<Shelter, 'capacityPersons'>, selected: boolean, draft = false) {
  const path = shelter.capacityPersons === null ? mdiExitRun : mdiHome;
  const classes = ['cutline-shelter-pin', selected ? 'cutline-shelter-pin--selected' : '', draft ? 'cutline-shelter-pin--draft' : ''].join(' ');
  return L.divIcon({
    className: 'cutline-shelter-icon',
    html: `<div class="${classes}"><svg viewBox="0 0 24 24" width="18" height="18" aria-hidden="true"><path d="${path}" fill="currentColor"/></svg></div>`,
    iconSize: [30, 30],
    iconAnchor: [15, 15],
    tooltipAnchor: [14, 0],
  });
}

export function useZonesSheltersLayer(handle: ShallowRef<WorkspaceMap | null>, options: ZonesSheltersLayerOptions) {
  let zoneGroup: L.LayerGroup | null = null;
  let shelterGroup: L.LayerGroup | null = null;
  let attachmentGroup: L.LayerGroup | null = null;
  let draftGroup: L.LayerGroup | null = null;

  function drawZones() {
    const h = handle.value;
    if (!h) return;
    zoneGroup ??= L.layerGroup().addTo(h.map);
    zoneGroup.clearLayers();
    for (const zone of options.zones.value) {
      const selected = options.selectedZoneId.value === zone.id;
      const feature: Feature<Polygon | MultiPolygon> = { type: 'Feature', geometry: zone.geometry, properties: {} };
      const layer = L.geoJSON(feature, {
        style: {
          color: selected ? selectedColor : zoneColor,
          weight: selected ? 3 : 2,
          fillColor: zoneColor,
          fillOpacity: selected ? 0.22 : 0.12,
          dashArray: selected ? undefined : '6 4',
        },
        renderer: h.zoneRenderer,
        pane: h.zoneRenderer.options.pane,
      } as L.GeoJSONOptions);
      bindTextTooltip(layer, zone.name, { permanent: true, direction: 'center', className: 'cutline-zone-label', opacity: 0.9 });
      layer.on('click', (e: L.LeafletMouseEvent) => {
        // A road inside a zone is picked by the map's click (the roads' own handler); selecting
        // the zone as well would open its editor over the road's.
        if (options.clickTakenAt?.(e.latlng)) return;
        options.onSelectZone(zone.id);
      });
      zoneGroup.addLayer(layer);
    }
  }

  function drawShelters() {
    const h = handle.value;
    if (!h) return;
    shelterGroup ??= L.layerGroup().addTo(h.map);
    shelterGroup.clearLayers();
    for (const shelter of options.shelters.value) {
      const selected = options.selectedShelterId.value === shelter.id;
      const marker = L.marker([shelter.lat, shelter.lon], { icon: shelterIcon(shelter, selected), title: shelter.name, riseOnHover: true, keyboard: true });
      bindTextTooltip(marker, shelter.name, { direction: 'right', className: 'cutline-shelter-label' });
      marker.on('click', () => options.onSelectShelter(shelter.id));
      shelterGroup.addLayer(marker);
    }
  }

  function drawAttachments() {
    const h = handle.value;
    if (!h) return;
    attachmentGroup ??= L.layerGroup().addTo(h.map);
    attachmentGroup.clearLayers();
    const a = options.attachments.value;
    if (!a || !options.showAttachments.value) return;
    const dot = { radius: 4, color: '#ffffff', weight: 1.5, fillColor: zoneColor, fillOpacity: 1, renderer: h.selectionRenderer, pane: h.selectionRenderer.options.pane, interactive: false };
    for (const zone of a.zones) {
      for (const node of zone.nodes) attachmentGroup.addLayer(L.circleMarker([node.lat, node.lon], dot));
    }
    for (const s of a.shelters) {
      const shelter = options.shelters.value.find((x) => x.id === s.shelterId);
      if (!s.node || !shelter) continue;
      attachmentGroup.addLayer(
        L.polyline(
          [
            [shelter.lat, shelter.lon],
            [s.node.lat, s.node.lon],
          ],
          { color: '#1d3b53', weight: 2, dashArray: '3 4', renderer: h.selectionRenderer, pane: h.selectionRenderer.options.pane, interactive: false },
        ),
      );
      attachmentGroup.addLayer(L.circleMarker([s.node.lat, s.node.lon], { ...dot, fillColor: '#1d3b53' }));
    }
  }

  function drawDraft() {
    const h = handle.value;
    if (!h) return;
    draftGroup ??= L.layerGroup().addTo(h.map);
    draftGroup.clearLayers();
    const d = options.draft.value;
    if (!d) return;
    if (d.kind === 'zone') {
      draftGroup.addLayer(
        L.geoJSON({ type: 'Feature', geometry: d.geometry, properties: {} } as Feature, {
          style: { color: selectedColor, weight: 3, fillColor: selectedColor, fillOpacity: 0.15 },
          renderer: h.selectionRenderer,
          pane: h.selectionRenderer.options.pane,
          interactive: false,
        } as L.GeoJSONOptions),
      );
    } else {
      draftGroup.addLayer(L.marker([d.lat, d.lon], { icon: shelterIcon({ capacityPersons: 0 }, true, true), interactive: false }));
    }
  }

  watch([handle, options.zones, options.selectedZoneId], drawZones, { immediate: true });
  watch([handle, options.shelters, options.selectedShelterId], drawShelters, { immediate: true });
  watch([handle, options.attachments, options.showAttachments, options.shelters], drawAttachments, { immediate: true });
  watch([handle, options.draft], drawDraft, { immediate: true });
}

// Drawing a zone polygon or placing a shelter with leaflet-geoman, driven by the workspace's
// draw mode (our own toolbar; geoman's is not shown). A finished shape becomes a draft in the
// store, as plain GeoJSON, and the form in the side panel takes it from there.
import { watch, type Ref, type ShallowRef } from 'vue';
import type { Polygon } from 'geojson';
import type { DrawMode, Draft } from '@/stores/workspace';
import { L } from '@/map/leaflet';
import type { WorkspaceMap } from './use-leaflet-map';

export type MapDrawingOptions = {
  mode: Ref<DrawMode>;
  onFinished: (draft: Draft) => void;
  onCancelled: () => void;
};

const drawColor = '#b5521f';

export function useMapDrawing(handle: ShallowRef<WorkspaceMap | null>, options: MapDrawingOptions) {
  watch(
    [handle, options.mode],
    ([h, mode], _old, onCleanup) => {
      if (!h || !h.map.pm) return;
      const map = h.map;
      let finished = false;
      const onCreate = (e: { layer: L.Layer; shape: string }) => {
        finished = true;
        map.removeLayer(e.layer);
        if (e.shape === 'Polygon') {
          const geometry = (e.layer as L.Polygon).toGeoJSON(7).geometry as Polygon;
          options.onFinished({ kind: 'zone', geometry: { type: 'Polygon', coordinates: geometry.coordinates as [number, number][][] } });
        } else {
          const at = (e.layer as L.Marker).getLatLng();
          options.onFinished({ kind: 'shelter', lon: Math.round(at.lng * 1e7) / 1e7, lat: Math.round(at.lat * 1e7) / 1e7 });
        }
      };
      const onDrawEnd = () => {
        // Esc or a second click on the tool ends drawing without a shape.
        if (!finished) options.onCancelled();
      };
      map.pm.disableDraw();
      if (mode === 'zone') {
        map.pm.enableDraw('Polygon', {
          snappable: false,
          continueDrawing: false,
          templineStyle: { color: drawColor, weight: 2 },
          hintlineStyle: { color: drawColor, dashArray: [4, 4] },
          pathOptions: { color: drawColor, fillColor: drawColor, fillOpacity: 0.15 },
          finishOn: null,
        });
      } else if (mode === 'shelter') {
        map.pm.enableDraw('Marker', {
          snappable: false,
          continueDrawing: false,
          markerStyle: { icon: L.divIcon({ className: 'cutline-shelter-icon', html: '<div class="cutline-shelter-pin cutline-shelter-pin--draft"></div>', iconSize: [30, 30], iconAnchor: [15, 15] }) },
        });
      } else return;
      map.on('pm:create', onCreate);
      map.on('pm:drawend', onDrawEnd);
      onCleanup(() => {
        map.off('pm:create', onCreate);
        map.off('pm:drawend', onDrawEnd);
        if (!finished) map.pm.disableDraw();
      });
    },
    { immediate: true },
  );
}

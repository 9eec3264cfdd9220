// The plan workspace's own state: which plan is open, which panel tab shows, what is selected,
// where the map should look next, and what is being drawn. Only plain data: the map's Leaflet
// objects live in composables (Leaflet breaks inside Vue proxies).
import { defineStore } from 'pinia';
import { computed, ref } from 'vue';
import type { Plan } from '@shared/api/plans';
import type { ZoneGeometry } from '@shared/api/zones-shelters';
import { getPlan, planInputsUrl, type PlanInputsFile } from '@/api/plans';
import { ApiError } from '@/api/api-error';
import type { Bbox } from '@/map/viewport';
import { messageOf } from '../format/error-message';
import { useRoadLayerStore } from './road-layer';
import { useRunsStore } from './runs';
import { useZonesSheltersStore } from './zones-shelters';

export type { PlanInputsFile } from '@/api/plans';

export type WorkspaceTab = 'roads' | 'zones' | 'shelters' | 'assumptions' | 'findings';
export type Selection = { kind: 'segment' | 'zone' | 'shelter' | 'chokePoint'; id: number | string } | null;
export type DrawMode = 'zone' | 'shelter' | null;
export type Draft = { kind: 'zone'; geometry: ZoneGeometry } | { kind: 'shelter'; lon: number; lat: number } | null;
/** A request to the map: show this extent (serial lets the same bbox be asked twice). */
export type MapMark = { lon: number; lat: number; label: string };
export type FocusRequest = { bbox: Bbox; serial: number; maxZoom?: number; mark?: MapMark };

export const useWorkspaceStore = defineStore('workspace', () => {
  const roadLayer = useRoadLayerStore();
  const zonesShelters = useZonesSheltersStore();
  const runs = useRunsStore();

  const planId = ref('');
  const plan = ref<Plan | null>(null);
  const error = ref('');
  const tab = ref<WorkspaceTab>('roads');
  const selection = ref<Selection>(null);
  const focus = ref<FocusRequest | null>(null);
  const drawMode = ref<DrawMode>(null);
  const draft = ref<Draft>(null);
  const segmentTableOpen = ref(false);
  let serial = 0;

  const ready = computed(() => plan.value !== null);

  /** What the planner still has to do before an analysis can run, in order. */
  const missingSteps = computed(() => {
    const steps: { tab: WorkspaceTab; text: string }[] = [];
    if (!roadLayer.layer) steps.push({ tab: 'roads', text: 'Upload the road network' });
    if (zonesShelters.zones.length === 0) steps.push({ tab: 'zones', text: 'Draw or upload an evacuation zone' });
    if (zonesShelters.shelters.length === 0) steps.push({ tab: 'shelters', text: 'Place or upload a shelter or exit' });
    return steps;
  });

  async function open(id: string) {
    planId.value = id;
    plan.value = null;
    error.value = '';
    selection.value = null;
    draft.value = null;
    drawMode.value = null;
    focus.value = null;
    segmentTableOpen.value = false;
    let loaded: Plan;
    try {
      loaded = await getPlan(id);
    } catch (e) {
      error.value = e instanceof ApiError && e.status === 404 ? 'This plan does not exist or belongs to another organization.' : messageOf(e);
      return;
    }
    await Promise.all([roadLayer.load(id), zonesShelters.load(id), runs.load(id)]);
    if (planId.value !== id) return;
    // Land where the work is: findings if there are some, else the first missing step. The
    // panel shows only now, so nothing the planner clicks is overruled.
    tab.value = runs.result ? 'findings' : (missingSteps.value[0]?.tab ?? 'assumptions');
    plan.value = loaded;
    if (roadLayer.layer?.bbox) focusOn(roadLayer.layer.bbox);
  }

  function close() {
    runs.stopPolling();
    roadLayer.cancelUpload();
  }

  function focusOn(bbox: Bbox, maxZoom?: number, mark?: MapMark) {
    focus.value = { bbox, serial: ++serial, maxZoom, mark };
  }

  /** Zooms to a point of interest (a problem in the import report) and marks it. */
  function showPoint(lon: number, lat: number, label: string) {
    const d = 0.0015;
    focusOn([lon - d, lat - d, lon + d, lat + d], 18, { lon, lat, label });
  }

  function select(next: Selection) {
    selection.value = next;
    if (next?.kind === 'segment') void roadLayer.selectSegment(Number(next.id));
    else void roadLayer.selectSegment(null);
  }

  function startDrawing(mode: DrawMode) {
    draft.value = null;
    drawMode.value = mode;
    if (mode === 'zone') tab.value = 'zones';
    if (mode === 'shelter') tab.value = 'shelters';
  }

  function finishDrawing(next: Draft) {
    drawMode.value = null;
    draft.value = next;
    if (next?.kind === 'zone') tab.value = 'zones';
    if (next?.kind === 'shelter') tab.value = 'shelters';
  }

  function discardDraft() {
    draft.value = null;
    drawMode.value = null;
  }

  /** A link to one of the plan's input files (as they stand after edits and closures). */
  const inputsFileUrl = (file: PlanInputsFile) => (planId.value ? planInputsUrl(planId.value, file) : '');

  return {
    planId,
    plan,
    inputsFileUrl,
    error,
    tab,
    selection,
    focus,
    drawMode,
    draft,
    segmentTableOpen,
    ready,
    missingSteps,
    open,
    close,
    focusOn,
    showPoint,
    select,
    startDrawing,
    finishDrawing,
    discardDraft,
  };
});

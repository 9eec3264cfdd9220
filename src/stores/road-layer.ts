// The open plan's road layer: its summary and import report, the upload with its progress, the
// segment being edited, and edits one by one or in bulk. `mapVersion` moves on every change
// so that the map reloads what it shows.
import { defineStore } from 'pinia';
import { ref } from 'vue';
import type { CapacityTable, CapacityTableHistoryEntry } from '@shared/api/capacity-table';
import type { ImportFailure, ImportOptionsInput } from '@shared/api/road-import';
import type { SegmentAttributesPatch } from '@shared/api/road-attributes';
import type { RoadLayer, Segment } from '@shared/api/road-layers';
import * as roadApi from '@/api/road-layers';
import { getCapacityTable, getCapacityTableHistory, putCapacityTable } from '@/api/capacity-table';
import { ApiError } from '@/api/api-error';
import { messageOf } from '../format/error-message';
import { useRunsStore } from './runs';
import { useZonesSheltersStore } from './zones-shelters';

// 'sending': the bytes go up (share of them sent); 'server': the server's worker reads and saves
// the file (its own phase in words, and share done).
export type UploadState = { fileName: string; share: number; phase: 'sending' | 'server'; serverPhase: string } | null;

export const useRoadLayerStore = defineStore('road-layer', () => {
  const runs = useRunsStore();
  const zonesShelters = useZonesSheltersStore();

  const planId = ref('');
  const layer = ref<RoadLayer | null>(null);
  const loading = ref(false);
  const error = ref('');
  const upload = ref<UploadState>(null);
  const uploadError = ref('');
  const refusal = ref<ImportFailure | null>(null);
  const capacityTable = ref<CapacityTable | null>(null);
  const capacityTableHistory = ref<CapacityTableHistoryEntry[]>([]);
  const selectedSegment = ref<Segment | null>(null);
  const mapVersion = ref(0);
  let uploadAbort: AbortController | null = null;

  async function load(id: string) {
    planId.value = id;
    layer.value = null;
    selectedSegment.value = null;
    refusal.value = null;
    uploadError.value = '';
    loading.value = true;
    error.value = '';
    try {
      const [roadLayer, table] = await Promise.all([roadApi.getRoadLayer(id), getCapacityTable(id).catch(() => null)]);
      layer.value = roadLayer;
      capacityTable.value = table;
    } catch (e) {
      error.value = messageOf(e);
    } finally {
      loading.value = false;
    }
  }

  /** @param importOptions the field-mapping step's answer (which columns mean what, CRS, layer). */
  async function uploadFile(file: File, importOptions?: ImportOptionsInput): Promise<boolean> {
    uploadError.value = '';
    refusal.value = null;
    uploadAbort = new AbortController();
    upload.value = { fileName: file.name, share: 0, phase: 'sending', serverPhase: '' };
    try {
      const answer = await roadApi.uploadRoadLayer(planId.value, file, {
        importOptions,
        signal: uploadAbort.signal,
        onProgress: (p) => {
          upload.value = { fileName: file.name, share: p.share, phase: 'sending', serverPhase: '' };
        },
        // Once every byte is sent, the import waits in the queue, then a worker reads and saves it.
        onServerProgress: (serverPhase, share) => {
          upload.value = { fileName: file.name, share, phase: 'server', serverPhase };
        },
      });
      layer.value = answer.layer;
      selectedSegment.value = null;
      mapVersion.value++;
      runs.markDataChanged();
      // Zones and shelters attach to the new roads now.
      void zonesShelters.loadAttachments();
      return true;
    } catch (e) {
      if (e instanceof DOMException && e.name === 'AbortError') uploadError.value = 'Upload cancelled.';
      else {
        uploadError.value = messageOf(e);
        refusal.value = e instanceof ApiError ? e.importFailure : null;
      }
      return false;
    } finally {
      upload.value = null;
      uploadAbort = null;
    }
  }

  function cancelUpload() {
    uploadAbort?.abort();
  }

  async function selectSegment(segmentId: number | null) {
    if (segmentId === null) {
      selectedSegment.value = null;
      return;
    }
    try {
      selectedSegment.value = await roadApi.getSegment(planId.value, segmentId);
    } catch (e) {
      error.value = messageOf(e);
    }
  }

  async function saveSegment(segmentId: number, patch: SegmentAttributesPatch): Promise<Segment> {
    const saved = await roadApi.updateSegment(planId.value, segmentId, patch);
    if (selectedSegment.value?.id === segmentId) selectedSegment.value = saved;
    mapVersion.value++;
    runs.markDataChanged();
    return saved;
  }

  async function saveSegments(ids: number[], patch: SegmentAttributesPatch): Promise<number> {
    const { updated } = await roadApi.updateSegments(planId.value, ids, patch);
    if (selectedSegment.value && ids.includes(selectedSegment.value.id)) await selectSegment(selectedSegment.value.id);
    mapVersion.value++;
    runs.markDataChanged();
    return updated;
  }

  /** Planners: the whole table with one class changed (each changed value with its new source). */
  async function saveCapacityTable(table: CapacityTable) {
    capacityTable.value = await putCapacityTable(planId.value, table);
    runs.markDataChanged();
    await loadCapacityTableHistory();
  }

  async function loadCapacityTableHistory() {
    capacityTableHistory.value = (await getCapacityTableHistory(planId.value)).entries;
  }

  return {
    planId,
    layer,
    capacityTableHistory,
    saveCapacityTable,
    loadCapacityTableHistory,
    loading,
    error,
    upload,
    uploadError,
    refusal,
    capacityTable,
    selectedSegment,
    mapVersion,
    load,
    uploadFile,
    cancelUpload,
    selectSegment,
    saveSegment,
    saveSegments,
  };
});

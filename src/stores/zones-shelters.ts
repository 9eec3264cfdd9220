// The open plan's evacuation zones and shelters, and which road nodes each attaches to. The
// attachments depend on the road layer, so they are read again after any change.
import { defineStore } from 'pinia';
import { ref } from 'vue';
import type { Attachments, Shelter, ShelterCreate, ShelterUpdate, Zone, ZoneCreate, ZoneUpdate } from '@shared/api/zones-shelters';
import * as zonesApi from '@/api/zones';
import * as sheltersApi from '@/api/shelters';
import { importFile } from '@/api/imports';
import { ApiError } from '@/api/api-error';
import { messageOf } from '../format/error-message';
import { useRunsStore } from './runs';
import type { ShelterUploadOptions, ZoneUploadOptions } from '@shared/api/road-import';

export const useZonesSheltersStore = defineStore('zones-shelters', () => {
  const runs = useRunsStore();

  const planId = ref('');
  const zones = ref<Zone[]>([]);
  const shelters = ref<Shelter[]>([]);
  const attachments = ref<Attachments | null>(null);
  // Why attachments are missing, in words ('' when they are shown).
  const attachmentsNote = ref('');
  const loading = ref(false);
  const error = ref('');

  async function load(id: string) {
    planId.value = id;
    loading.value = true;
    error.value = '';
    try {
      [zones.value, shelters.value] = await Promise.all([zonesApi.listZones(id), sheltersApi.listShelters(id)]);
    } catch (e) {
      error.value = messageOf(e);
    } finally {
      loading.value = false;
    }
    await loadAttachments();
  }

  async function loadAttachments() {
    try {
      attachments.value = await sheltersApi.getAttachments(planId.value);
      attachmentsNote.value = '';
    } catch (e) {
      attachments.value = null;
      if (e instanceof ApiError && e.status === 404 && e.message.startsWith('No API route')) attachmentsNote.value = 'This server does not report attachments yet.';
      else if (e instanceof ApiError && e.status === 404) attachmentsNote.value = 'Attachments show once a road layer is uploaded.';
      else attachmentsNote.value = `Attachments could not be read: ${messageOf(e)}`;
    }
  }

  function changed() {
    runs.markDataChanged();
    void loadAttachments();
  }

  async function createZone(input: ZoneCreate): Promise<Zone> {
    const zone = await zonesApi.createZone(planId.value, input);
    zones.value = [...zones.value, zone];
    changed();
    return zone;
  }

  async function updateZone(zoneId: number, input: ZoneUpdate): Promise<Zone> {
    const zone = await zonesApi.updateZone(planId.value, zoneId, input);
    zones.value = zones.value.map((z) => (z.id === zoneId ? zone : z));
    changed();
    return zone;
  }

  async function deleteZone(zoneId: number) {
    await zonesApi.deleteZone(planId.value, zoneId);
    zones.value = zones.value.filter((z) => z.id !== zoneId);
    changed();
  }

  /**
   * Uploads a zone or shelter file as an import job and follows it to its end (the server's phase
   * and share done go to `onServerProgress`); then reads the list again. Resolves with how many
   * were added; a refused file throws with its reasons.
   */
  /** @param options the field-mapping step's answer: how to read the file, which columns mean what. */
  async function importPlaces(kind: 'zones' | 'shelters', file: File, onServerProgress?: (phase: string, share: number) => void, options?: ZoneUploadOptions | ShelterUploadOptions): Promise<number> {
    const done = await importFile(planId.value, kind, file, { onServerProgress, fields: options ? { options: JSON.stringify(options) } : {} });
    const created = Number(done.outcome?.['created'] ?? 0);
    if (kind === 'zones') zones.value = await zonesApi.listZones(planId.value);
    else shelters.value = await sheltersApi.listShelters(planId.value);
    changed();
    return created;
  }

  const uploadZones = (file: File, onServerProgress?: (phase: string, share: number) => void, options?: ZoneUploadOptions) => importPlaces('zones', file, onServerProgress, options);

  async function createShelter(input: ShelterCreate): Promise<Shelter> {
    const shelter = await sheltersApi.createShelter(planId.value, input);
    shelters.value = [...shelters.value, shelter];
    changed();
    return shelter;
  }

  async function updateShelter(shelterId: number, input: ShelterUpdate): Promise<Shelter> {
    const shelter = await sheltersApi.updateShelter(planId.value, shelterId, input);
    shelters.value = shelters.value.map((s) => (s.id === shelterId ? shelter : s));
    changed();
    return shelter;
  }

  async function deleteShelter(shelterId: number) {
    await sheltersApi.deleteShelter(planId.value, shelterId);
    shelters.value = shelters.value.filter((s) => s.id !== shelterId);
    changed();
  }

  const uploadShelters = (file: File, onServerProgress?: (phase: string, share: number) => void, options?: ShelterUploadOptions) => importPlaces('shelters', file, onServerProgress, options);

  return {
    planId,
    zones,
    shelters,
    attachments,
    attachmentsNote,
    loading,
    error,
    load,
    loadAttachments,
    createZone,
    updateZone,
    deleteZone,
    uploadZones,
    createShelter,
    updateShelter,
    deleteShelter,
    uploadShelters,
  };
});

// The installation's basemap setting, read once per session; admins change it.
import { defineStore } from 'pinia';
import { ref } from 'vue';
import type { MapSettings } from '@shared/api/settings';
import * as settingsApi from '@/api/settings';
import { messageOf } from '../format/error-message';

export const useMapSettingsStore = defineStore('map-settings', () => {
  // No basemap until told otherwise: the map must work offline.
  const settings = ref<MapSettings>({ tileUrl: '', attribution: '' });
  const loaded = ref(false);
  const error = ref('');

  async function load(force = false) {
    if (loaded.value && !force) return;
    error.value = '';
    try {
      settings.value = await settingsApi.getMapSettings();
    } catch (e) {
      error.value = messageOf(e);
    } finally {
      loaded.value = true;
    }
  }

  async function save(input: MapSettings) {
    settings.value = await settingsApi.putMapSettings(input);
  }

  return { settings, loaded, error, load, save };
});

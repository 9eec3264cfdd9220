// The organisation's unit system and time zone: read once the organisation is known (and again
// after a switch), handed to the screen formatters (src/format/preferences.ts); admins change it.
import { defineStore } from 'pinia';
import { ref } from 'vue';
import type { OrganizationSettings, OrganizationSettingsInput } from '@shared/api/settings';
import * as settingsApi from '@/api/settings';
import { messageOf } from '../format/error-message';
import { setPreferences } from '../format/preferences';

export const useOrganizationSettingsStore = defineStore('organization-settings', () => {
  const settings = ref<OrganizationSettings | null>(null);
  const error = ref('');

  function apply(s: OrganizationSettings) {
    settings.value = s;
    setPreferences({ unitSystem: s.unitSystem, timeZone: s.effectiveTimeZone });
  }

  async function load() {
    error.value = '';
    try {
      apply(await settingsApi.getOrganizationSettings());
    } catch (e) {
      error.value = messageOf(e);
    }
  }

  async function save(input: OrganizationSettingsInput) {
    apply(await settingsApi.putOrganizationSettings(input));
  }

  return { settings, error, load, save };
});

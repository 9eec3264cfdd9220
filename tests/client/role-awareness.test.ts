// Viewers and officials see the workspace read-only: no analyse, draw, upload or edit controls;
// planners and admins get them. Mounted with Vuetify in a simulated DOM.
import { beforeEach, describe, expect, it } from 'vitest';
import { mount, flushPromises } from '@vue/test-utils';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import { createRouter, createMemoryHistory } from 'vue-router';
import type { Role } from '../../shared/api/roles';
import { ignoreStylesheets } from './support/ignore-stylesheets';

// Vuetify's components import their stylesheets, which Node cannot load: skip them.
await ignoreStylesheets();
const { createVuetify } = await import('vuetify');
const { useSessionStore } = await import('../../src/stores/session');
const { useWorkspaceStore } = await import('../../src/stores/workspace');
const { useZonesSheltersStore } = await import('../../src/stores/zones-shelters');
const { default: WorkspaceSidePanel } = await import('../../src/components/workspace/WorkspaceSidePanel.vue');

let pinia: Pinia;

function signIn(role: Role) {
  const organizationId = '00000000-0000-4000-8000-000000000001';
  useSessionStore().user = {
    id: '00000000-0000-4000-8000-000000000002',
    email: 'a@cutline.example',
    displayName: 'A',
    memberships: [{ organizationId, organizationName: 'Org', role }],
    organizationId,
    role,
  };
}

async function mountPanel(tab: 'roads' | 'zones' | 'shelters' | 'assumptions' | 'findings') {
  const workspace = useWorkspaceStore();
  workspace.plan = { id: 'p', organizationId: 'o', name: 'Test plan', description: '', createdBy: null, createdAt: '', updatedAt: '' };
  workspace.tab = tab;
  useZonesSheltersStore().zones = [
    {
      id: 1,
      name: 'North Flats',
      population: 100,
      participationRate: 0.8,
      personsPerVehicle: 2,
      departureCurve: { kind: 'allAtOnce' },
      geometry: { type: 'Polygon', coordinates: [[[0, 0], [1, 0], [1, 1], [0, 0]]] },
    },
  ];
  const router = createRouter({ history: createMemoryHistory(), routes: [{ path: '/', name: 'plans', component: { template: '<div />' } }] });
  const wrapper = mount(WorkspaceSidePanel, { global: { plugins: [pinia, router, createVuetify()] }, attachTo: document.body });
  await flushPromises();
  return wrapper;
}

beforeEach(() => {
  pinia = createPinia();
  setActivePinia(pinia);
  document.body.innerHTML = '';
});

describe('role awareness in the workspace', () => {
  it.each(['viewer', 'official'] as const)('%s: read-only, no analyse or draw controls', async (role) => {
    signIn(role);
    const wrapper = await mountPanel('zones');
    expect(wrapper.find('[data-test="read-only"]').exists()).toBe(true);
    expect(wrapper.find('[data-test="analyse"]').exists()).toBe(false);
    expect(wrapper.text()).not.toContain('Draw zone');
    expect(wrapper.text()).not.toContain('Upload zones');
    expect(wrapper.find('[data-test="tab-zones"]').text()).toContain('North Flats');
    wrapper.unmount();
  });

  it.each(['planner', 'admin'] as const)('%s: analyse and draw controls', async (role) => {
    signIn(role);
    const wrapper = await mountPanel('zones');
    expect(wrapper.find('[data-test="read-only"]').exists()).toBe(false);
    expect(wrapper.find('[data-test="analyse"]').exists()).toBe(true);
    expect(wrapper.text()).toContain('Draw zone');
    wrapper.unmount();
  });

  it('keeps the analyse button off until roads, a zone and a shelter exist, naming what is missing', async () => {
    signIn('planner');
    const wrapper = await mountPanel('assumptions');
    const button = wrapper.find('[data-test="analyse"]');
    expect(button.attributes('disabled')).toBeDefined();
    const missing = wrapper.find('[data-test="missing-steps"]').text();
    expect(missing).toContain('upload the road network');
    expect(missing).toContain('place or upload a shelter');
    expect(missing).not.toContain('zone');
    wrapper.unmount();
  });
});

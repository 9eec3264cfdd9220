// Searches for the best change in the open plan: the one being looked at, polled while it works,
// and saving its answer as a scenario, then running that scenario beside the current run to compare.
import { defineStore } from 'pinia';
import { computed, ref } from 'vue';
import type { Proposal, ProposalRequest } from '@shared/api/proposals';
import type { RunParameters } from '@shared/api/runs';
import { scenarioOverlaySchema, type Scenario, type ScenarioOverlay } from '@shared/api/scenarios';
import { releaseWindows, zoneRouteColour, zoneRouteLines, type ReleaseWindow, type ZoneRouteLine } from '@shared/format/search-answers';
import { formatCount } from '@shared/format/numbers';
import * as api from '@/api/proposals';
import { useRunsStore } from '@/stores/runs';
import { messageOf } from '@/format/error-message';

export const useProposalsStore = defineStore('proposals', () => {
  const runs = useRunsStore();
  const planId = ref('');
  const current = ref<Proposal | null>(null);
  const error = ref('');
  const starting = ref(false);
  const saved = ref<Scenario | null>(null);
  let timer: ReturnType<typeof setTimeout> | null = null;

  const active = computed(() => current.value !== null && (current.value.status === 'queued' || current.value.status === 'running'));

  /**
   * The answer drawn on the workspace map, in the scenario editor's looks: the change it would
   * save (contraflow corridors, added lanes), or for a closure ranking the ten worst closures.
   * Departure orders and zone routes change no road: they are drawn by routeLines and windows below.
   */
  const mapOverlay = computed<ScenarioOverlay | null>(() => {
    const p = current.value;
    if (!p || p.status !== 'succeeded' || !p.result) return null;
    const answer = p.result.answer;
    if (answer.kind === 'closures') {
      const ids = [...new Set(answer.roads.slice(0, 10).map((r) => r.segmentId))];
      return { ...scenarioOverlaySchema.parse({}), closures: ids.map((segmentId) => ({ segmentId, fromMinutes: answer.closeAtMinutes, untilMinutes: null })) };
    }
    if (answer.kind === 'release-order' || answer.kind === 'zone-routes') return null;
    return p.result.overlay;
  });

  const answered = computed(() => (current.value?.status === 'succeeded' ? (current.value.result?.answer ?? null) : null));

  /** Where each zone goes, on the map: each zone's corridors in its colour. */
  const routeLines = computed<ZoneRouteLine[]>(() => (answered.value?.kind === 'zone-routes' ? zoneRouteLines(answered.value) : []));
  const routeLabels = computed(() => {
    const a = answered.value;
    if (a?.kind !== 'zone-routes') return [];
    return a.zones.map((z, i) => ({
      zoneId: z.zoneId,
      colour: zoneRouteColour(i),
      // Short, on two lines, as zones lie side by side: the main destination and how many others (the table lists them all).
      lines: z.shelters.length
        ? [`→ ${z.shelters[0]!.name}`, `${formatCount(z.shelters[0]!.vehicles)} vehicles${z.shelters.length > 1 ? `, +${z.shelters.length - 1} more` : ''}`]
        : ['no vehicles arrive'],
    }));
  });
  /** The quickest departure order, on the map: each zone's release window. */
  const windows = computed<ReleaseWindow[]>(() => (answered.value?.kind === 'release-order' ? releaseWindows(answered.value) : []));

  const zoneRoutesCsvUrl = computed(() => (answered.value?.kind === 'zone-routes' && current.value ? api.zoneRoutesCsvUrl(planId.value, current.value.id) : null));

  function stop() {
    if (timer) clearTimeout(timer);
    timer = null;
  }

  async function poll() {
    stop();
    const p = current.value;
    if (!p) return;
    try {
      current.value = await api.getProposal(p.planId, p.id);
    } catch (e) {
      error.value = messageOf(e);
    }
    if (active.value) timer = setTimeout(() => void poll(), 500);
  }

  function open(id: string) {
    stop();
    planId.value = id;
    current.value = null;
    saved.value = null;
    error.value = '';
  }

  async function start(body: ProposalRequest) {
    starting.value = true;
    error.value = '';
    saved.value = null;
    try {
      current.value = await api.startProposal(planId.value, body);
      if (active.value) timer = setTimeout(() => void poll(), 500);
    } catch (e) {
      error.value = messageOf(e);
    } finally {
      starting.value = false;
    }
  }

  async function cancel() {
    if (!current.value) return;
    try {
      current.value = await api.cancelProposal(planId.value, current.value.id);
      stop();
    } catch (e) {
      error.value = messageOf(e);
    }
  }

  /** Saves the answer as a scenario and starts a run of it; returns the new run's id. */
  async function saveAndRun(name: string, parameters: RunParameters, segmentId?: number): Promise<string | null> {
    if (!current.value) return null;
    error.value = '';
    try {
      saved.value = await api.saveProposal(planId.value, current.value.id, name, segmentId);
      // Through the runs store, so its one poll loop follows the new run.
      const run = await runs.startRun(planId.value, parameters, saved.value.id);
      return run.id;
    } catch (e) {
      error.value = messageOf(e);
      return null;
    }
  }

  return { planId, current, error, starting, saved, active, mapOverlay, routeLines, routeLabels, windows, zoneRoutesCsvUrl, open, start, cancel, saveAndRun, stop };
});

// The scenario editor's state: the stored scenario, the overlay being edited (a plain copy; the
// map and panels change it only through the pure edits in forms/scenario-overlay.ts), the plan's
// zones, shelters and road-layer extent, saving, and a run under the scenario (started, followed
// and kept by the runs store).
import { computed, ref, shallowRef } from 'vue';
import type { Scenario, ScenarioOverlay } from '@shared/api/scenarios';
import type { RoadLayer } from '@shared/api/road-layers';
import type { Shelter, Zone } from '@shared/api/zones-shelters';
import type { RunParameters, RunWithResult } from '@shared/api/runs';
import { getRoadLayer } from '@/api/road-layers';
import { listZones } from '@/api/zones';
import { listShelters } from '@/api/shelters';
import { ApiError } from '@/api/api-error';
import { emptyOverlay, validateOverlay } from '@/forms/scenario-overlay';
import type { FieldErrors } from '@/forms/zod-errors';
import { messageOf } from '@/format/error-message';
import { useRunsStore } from '@/stores/runs';
import { useScenariosStore } from '@/stores/scenarios';

export function useScenarioEditor(planId: () => string, scenarioId: () => string) {
  const runs = useRunsStore();
  const scenarios = useScenariosStore();
  const scenario = shallowRef<Scenario | null>(null);
  const name = ref('');
  const description = ref('');
  const overlay = ref<ScenarioOverlay>(emptyOverlay());
  const zones = ref<Zone[]>([]);
  const shelters = ref<Shelter[]>([]);
  const layer = shallowRef<RoadLayer | null>(null);
  const loading = ref(false);
  const saving = ref(false);
  const error = ref('');
  const overlayErrors = ref<FieldErrors>({});
  const runId = ref<string | null>(null);
  const run = computed<RunWithResult | null>(() => (runId.value ? (runs.details[runId.value] ?? null) : null));
  const runError = ref('');
  const starting = ref(false);

  const dirty = computed(() => {
    const s = scenario.value;
    return s !== null && (s.name !== name.value || s.description !== description.value || JSON.stringify(s.overlay) !== JSON.stringify(overlay.value));
  });

  function take(s: Scenario) {
    scenario.value = s;
    name.value = s.name;
    description.value = s.description;
    overlay.value = structuredClone(s.overlay);
  }

  async function load() {
    loading.value = true;
    error.value = '';
    try {
      runId.value = null;
      const [s, z, sh, l] = await Promise.all([scenarios.get(planId(), scenarioId()), listZones(planId()), listShelters(planId()), getRoadLayer(planId()), runs.refresh(planId())]);
      take(s);
      zones.value = z;
      shelters.value = sh;
      layer.value = l;
      // The latest run of this scenario, finished or working, is shown again.
      const latest = runs.runs.find((r) => r.scenarioId === s.id);
      if (latest) runId.value = (await runs.fetchRun(planId(), latest.id)).id;
    } catch (e) {
      error.value = messageOf(e);
    } finally {
      loading.value = false;
    }
  }

  /** Saves name, description and overlay; false (with the reasons shown) when they do not pass. */
  async function save(): Promise<boolean> {
    error.value = '';
    const checked = validateOverlay(overlay.value);
    if (!checked.ok) {
      overlayErrors.value = checked.errors;
      error.value = 'Some changes are not valid yet: see the marked fields.';
      return false;
    }
    if (!name.value.trim()) {
      error.value = 'Give the scenario a name.';
      return false;
    }
    overlayErrors.value = {};
    saving.value = true;
    try {
      take(await scenarios.update(planId(), scenarioId(), { name: name.value.trim(), description: description.value.trim(), overlay: checked.value }));
      return true;
    } catch (e) {
      if (e instanceof ApiError && e.fields.length) overlayErrors.value = Object.fromEntries(e.fields.map((f) => [f.path.replace(/^overlay\./, ''), f.message]));
      error.value = messageOf(e);
      return false;
    } finally {
      saving.value = false;
    }
  }

  /** Saves unsaved changes first, so that the run analyses what the map shows. */
  async function startRun(parameters: RunParameters) {
    runError.value = '';
    if (dirty.value && !(await save())) return;
    starting.value = true;
    try {
      runId.value = (await runs.startRun(planId(), parameters, scenarioId())).id;
    } catch (e) {
      runError.value = messageOf(e);
    } finally {
      starting.value = false;
    }
  }

  return { scenario, name, description, overlay, zones, shelters, layer, loading, saving, error, overlayErrors, dirty, run, runError, starting, load, save, startRun };
}

export type ScenarioEditor = ReturnType<typeof useScenarioEditor>;

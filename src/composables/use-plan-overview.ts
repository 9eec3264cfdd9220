// What the scenario, comparison and sweep pages share about a plan: its name, scenarios, runs
// and sweeps, loaded together. The runs come from the runs store, whose one poll loop looks at
// runs still queued or working; the scenarios and sweeps from their stores.
import { computed, shallowRef } from 'vue';
import { storeToRefs } from 'pinia';
import type { Plan } from '@shared/api/plans';
import { getPlan } from '@/api/plans';
import { useRunsStore } from '@/stores/runs';
import { useScenariosStore } from '@/stores/scenarios';
import { useSweepsStore } from '@/stores/sweeps';
import { messageOf } from '@/format/error-message';

export function usePlanOverview(planId: () => string) {
  const runsStore = useRunsStore();
  const scenariosStore = useScenariosStore();
  const sweepsStore = useSweepsStore();
  const plan = shallowRef<Plan | null>(null);
  const { runs, anyActive, finishedRuns } = storeToRefs(runsStore);
  const { scenarios } = storeToRefs(scenariosStore);
  const { sweeps } = storeToRefs(sweepsStore);
  const loading = shallowRef(false);
  const error = shallowRef('');

  async function load() {
    loading.value = true;
    error.value = '';
    try {
      const id = planId();
      const [p] = await Promise.all([getPlan(id), scenariosStore.load(id), runsStore.refresh(id), sweepsStore.load(id)]);
      plan.value = p;
    } catch (e) {
      error.value = messageOf(e);
    } finally {
      loading.value = false;
    }
  }

  const scenarioName = (scenarioId: string | null) => scenariosStore.nameOf(scenarioId);

  return { plan, scenarios, runs, sweeps, loading, error, anyActive: computed(() => anyActive.value), finishedRuns, load, scenarioName };
}

// What the scenario, comparison and sweep pages share about a plan: its name, scenarios, runs
// and sweeps, loaded together, with runs still queued or working looked at again every second.
import { computed, ref, shallowRef } from 'vue';
import type { Plan } from '@shared/api/plans';
import type { Run } from '@shared/api/runs';
import type { Scenario } from '@shared/api/scenarios';
import type { Sweep } from '@shared/api/sweeps';
import { getPlan } from '@/api/plans';
import { listRuns } from '@/api/runs';
import { listScenarios } from '@/api/scenarios';
import { listSweeps } from '@/api/sweeps';
import { runIsActive } from '@/format/run-result';
import { messageOf } from '@/format/error-message';
import { usePolling } from './use-polling';

export function usePlanOverview(planId: () => string) {
  const plan = shallowRef<Plan | null>(null);
  const scenarios = ref<Scenario[]>([]);
  const runs = ref<Run[]>([]);
  const sweeps = ref<Omit<Sweep, 'runs'>[]>([]);
  const loading = ref(false);
  const error = ref('');

  const anyActive = computed(() => runs.value.some((r) => runIsActive(r.status)));
  const finishedRuns = computed(() => runs.value.filter((r) => r.status === 'succeeded'));

  const poll = usePolling(async () => {
    runs.value = await listRuns(planId());
    return anyActive.value;
  }, 1000);

  async function load() {
    loading.value = true;
    error.value = '';
    try {
      const id = planId();
      const [p, s, r, b] = await Promise.all([getPlan(id), listScenarios(id), listRuns(id), listSweeps(id)]);
      plan.value = p;
      scenarios.value = s;
      runs.value = r;
      sweeps.value = b;
      if (anyActive.value) poll.start();
    } catch (e) {
      error.value = messageOf(e);
    } finally {
      loading.value = false;
    }
  }

  /** A run just queued: list it and follow it. */
  function track(run: Run) {
    runs.value = [run, ...runs.value.filter((r) => r.id !== run.id)];
    poll.start();
  }

  const scenarioName = (scenarioId: string | null) =>
    scenarioId === null ? 'Base plan' : (scenarios.value.find((s) => s.id === scenarioId)?.name ?? 'Deleted scenario');

  return { plan, scenarios, runs, sweeps, loading, error, anyActive, finishedRuns, load, track, scenarioName };
}

// The scenarios of the open plan: the list, and creating, reading, changing and deleting one.
// Runs under a scenario start in the runs store, which owns run state.
import { defineStore } from 'pinia';
import { ref } from 'vue';
import type { Scenario, ScenarioCreate } from '@shared/api/scenarios';
import * as scenariosApi from '@/api/scenarios';

export const useScenariosStore = defineStore('scenarios', () => {
  const planId = ref('');
  const scenarios = ref<Scenario[]>([]);

  function put(scenario: Scenario) {
    if (scenario.planId !== planId.value) return;
    scenarios.value = scenarios.value.some((s) => s.id === scenario.id)
      ? scenarios.value.map((s) => (s.id === scenario.id ? scenario : s))
      : [scenario, ...scenarios.value];
  }

  async function load(id: string) {
    if (planId.value !== id) scenarios.value = [];
    planId.value = id;
    const list = await scenariosApi.listScenarios(id);
    if (planId.value === id) scenarios.value = list;
    return list;
  }

  async function get(id: string, scenarioId: string) {
    const scenario = await scenariosApi.getScenario(id, scenarioId);
    put(scenario);
    return scenario;
  }

  async function create(id: string, input: ScenarioCreate) {
    const scenario = await scenariosApi.createScenario(id, input);
    put(scenario);
    return scenario;
  }

  async function update(id: string, scenarioId: string, change: scenariosApi.ScenarioChange) {
    const scenario = await scenariosApi.updateScenario(id, scenarioId, change);
    put(scenario);
    return scenario;
  }

  async function remove(id: string, scenarioId: string) {
    await scenariosApi.deleteScenario(id, scenarioId);
    if (planId.value === id) scenarios.value = scenarios.value.filter((s) => s.id !== scenarioId);
  }

  /** "Base plan" for no scenario, the scenario's name, or "Deleted scenario". */
  const nameOf = (scenarioId: string | null) =>
    scenarioId === null ? 'Base plan' : (scenarios.value.find((s) => s.id === scenarioId)?.name ?? 'Deleted scenario');

  return { planId, scenarios, load, get, create, update, remove, nameOf };
});

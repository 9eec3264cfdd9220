// The plans of the current organization.
import { defineStore } from 'pinia';
import { ref } from 'vue';
import type { Plan, PlanCreate } from '@shared/api/plans';
import * as plansApi from '@/api/plans';

export const usePlansStore = defineStore('plans', () => {
  const plans = ref<Plan[]>([]);
  const loading = ref(false);
  const error = ref('');

  async function load() {
    loading.value = true;
    error.value = '';
    try {
      plans.value = await plansApi.listPlans();
    } catch (e) {
      error.value = e instanceof Error ? e.message : String(e);
    } finally {
      loading.value = false;
    }
  }

  async function create(input: PlanCreate): Promise<Plan> {
    const plan = await plansApi.createPlan(input);
    plans.value = [plan, ...plans.value];
    return plan;
  }

  return { plans, loading, error, load, create };
});

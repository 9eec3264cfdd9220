// The sweeps of the open plan: the list, and starting one. A sweep's runs are runs of the plan:
// the runs store follows an open sweep in its one poll loop (followSweep) and keeps it.
import { defineStore } from 'pinia';
import { ref } from 'vue';
import type { Sweep, SweepCreate } from '@shared/api/sweeps';
import * as sweepsApi from '@/api/sweeps';
import { useRunsStore } from './runs';

export type SweepSummary = Omit<Sweep, 'runs'>;

export const useSweepsStore = defineStore('sweeps', () => {
  const runs = useRunsStore();
  const planId = ref('');
  const sweeps = ref<SweepSummary[]>([]);

  async function load(id: string) {
    if (planId.value !== id) sweeps.value = [];
    planId.value = id;
    const list = await sweepsApi.listSweeps(id);
    if (planId.value === id) sweeps.value = list;
    return list;
  }

  /** Queues the sweep's runs on the server and follows them. */
  async function start(id: string, input: SweepCreate): Promise<Sweep> {
    const sweep = await sweepsApi.startSweep(id, input);
    if (planId.value === id) {
      const { runs: _runs, ...summary } = sweep;
      sweeps.value = [summary, ...sweeps.value.filter((s) => s.id !== sweep.id)];
    }
    void runs.followSweep(id, sweep.id).catch(() => undefined);
    return sweep;
  }

  /** One sweep with its runs, followed by the runs store until every run has ended. */
  const open = (id: string, sweepId: string) => runs.followSweep(id, sweepId);
  const close = (sweepId: string) => runs.unfollowSweep(sweepId);
  /** The kept copy of a followed sweep (with its runs as last seen), or null. */
  const sweep = (sweepId: string): Sweep | null => runs.sweeps[sweepId] ?? null;

  return { planId, sweeps, load, start, open, close, sweep };
});

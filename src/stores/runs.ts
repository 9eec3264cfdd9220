// Analysis runs of the open plan, owned in one place: the plan's list of runs, the runs read in
// full (with their results; a finished run never changes, so it is kept), starting a run (of the
// plan or under a scenario), cancelling one, and ONE poll loop for the plan that looks, every half
// second while anything works, at the list, at each run followed in full and at each sweep
// followed. The workspace's assumptions form and its shown run live here too; a shown run started
// before the plan's data changed is flagged as out of date.
import { defineStore } from 'pinia';
import { computed, ref, shallowRef } from 'vue';
import type { Run, RunParameters, RunWithResult } from '@shared/api/runs';
import type { Sweep } from '@shared/api/sweeps';
import * as runsApi from '@/api/runs';
import { getSweep } from '@/api/sweeps';
import { ApiError } from '@/api/api-error';
import { defaultParameterValues, validateRunParameters, type RunParameterValues } from '@/forms/run-parameters';
import type { FieldErrors } from '@/forms/zod-errors';
import { runIsActive } from '@/format/run-result';
import { sweepProgress } from '@/format/sweep';
import { messageOf } from '../format/error-message';

export const pollIntervalMs = 500;
export type { RunExport } from '@/api/runs';

// The API's catch-all answers "No API route …" for a path it does not serve at all.
const isMissingRoute = (e: unknown) => e instanceof ApiError && e.status === 404 && e.message.startsWith('No API route');

function stripResult(run: RunWithResult): Run {
  const { result: _result, ...rest } = run;
  return rest;
}

/** The list with `run` put in its place (or first, when it is new). */
function upsert(list: Run[], run: Run): Run[] {
  return list.some((r) => r.id === run.id) ? list.map((r) => (r.id === run.id ? run : r)) : [run, ...list];
}

export const useRunsStore = defineStore('runs', () => {
  const planId = ref('');
  const runs = ref<Run[]>([]);
  // Runs read in full, by id; plain objects replaced whole, so a shallow ref is enough.
  const details = shallowRef<Record<string, RunWithResult>>({});
  const sweeps = shallowRef<Record<string, Sweep>>({});
  const listLoaded = ref(false);
  const error = ref('');
  // False when the server has no run endpoints (yet): the findings say so instead of failing.
  const available = ref(true);

  // The workspace: its assumptions form and the run it shows.
  const parameters = ref<RunParameterValues>(defaultParameterValues());
  const parameterErrors = ref<FieldErrors>({});
  const currentId = ref<string | null>(null);
  const starting = ref(false);
  const dataChanged = ref(false);

  const followedRuns = new Set<string>();
  const followedSweeps = new Set<string>();
  let timer: ReturnType<typeof setTimeout> | null = null;
  let inFlight: AbortController | null = null;

  const current = computed(() => (currentId.value ? (details.value[currentId.value] ?? null) : null));
  const active = computed(() => current.value !== null && runIsActive(current.value.status));
  const result = computed(() => (current.value?.status === 'succeeded' ? current.value.result : null));
  const finishedRuns = computed(() => runs.value.filter((r) => r.status === 'succeeded'));
  const anyActive = computed(() => runs.value.some((r) => runIsActive(r.status)));

  function keep(run: RunWithResult) {
    details.value = { ...details.value, [run.id]: run };
    runs.value = upsert(runs.value, stripResult(run));
  }

  function keepSweep(sweep: Sweep) {
    sweeps.value = { ...sweeps.value, [sweep.id]: sweep };
    let list = runs.value;
    for (const r of sweep.runs) {
      const { sweepValue: _value, headline: _headline, ...run } = r;
      list = upsert(list, run);
    }
    runs.value = list;
  }

  // ---- the one poll loop ----

  /** What the next look has to ask for; nothing when all is finished. */
  function pending() {
    const runIds = [...followedRuns].filter((id) => {
      const d = details.value[id];
      return d === undefined || runIsActive(d.status);
    });
    const sweepIds = [...followedSweeps].filter((id) => {
      const s = sweeps.value[id];
      return s === undefined || !sweepProgress(s).done;
    });
    const inSweeps = new Set(sweepIds.flatMap((id) => sweeps.value[id]?.runs.map((r) => r.id) ?? []));
    const list = runs.value.some((r) => runIsActive(r.status) && !followedRuns.has(r.id) && !inSweeps.has(r.id));
    return { runIds, sweepIds, list, any: runIds.length > 0 || sweepIds.length > 0 || list };
  }

  function stopPolling() {
    if (timer) clearTimeout(timer);
    timer = null;
    inFlight?.abort();
    inFlight = null;
  }

  /** Starts the loop if something works and it is not already going. */
  function poll() {
    if (timer || inFlight || !pending().any) return;
    timer = setTimeout(() => void look(), pollIntervalMs);
  }

  async function look() {
    timer = null;
    const id = planId.value;
    const wanted = pending();
    if (!wanted.any) return;
    const controller = new AbortController();
    inFlight = controller;
    try {
      const [list, fresh, freshSweeps] = await Promise.all([
        wanted.list ? runsApi.listRuns(id, controller.signal) : null,
        Promise.all(wanted.runIds.map((runId) => runsApi.getRun(id, runId, controller.signal))),
        Promise.all(wanted.sweepIds.map((sweepId) => getSweep(id, sweepId, controller.signal))),
      ]);
      if (controller.signal.aborted || planId.value !== id) return;
      if (list) runs.value = list;
      fresh.forEach(keep);
      freshSweeps.forEach(keepSweep);
      // A failed run says why in its own failureReason; the findings show it once.
      error.value = '';
    } catch (e) {
      if (controller.signal.aborted) return;
      // A dropped look is retried; the runs go on on the server either way.
      error.value = `Lost track of the analysis for a moment: ${messageOf(e)}`;
    } finally {
      if (inFlight === controller) inFlight = null;
    }
    if (planId.value === id) poll();
  }

  // ---- the plan and its runs ----

  /** Makes `id` the plan whose runs are kept; a different plan starts from nothing. */
  function usePlan(id: string) {
    if (planId.value === id) return;
    stopPolling();
    followedRuns.clear();
    followedSweeps.clear();
    planId.value = id;
    runs.value = [];
    details.value = {};
    sweeps.value = {};
    listLoaded.value = false;
    currentId.value = null;
    dataChanged.value = false;
    error.value = '';
  }

  /** The plan's runs, read again; runs still working are then looked at by the loop. */
  async function refresh(id: string) {
    usePlan(id);
    try {
      const list = await runsApi.listRuns(id);
      if (planId.value !== id) return;
      runs.value = list;
      listLoaded.value = true;
      available.value = true;
    } catch (e) {
      if (isMissingRoute(e)) available.value = false;
      throw e;
    }
    poll();
  }

  /** One run in full (from the kept copy when it has finished); followed while it works. */
  async function fetchRun(id: string, runId: string): Promise<RunWithResult> {
    usePlan(id);
    const kept = details.value[runId];
    if (kept && !runIsActive(kept.status)) return kept;
    const run = await runsApi.getRun(id, runId);
    if (planId.value === id) {
      keep(run);
      if (runIsActive(run.status)) follow(runId);
    }
    return run;
  }

  /** Looks at this run in full on every turn of the loop until it ends. */
  function follow(runId: string) {
    followedRuns.add(runId);
    poll();
  }

  /** Looks at this sweep (and so its runs) on every turn of the loop until all its runs end. */
  async function followSweep(id: string, sweepId: string): Promise<Sweep> {
    usePlan(id);
    const sweep = await getSweep(id, sweepId);
    if (planId.value === id) {
      keepSweep(sweep);
      followedSweeps.add(sweepId);
      poll();
    }
    return sweep;
  }

  function unfollowSweep(sweepId: string) {
    followedSweeps.delete(sweepId);
  }

  /** The one way a run starts: queued on the server, listed, and followed until it ends. */
  async function startRun(id: string, runParameters: RunParameters, scenarioId: string | null = null): Promise<Run> {
    usePlan(id);
    const run = await runsApi.startRun(id, runParameters, scenarioId);
    if (planId.value !== id) return run;
    runs.value = upsert(runs.value, run);
    details.value = { ...details.value, [run.id]: { ...run, result: null } };
    followedRuns.add(run.id);
    if (runIsActive(run.status)) poll();
    else keep(await runsApi.getRun(id, run.id));
    return run;
  }

  async function cancelRun(id: string, runId: string) {
    const cancelled = await runsApi.cancelRun(id, runId);
    if (planId.value !== id) return;
    details.value = { ...details.value, [runId]: { ...cancelled, result: null } };
    runs.value = upsert(runs.value, cancelled);
    // The server may still be finishing the step it was in; the loop's next look settles it.
    followedRuns.add(runId);
    poll();
  }

  /** A plain link to one of a run's files: the browser downloads it with the session cookie. */
  const exportUrl = (id: string, runId: string, file: runsApi.RunExport) => runsApi.runExportUrl(id, runId, file);

  // ---- the workspace ----

  /** Opens a plan in the workspace: its latest run (finished or still working) is shown. */
  async function load(id: string) {
    usePlan(id);
    currentId.value = null;
    dataChanged.value = false;
    error.value = '';
    try {
      await refresh(id);
    } catch (e) {
      if (!isMissingRoute(e)) error.value = messageOf(e);
      return;
    }
    const latest = runs.value.find((r) => r.status === 'succeeded' || runIsActive(r.status));
    if (latest) await select(latest.id);
  }

  async function select(runId: string) {
    try {
      const run = await fetchRun(planId.value, runId);
      currentId.value = run.id;
      parameters.value = { ...run.parameters };
    } catch (e) {
      error.value = messageOf(e);
    }
  }

  /** The workspace's run button: the assumptions checked, then a run of the plan. */
  async function start(): Promise<boolean> {
    error.value = '';
    const checked = validateRunParameters(parameters.value);
    if (!checked.ok) {
      parameterErrors.value = checked.errors;
      return false;
    }
    parameterErrors.value = {};
    starting.value = true;
    try {
      const run = await startRun(planId.value, checked.value);
      currentId.value = run.id;
      dataChanged.value = false;
      return true;
    } catch (e) {
      if (isMissingRoute(e)) available.value = false;
      if (e instanceof ApiError && e.fields.length > 0) {
        parameterErrors.value = Object.fromEntries(e.fields.map((f) => [f.path.replace(/^parameters\./, ''), f.message]));
      }
      error.value = messageOf(e);
      return false;
    } finally {
      starting.value = false;
    }
  }

  async function cancel() {
    const run = current.value;
    if (!run || !runIsActive(run.status)) return;
    try {
      await cancelRun(run.planId, run.id);
    } catch (e) {
      error.value = messageOf(e);
    }
  }

  /** Roads, zones or shelters were edited: the shown result no longer matches the data. */
  function markDataChanged() {
    if (current.value) dataChanged.value = true;
  }

  function resetParameters() {
    parameters.value = defaultParameterValues();
    parameterErrors.value = {};
  }

  return {
    planId,
    runs,
    details,
    sweeps,
    listLoaded,
    error,
    available,
    parameters,
    parameterErrors,
    currentId,
    starting,
    dataChanged,
    current,
    active,
    result,
    finishedRuns,
    anyActive,
    refresh,
    fetchRun,
    follow,
    followSweep,
    unfollowSweep,
    startRun,
    cancelRun,
    exportUrl,
    load,
    select,
    start,
    cancel,
    stopPolling,
    markDataChanged,
    resetParameters,
  };
});

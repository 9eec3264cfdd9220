// Analysis runs of the open plan: the assumptions form, starting a run, polling its progress
// every half second until it ends, and the result shown in the findings. A run started before
// the plan's data changed is flagged as out of date.
import { defineStore } from 'pinia';
import { computed, ref } from 'vue';
import type { Run, RunWithResult } from '@shared/api/runs';
import * as runsApi from '@/api/runs';
import { ApiError } from '@/api/api-error';
import { defaultParameterValues, validateRunParameters, type RunParameterValues } from '@/forms/run-parameters';
import type { FieldErrors } from '@/forms/zod-errors';
import { runIsActive } from '@/format/run-result';
import { messageOf } from '../format/error-message';

export const pollIntervalMs = 500;

// The API's catch-all answers "No API route …" for a path it does not serve at all.
const isMissingRoute = (e: unknown) => e instanceof ApiError && e.status === 404 && e.message.startsWith('No API route');

export const useRunsStore = defineStore('runs', () => {
  const planId = ref('');
  const parameters = ref<RunParameterValues>(defaultParameterValues());
  const parameterErrors = ref<FieldErrors>({});
  const runs = ref<Run[]>([]);
  const current = ref<RunWithResult | null>(null);
  const starting = ref(false);
  const error = ref('');
  // False when the server has no run endpoints (yet): the findings say so instead of failing.
  const available = ref(true);
  const dataChanged = ref(false);

  let pollTimer: ReturnType<typeof setTimeout> | null = null;
  let pollAbort: AbortController | null = null;

  const active = computed(() => current.value !== null && runIsActive(current.value.status));
  const result = computed(() => (current.value?.status === 'succeeded' ? current.value.result : null));

  function stopPolling() {
    if (pollTimer) clearTimeout(pollTimer);
    pollTimer = null;
    pollAbort?.abort();
    pollAbort = null;
  }

  function schedulePoll() {
    stopPolling();
    pollTimer = setTimeout(() => void pollOnce(), pollIntervalMs);
  }

  async function pollOnce() {
    const run = current.value;
    if (!run) return;
    const controller = new AbortController();
    pollAbort = controller;
    try {
      const next = await runsApi.getRun(run.planId, run.id, controller.signal);
      if (controller.signal.aborted || current.value?.id !== run.id) return;
      current.value = next;
      if (runIsActive(next.status)) schedulePoll();
      else {
        // A failed run says why in its own failureReason; the findings show it once.
        runs.value = runs.value.map((r) => (r.id === next.id ? stripResult(next) : r));
        error.value = '';
      }
    } catch (e) {
      if (controller.signal.aborted) return;
      // A dropped poll is retried; the run goes on on the server either way.
      error.value = `Lost track of the analysis for a moment: ${messageOf(e)}`;
      schedulePoll();
    }
  }

  function stripResult(run: RunWithResult): Run {
    const { result: _result, ...rest } = run;
    return rest;
  }

  /** Opens a plan: its latest run (finished or still working) becomes the current one. */
  async function load(id: string) {
    stopPolling();
    planId.value = id;
    current.value = null;
    runs.value = [];
    error.value = '';
    dataChanged.value = false;
    try {
      runs.value = await runsApi.listRuns(id);
      available.value = true;
    } catch (e) {
      if (isMissingRoute(e)) {
        available.value = false;
        return;
      }
      error.value = messageOf(e);
      return;
    }
    const latest = runs.value.find((r) => r.status === 'succeeded' || runIsActive(r.status));
    if (latest) await select(latest.id);
  }

  async function select(runId: string) {
    stopPolling();
    try {
      current.value = await runsApi.getRun(planId.value, runId);
      parameters.value = { ...current.value.parameters };
      if (runIsActive(current.value.status)) schedulePoll();
    } catch (e) {
      error.value = messageOf(e);
    }
  }

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
      const run = await runsApi.startRun(planId.value, checked.value);
      runs.value = [run, ...runs.value];
      current.value = { ...run, result: null };
      dataChanged.value = false;
      if (runIsActive(run.status)) schedulePoll();
      else await pollOnce();
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
      const cancelled = await runsApi.cancelRun(run.planId, run.id);
      current.value = { ...cancelled, result: null };
      stopPolling();
      // The server may still be finishing the step it was in; one more look settles it.
      schedulePoll();
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
    parameters,
    parameterErrors,
    runs,
    current,
    starting,
    error,
    available,
    dataChanged,
    active,
    result,
    load,
    select,
    start,
    cancel,
    stopPolling,
    markDataChanged,
    resetParameters,
  };
});

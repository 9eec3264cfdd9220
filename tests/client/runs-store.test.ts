// The runs store: start with validated assumptions, poll every half second until the run ends,
// keep polling through a dropped answer, say when the server has no run endpoints, and flag a
// shown result once the data changes.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import type { Run, RunWithResult } from '../../shared/api/runs';
import { ApiError } from '../../src/api/http';

vi.mock('../../src/api/runs', () => ({
  startRun: vi.fn(),
  listRuns: vi.fn(),
  getRun: vi.fn(),
  cancelRun: vi.fn(),
  runExportUrl: vi.fn(),
}));
const runsApi = await import('../../src/api/runs');
const { useRunsStore, pollIntervalMs } = await import('../../src/stores/runs');

const planId = '00000000-0000-4000-8000-00000000000a';
const runId = '00000000-0000-4000-8000-00000000000b';

function run(status: Run['status'], progress = 0): RunWithResult {
  return {
    id: runId,
    planId,
    scenarioId: null,
    status,
    phase: status === 'running' ? 'solving' : status,
    progress,
    parameters: { horizonMinutes: 360, timeStepSeconds: 60, capacityFactor: 1, algorithm: 'auto' },
    dataVersion: 1,
    failureReason: status === 'failed' ? 'No zone reaches a shelter.' : null,
    createdBy: null,
    createdAt: '2026-12-01T00:00:00.000Z',
    startedAt: null,
    finishedAt: null,
    result: null,
  };
}

beforeEach(() => {
  setActivePinia(createPinia());
  vi.useFakeTimers();
  vi.mocked(runsApi.listRuns).mockResolvedValue([]);
});
afterEach(() => {
  vi.useRealTimers();
  vi.clearAllMocks();
});

describe('runs store', () => {
  it('does not start with invalid assumptions, and says which field is wrong', async () => {
    const store = useRunsStore();
    await store.load(planId);
    store.parameters.horizonMinutes = '5';
    expect(await store.start()).toBe(false);
    expect(store.parameterErrors.horizonMinutes).toBe('At least 10 minutes.');
    expect(runsApi.startRun).not.toHaveBeenCalled();
  });

  it('starts a run and polls every half second until it has finished', async () => {
    const store = useRunsStore();
    await store.load(planId);
    vi.mocked(runsApi.startRun).mockResolvedValue(run('queued'));
    vi.mocked(runsApi.getRun)
      .mockResolvedValueOnce(run('running', 0.3))
      .mockResolvedValueOnce(run('running', 0.8))
      .mockResolvedValueOnce({ ...run('succeeded', 1) });
    expect(await store.start()).toBe(true);
    expect(runsApi.startRun).toHaveBeenCalledWith(planId, { horizonMinutes: 360, timeStepSeconds: 60, capacityFactor: 1, algorithm: 'auto' });
    expect(store.active).toBe(true);
    await vi.advanceTimersByTimeAsync(pollIntervalMs);
    expect(store.current?.progress).toBe(0.3);
    await vi.advanceTimersByTimeAsync(pollIntervalMs);
    expect(store.current?.progress).toBe(0.8);
    await vi.advanceTimersByTimeAsync(pollIntervalMs);
    expect(store.current?.status).toBe('succeeded');
    expect(store.active).toBe(false);
    await vi.advanceTimersByTimeAsync(pollIntervalMs * 4);
    expect(runsApi.getRun).toHaveBeenCalledTimes(3);
  });

  it('keeps polling after a dropped answer and shows why a run failed', async () => {
    const store = useRunsStore();
    await store.load(planId);
    vi.mocked(runsApi.startRun).mockResolvedValue(run('queued'));
    vi.mocked(runsApi.getRun).mockRejectedValueOnce(new ApiError(0, 'internal', 'The server cannot be reached.')).mockResolvedValueOnce(run('failed'));
    await store.start();
    await vi.advanceTimersByTimeAsync(pollIntervalMs);
    expect(store.error).toContain('cannot be reached');
    await vi.advanceTimersByTimeAsync(pollIntervalMs);
    expect(store.current?.status).toBe('failed');
    expect(store.current?.failureReason).toBe('No zone reaches a shelter.');
    expect(store.error).toBe('');
  });

  it('opens a plan on its latest finished run and resumes polling an active one', async () => {
    vi.mocked(runsApi.listRuns).mockResolvedValue([run('running', 0.5)]);
    vi.mocked(runsApi.getRun).mockResolvedValueOnce(run('running', 0.5)).mockResolvedValueOnce(run('succeeded', 1));
    const store = useRunsStore();
    await store.load(planId);
    expect(store.active).toBe(true);
    await vi.advanceTimersByTimeAsync(pollIntervalMs);
    expect(store.current?.status).toBe('succeeded');
  });

  it('says so when the server has no run endpoints', async () => {
    vi.mocked(runsApi.listRuns).mockRejectedValue(new ApiError(404, 'not_found', 'No API route GET /api/plans/x/runs.'));
    const store = useRunsStore();
    await store.load(planId);
    expect(store.available).toBe(false);
    expect(store.error).toBe('');
  });

  it('marks the shown result out of date after an edit, and clears that on the next run', async () => {
    vi.mocked(runsApi.listRuns).mockResolvedValue([run('succeeded', 1)]);
    vi.mocked(runsApi.getRun).mockResolvedValue(run('succeeded', 1));
    const store = useRunsStore();
    await store.load(planId);
    store.markDataChanged();
    expect(store.dataChanged).toBe(true);
    vi.mocked(runsApi.startRun).mockResolvedValue(run('queued'));
    await store.start();
    expect(store.dataChanged).toBe(false);
    store.stopPolling();
  });

  it('stops polling when asked (leaving the workspace)', async () => {
    const store = useRunsStore();
    await store.load(planId);
    vi.mocked(runsApi.startRun).mockResolvedValue(run('queued'));
    vi.mocked(runsApi.getRun).mockResolvedValue(run('running', 0.1));
    await store.start();
    store.stopPolling();
    await vi.advanceTimersByTimeAsync(pollIntervalMs * 5);
    expect(runsApi.getRun).not.toHaveBeenCalled();
  });
});

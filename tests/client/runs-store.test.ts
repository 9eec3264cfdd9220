// The runs store: start with validated assumptions, poll every half second until the run ends,
// keep polling through a dropped answer, say when the server has no run endpoints, and flag a
// shown result once the data changes. One poll loop serves every run and sweep of the plan.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import type { Run, RunWithResult } from '../../shared/api/runs';
import { ApiError } from '../../src/api/http';

vi.mock('../../src/api/sweeps', () => ({ getSweep: vi.fn(), listSweeps: vi.fn(), startSweep: vi.fn() }));
vi.mock('../../src/api/runs', () => ({
  startRun: vi.fn(),
  listRuns: vi.fn(),
  getRun: vi.fn(),
  cancelRun: vi.fn(),
  runExportUrl: vi.fn(),
}));
const runsApi = await import('../../src/api/runs');
const sweepsApi = await import('../../src/api/sweeps');
const { useRunsStore, pollIntervalMs } = await import('../../src/stores/runs');

const planId = '00000000-0000-4000-8000-00000000000a';
const runId = '00000000-0000-4000-8000-00000000000b';

function run(status: Run['status'], progress = 0, id = runId): RunWithResult {
  return {
    id,
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

function withoutResult(r: RunWithResult): Run {
  const { result: _result, ...rest } = r;
  return rest;
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
    expect(runsApi.startRun).toHaveBeenCalledWith(planId, { horizonMinutes: 360, timeStepSeconds: 60, capacityFactor: 1, algorithm: 'auto' }, null);
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

  it('follows every run of the plan in one loop: one look per interval, not one per run', async () => {
    const other = '00000000-0000-4000-8000-00000000000c';
    const listed = '00000000-0000-4000-8000-00000000000d';
    const listedRun = withoutResult(run('queued', 0, listed));
    vi.mocked(runsApi.listRuns).mockResolvedValue([listedRun]);
    const store = useRunsStore();
    await store.refresh(planId);
    vi.mocked(runsApi.startRun).mockResolvedValueOnce(run('queued')).mockResolvedValueOnce(run('queued', 0, other));
    vi.mocked(runsApi.getRun).mockImplementation(async (_p, id) => run('running', 0.5, id));
    await store.startRun(planId, { horizonMinutes: 360, timeStepSeconds: 60, capacityFactor: 1, algorithm: 'auto' });
    await store.startRun(planId, { horizonMinutes: 360, timeStepSeconds: 60, capacityFactor: 1, algorithm: 'auto' }, 'scenario');
    vi.mocked(runsApi.listRuns).mockClear();
    await vi.advanceTimersByTimeAsync(pollIntervalMs);
    // One look: both started runs read in full, and the list once for the run only listed.
    expect(runsApi.getRun).toHaveBeenCalledTimes(2);
    expect(runsApi.listRuns).toHaveBeenCalledTimes(1);
    expect(store.details[other]?.progress).toBe(0.5);
    expect(store.runs.map((r) => r.id).sort()).toEqual([listed, other, runId].sort());
    // Everything ends: the loop stops by itself.
    vi.mocked(runsApi.getRun).mockImplementation(async (_p, id) => run('succeeded', 1, id));
    vi.mocked(runsApi.listRuns).mockResolvedValue([{ ...listedRun, status: 'succeeded', progress: 1 }]);
    await vi.advanceTimersByTimeAsync(pollIntervalMs);
    expect(store.anyActive).toBe(false);
    const calls = vi.mocked(runsApi.getRun).mock.calls.length + vi.mocked(runsApi.listRuns).mock.calls.length;
    await vi.advanceTimersByTimeAsync(pollIntervalMs * 5);
    expect(vi.mocked(runsApi.getRun).mock.calls.length + vi.mocked(runsApi.listRuns).mock.calls.length).toBe(calls);
  });

  it('follows an open sweep in the same loop until all its runs end, and keeps a finished run it read', async () => {
    const sweepId = '00000000-0000-4000-8000-0000000000e1';
    const headline = null;
    const sweep = (status: Run['status']) => ({
      id: sweepId,
      planId,
      name: 'Participation sweep',
      scenarioId: null,
      parameter: 'participationRate' as const,
      values: [0.5],
      createdAt: '2026-12-01T00:00:00.000Z',
      runs: [{ ...withoutResult(run(status, status === 'succeeded' ? 1 : 0.2)), sweepValue: 0.5, headline }],
    });
    vi.mocked(sweepsApi.getSweep).mockResolvedValueOnce(sweep('running') as never).mockResolvedValueOnce(sweep('succeeded') as never);
    const store = useRunsStore();
    await store.refresh(planId);
    await store.followSweep(planId, sweepId);
    expect(store.anyActive).toBe(true);
    await vi.advanceTimersByTimeAsync(pollIntervalMs);
    expect(store.sweeps[sweepId]?.runs[0]?.status).toBe('succeeded');
    expect(store.runs[0]?.status).toBe('succeeded');
    await vi.advanceTimersByTimeAsync(pollIntervalMs * 4);
    expect(sweepsApi.getSweep).toHaveBeenCalledTimes(2);
    // A finished run read once is kept: reading it again asks the server nothing.
    vi.mocked(runsApi.getRun).mockResolvedValue(run('succeeded', 1));
    await store.fetchRun(planId, runId);
    await store.fetchRun(planId, runId);
    expect(runsApi.getRun).toHaveBeenCalledTimes(1);
  });
});

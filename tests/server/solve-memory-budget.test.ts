// The run's memory budget counts typed arrays. A worker's resourceLimits bound only the V8 heap,
// and the engine keeps its time-expanded road graph in typed arrays outside it: a 40-junction
// chain over 3,000 steps holds about 27 MB of them with a heap of about 10 MB, and finished
// under a 16 MB heap limit. Now the solver thread adds the two and stops the run past the budget.
import { describe, expect, it } from 'vitest';
import { solveInWorker, SolveFailure } from '../../server/run-execution/solve-in-worker';
import type { EvacuationProblem } from '../../shared/flow';

function chain(horizonSteps: number): EvacuationProblem {
  const nodeCount = 40;
  const roads = Array.from({ length: nodeCount - 1 }, (_, i) => ({ from: i, to: i + 1, capacityVehPerHour: 1800, travelTimeSeconds: 60 }));
  return {
    nodeCount,
    timeStepSeconds: 60,
    horizonSteps,
    roads,
    zones: [{ id: 'upstream', entryNodes: [0], vehicles: 1_000_000 }],
    shelters: [{ id: 'downstream', node: nodeCount - 1, capacityVehicles: null }],
  };
}

const solve = (horizonSteps: number, memoryMegabytes: number) =>
  solveInWorker({ problem: chain(horizonSteps), options: { algorithm: 'auto' } }, { timeSeconds: 120, memoryMegabytes }, () => {}).done;

describe('the solver thread’s memory budget', () => {
  it('stops a run whose typed arrays pass the budget, saying so', async () => {
    const failure = await solve(3000, 20).then(
      () => null,
      (e: unknown) => e,
    );
    expect(failure).toBeInstanceOf(SolveFailure);
    expect((failure as SolveFailure).kind).toBe('budget');
    expect((failure as SolveFailure).message).toMatch(/^The analysis needed more than its memory budget of 20 MB \((2[0-9]|[3-9][0-9]) MB in use, road graphs included\) and was stopped\./);
  }, 120_000);

  it('lets a small run under the same budget finish', async () => {
    const done = await solve(60, 20);
    expect(done.result.curve.deliveredVehiclesByStep.length).toBe(61);
  }, 120_000);
});

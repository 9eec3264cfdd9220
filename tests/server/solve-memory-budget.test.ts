// The run's memory budget counts typed arrays. A worker's resourceLimits bound only the V8 heap,
// and the engine keeps its time-expanded road graph in typed arrays outside it. The implicit
// network holds about 10 bytes per expanded arc and 22 per node copy, so a 40-junction chain over
// 20,000 steps (1.6 million arcs, 0.8 million node copies) holds about 34 MB of them beside a heap
// of about 10 MB: far past a 20 MB budget whichever check sees it first. (Over 3,000 steps, as
// this test once used, the implicit network stays near 20 MB and the run could finish first.)
// The solver thread adds heap and typed arrays and stops the run past the budget.
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
    const failure = await solve(20_000, 20).then(
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

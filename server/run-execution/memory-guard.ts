// The solver thread's own watch on its memory. A worker's resourceLimits bound only the V8
// heap (maxOldGenerationSizeMb); typed arrays, which hold the engine's graphs, live outside it
// (ArrayBuffer backing stores count as "external" memory), so a run could take gigabytes under
// a budget of a few hundred megabytes. The guard adds the heap in use and the thread's external
// memory (process.memoryUsage() reports both per thread) and says when the sum passes the
// budget. The engine asks it between steps (shouldAbort, at least every augmenting round) and at
// each progress report, so a run overshoots by at most what one step allocates.
export class MemoryBudgetExceeded extends Error {
  constructor(
    readonly usedBytes: number,
    readonly budgetBytes: number,
  ) {
    super(`memory in use ${usedBytes} bytes passed the budget of ${budgetBytes} bytes`);
  }
}

export type MemoryGuard = {
  /** True once the budget is passed (then always); reads the memory at most every `intervalMs`. */
  exceeded: () => boolean;
  /** Throws MemoryBudgetExceeded once the budget is passed. */
  check: () => void;
  /** The most memory seen, heap and external together. */
  peakBytes: () => number;
};

export function createMemoryGuard(budgetMegabytes: number, intervalMs = 10, now: () => number = () => performance.now()): MemoryGuard {
  const budgetBytes = budgetMegabytes * 1024 * 1024;
  let lastReadAt = -Infinity;
  let peak = 0;
  let over: MemoryBudgetExceeded | null = null;

  const exceeded = (): boolean => {
    if (over) return true;
    const t = now();
    if (t - lastReadAt < intervalMs) return false;
    lastReadAt = t;
    const { heapUsed, external } = process.memoryUsage();
    const used = heapUsed + external;
    peak = Math.max(peak, used);
    if (used > budgetBytes) over = new MemoryBudgetExceeded(used, budgetBytes);
    return over !== null;
  };

  return {
    exceeded,
    check: () => {
      if (exceeded()) throw over!;
    },
    peakBytes: () => peak,
  };
}

// Briefing PDFs are laid out in a worker thread with a time and a memory budget, so a county's
// briefing (tens of thousands of map lines) never holds up the process's requests, and a render
// that runs away is stopped with a reason instead of taking the process down. The threads are
// warm threads of a budgeted pool (server/budgeted-pool.ts). Everything the render reads comes in
// its input or from the installed packages (pdfmake's fonts): any machine running the code can
// render.
import { budgetedPool, PoolTaskFailed, type BudgetedPool } from '../../budgeted-pool';
import type { BriefingInput } from './briefing-input';

export type RenderBudget = { seconds: number; megabytes: number };
export const defaultRenderBudget: RenderBudget = { seconds: 120, megabytes: 1024 };

export class RenderFailure extends Error {}

// One small pool per memory budget (a thread's heap limit is set when it starts). One thread is
// kept warm: loading the renderer (pdfmake, fonts, the page code) takes seconds, which a planner
// should not wait for at each briefing. Renders beyond two at once wait their turn.
const pools = new Map<number, BudgetedPool<BriefingInput, Uint8Array>>();
function poolFor(megabytes: number): BudgetedPool<BriefingInput, Uint8Array> {
  let pool = pools.get(megabytes);
  if (!pool) {
    pool = budgetedPool<BriefingInput, Uint8Array>({
      task: new URL('./render-worker.ts', import.meta.url),
      threads: 2,
      queue: 1_000,
      keepWarm: 1,
      memoryMegabytes: megabytes,
      youngMegabytes: Math.min(64, Math.max(8, megabytes / 8)),
    });
    pools.set(megabytes, pool);
  }
  return pool;
}

/** Starts the renderer's thread for this budget now, so the first briefing does not wait for it. */
export function warmRenderer(budget: RenderBudget = defaultRenderBudget): void {
  poolFor(budget.megabytes).warm();
}

/** The briefing's PDF, rendered off this thread; RenderFailure (with the reason) past a budget. */
export async function renderBriefingPdfInWorker(input: BriefingInput, budget: RenderBudget = defaultRenderBudget): Promise<Buffer> {
  try {
    const bytes = await poolFor(budget.megabytes).run(input, budget.seconds * 1000);
    return Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  } catch (e) {
    if (!(e instanceof PoolTaskFailed)) throw e;
    if (e.stop === 'time') throw new RenderFailure(`The briefing took longer than its budget of ${budget.seconds} s to lay out and was stopped.`);
    if (e.stop === 'memory') throw new RenderFailure(`The briefing needed more than its memory budget of ${budget.megabytes} MB to lay out and was stopped.`);
    throw new Error(`Laying out the briefing failed: ${e.message}`);
  }
}

/** Ends the threads (tests, shutdown). */
export async function closeRenderPools(): Promise<void> {
  const all = [...pools.values()];
  pools.clear();
  await Promise.all(all.map((p) => p.close()));
}

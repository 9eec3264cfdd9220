// Briefing PDFs are laid out in a worker thread with a time and a memory budget, so a county's
// briefing (tens of thousands of map lines) never holds up the process's requests, and a render
// that runs away is stopped with a reason instead of taking the process down. Everything the
// render reads comes in its input or from the installed packages (pdfmake's fonts): any machine
// running the code can render.
import { Piscina } from 'piscina';
import type { BriefingInput } from './briefing-input';

export type RenderBudget = { seconds: number; megabytes: number };
export const defaultRenderBudget: RenderBudget = { seconds: 120, megabytes: 1024 };

export class RenderFailure extends Error {}

// One small pool per memory budget (a pool's threads share their resource limits). One thread
// is started with the pool and kept: loading the renderer (pdfmake, fonts, the page code) takes
// seconds, which a planner should not wait for at each briefing.
const pools = new Map<number, Piscina>();
function poolFor(megabytes: number): Piscina {
  let pool = pools.get(megabytes);
  if (!pool) {
    pool = new Piscina({
      filename: new URL('./render-worker-entry.mjs', import.meta.url).href,
      minThreads: 1,
      maxThreads: 2,
      idleTimeout: 60_000,
      resourceLimits: { maxOldGenerationSizeMb: megabytes, maxYoungGenerationSizeMb: Math.min(64, Math.max(8, megabytes / 8)) },
    });
    pools.set(megabytes, pool);
  }
  return pool;
}

/** Starts the renderer's thread for this budget now, so the first briefing does not wait for it. */
export function warmRenderer(budget: RenderBudget = defaultRenderBudget): void {
  poolFor(budget.megabytes);
}

/** The briefing's PDF, rendered off this thread; RenderFailure (with the reason) past a budget. */
export async function renderBriefingPdfInWorker(input: BriefingInput, budget: RenderBudget = defaultRenderBudget): Promise<Buffer> {
  const signal = AbortSignal.timeout(budget.seconds * 1000);
  try {
    const bytes: Uint8Array = await poolFor(budget.megabytes).run(input, { signal });
    return Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  } catch (e) {
    if (signal.aborted) throw new RenderFailure(`The briefing took longer than its budget of ${budget.seconds} s to lay out and was stopped.`);
    if ((e as { code?: string }).code === 'ERR_WORKER_OUT_OF_MEMORY') {
      throw new RenderFailure(`The briefing needed more than its memory budget of ${budget.megabytes} MB to lay out and was stopped.`);
    }
    throw e;
  }
}

/** Ends the idle threads (tests, shutdown). */
export async function closeRenderPools(): Promise<void> {
  await Promise.all([...pools.values()].map((p) => p.destroy()));
  pools.clear();
}

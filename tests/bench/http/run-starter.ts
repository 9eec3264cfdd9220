// Keeps the worker busy during the load at a planner's pace: whenever fewer than `inFlight` runs
// of the plan are queued or running, it starts one (at most one per `minIntervalMs`), each with
// its own capacity factor so no stored result can be reused. Starts stay well inside the
// product's limits (RUN_STARTS_PER_MINUTE, RUNS_IN_FLIGHT_PER_ORGANIZATION); a 429 is counted
// apart, as the limit doing its job, never as an error.
import { z } from 'zod';
import { runSchema } from '../../../shared/api/runs';
import type { BenchSession } from './sign-in';

const runListSchema = z.object({ runs: z.array(runSchema) });

export type RunStarterStats = { started: number; refused: number; failed: number; startLatenciesMs: number[]; failures: string[] };

export function startRunStarter(baseUrl: string, session: BenchSession, planId: string, inFlight: number, minIntervalMs: number) {
  const stats: RunStarterStats = { started: 0, refused: 0, failed: 0, startLatenciesMs: [], failures: [] };
  const plan = `${baseUrl}/api/plans/${planId}`;
  let stopped = false;
  let lastStart = 0;

  async function tick(): Promise<void> {
    const list = await fetch(`${plan}/runs`, { headers: { cookie: session.cookie } });
    if (!list.ok) throw new Error(`GET …/runs answered ${list.status}`);
    const { runs } = runListSchema.parse(await list.json());
    const active = runs.filter((r) => r.status === 'queued' || r.status === 'running').length;
    if (active >= inFlight || Date.now() - lastStart < minIntervalMs) return;
    lastStart = Date.now();
    const started = performance.now();
    const res = await fetch(`${plan}/runs`, {
      method: 'POST',
      headers: { cookie: session.cookie, 'x-csrf-token': session.csrfToken, 'content-type': 'application/json' },
      body: JSON.stringify({ parameters: { horizonMinutes: 360, timeStepSeconds: 60, capacityFactor: 0.6 + Math.random() * 0.8, algorithm: 'auto' } }),
    });
    stats.startLatenciesMs.push(performance.now() - started);
    if (res.status === 202) stats.started++;
    else if (res.status === 429) stats.refused++;
    else {
      stats.failed++;
      stats.failures.push(`${res.status} ${(await res.text()).slice(0, 200)}`);
    }
  }

  const loop = (async () => {
    while (!stopped) {
      await tick().catch((e: unknown) => {
        stats.failed++;
        stats.failures.push(e instanceof Error ? e.message : String(e));
      });
      await new Promise((r) => setTimeout(r, 500));
    }
  })();

  return {
    stop: async (): Promise<RunStarterStats> => {
      stopped = true;
      await loop;
      return stats;
    },
  };
}

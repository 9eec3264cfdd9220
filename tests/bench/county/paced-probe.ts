// A paced client that asks the API a cheap question on a fixed schedule, whether or not the last
// answer has come back (so a stalled event loop shows as long latencies, not as fewer samples):
// `/healthz` every 100 ms and the plan's road-layer summary every 500 ms. Each sample keeps the
// phase of the benchmark it was sent in, so latencies can be told per phase.
export type ProbeSample = { target: string; phase: string; sentAt: number; ms: number; status: number };

export type PacedProbe = {
  setPhase: (phase: string) => void;
  /** Adds a target to probe every `everyMs` (e.g. once the plan exists). */
  add: (target: string, url: string, everyMs: number, headers?: Record<string, string>) => void;
  stop: () => Promise<ProbeSample[]>;
};

export function startPacedProbe(): PacedProbe {
  let phase = 'start';
  const samples: ProbeSample[] = [];
  const pending = new Set<Promise<void>>();
  const timers: NodeJS.Timeout[] = [];
  const ask = (target: string, url: string, headers: Record<string, string>) => {
    const sentAt = performance.now();
    const sentIn = phase;
    const p = fetch(url, { headers, signal: AbortSignal.timeout(60_000) })
      .then(async (res) => {
        await res.arrayBuffer();
        samples.push({ target, phase: sentIn, sentAt, ms: performance.now() - sentAt, status: res.status });
      })
      .catch(() => {
        samples.push({ target, phase: sentIn, sentAt, ms: performance.now() - sentAt, status: 0 });
      })
      .finally(() => pending.delete(p));
    pending.add(p);
  };
  return {
    setPhase: (p) => {
      phase = p;
    },
    add: (target, url, everyMs, headers = {}) => {
      timers.push(setInterval(() => ask(target, url, headers), everyMs));
    },
    stop: async () => {
      for (const t of timers) clearInterval(t);
      await Promise.all([...pending]);
      return samples;
    },
  };
}

export function percentile(values: number[], p: number): number {
  if (values.length === 0) return NaN;
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)]!;
}

// A paced client that asks the API a cheap question on a fixed schedule, whether or not the last
// answer has come back (so a stalled event loop shows as long latencies, not as fewer samples):
// `/healthz` every 100 ms and the plan's road-layer summary every 500 ms. Each sample keeps the
// phase of the benchmark it was sent in, so latencies can be told per phase.
import { Worker } from 'node:worker_threads';

/** `sentAt`: epoch milliseconds; `ms`: latency. */
export type ProbeSample = { target: string; phase: string; sentAt: number; ms: number; status: number };

export type PacedProbe = {
  setPhase: (phase: string) => void;
  /** Adds a target to probe every `everyMs` (e.g. once the plan exists). */
  add: (target: string, url: string, everyMs: number, headers?: Record<string, string>) => void;
  stop: () => Promise<ProbeSample[]>;
};

// The probe runs on a thread of its own (its own event loop): the benchmark's main thread builds
// and sends large uploads and parses large answers, and a probe sharing that loop would time the
// client's own work as the server's latency. (The machine's cores are still shared.)
const probeThread = `
const { parentPort } = require('node:worker_threads');
let phase = 'start';
const samples = [];
const pending = new Set();
const timers = [];
const ask = (target, url, headers) => {
  const t0 = performance.now();
  const sentAt = Date.now();
  const sentIn = phase;
  const p = fetch(url, { headers, signal: AbortSignal.timeout(60000) })
    .then(async (res) => {
      await res.arrayBuffer();
      samples.push({ target, phase: sentIn, sentAt, ms: performance.now() - t0, status: res.status });
    })
    .catch(() => samples.push({ target, phase: sentIn, sentAt, ms: performance.now() - t0, status: 0 }))
    .finally(() => pending.delete(p));
  pending.add(p);
};
parentPort.on('message', async (m) => {
  if (m.type === 'phase') phase = m.phase;
  else if (m.type === 'add') timers.push(setInterval(() => ask(m.target, m.url, m.headers), m.everyMs));
  else if (m.type === 'stop') {
    for (const t of timers) clearInterval(t);
    await Promise.all([...pending]);
    parentPort.postMessage(samples);
  }
});
`;

export function startPacedProbe(): PacedProbe {
  const thread = new Worker(probeThread, { eval: true });
  return {
    setPhase: (phase) => thread.postMessage({ type: 'phase', phase }),
    add: (target, url, everyMs, headers = {}) => thread.postMessage({ type: 'add', target, url, everyMs, headers }),
    stop: async () => {
      const samples = new Promise<ProbeSample[]>((resolve) => thread.once('message', resolve));
      thread.postMessage({ type: 'stop' });
      const got = await samples;
      await thread.terminate();
      return got;
    },
  };
}

export function percentile(values: number[], p: number): number {
  if (values.length === 0) return NaN;
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)]!;
}

// One group of load clients (reads or writes): an autocannon instance (paced: ten, opened in
// turn) whose connections each carry one signed-in session (handed out round-robin), cycling through the group's requests.
// Every response's latency is kept per route, so percentiles (autocannon has no p95) and the
// slow routes come from the same numbers.
import autocannon, { type AutocannonInstance, type AutocannonResult } from 'autocannon';
import { withSession, type NamedRequest } from './load-mix';
import type { BenchSession } from './sign-in';

export type RouteSamples = { latenciesMs: number[]; statuses: Map<number, number> };

export type GroupResult = {
  group: string;
  connections: number;
  seconds: number;
  autocannon: AutocannonResult;
  /** Every response's latency, ms. */
  latenciesMs: number[];
  byRoute: Map<string, RouteSamples>;
};

export function runLoadGroup(
  group: string,
  baseUrl: string,
  requests: NamedRequest[],
  sessions: BenchSession[],
  connections: number,
  seconds: number,
  // Requests per second per connection (a client's pace); none: back to back (a closed loop).
  rate?: number,
): { done: Promise<GroupResult>; stop: () => void } {
  if (sessions.length === 0) throw new Error(`no sessions for the ${group}`);
  let next = 0;
  // autocannon calls a request's onResponse and then, synchronously, emits 'response' with the
  // latency; the route named in between is the one that answered.
  let answered = '';
  const named = requests.map((r) => {
    const own = r.onResponse;
    return { ...r, onResponse: (status: number, body: string, context: Record<string, unknown>) => ((answered = r.route), own?.(status, body, context)) };
  });
  const latenciesMs: number[] = [];
  const byRoute = new Map<string, RouteSamples>(requests.map((r) => [r.route, { latenciesMs: [], statuses: new Map() }]));
  const start = (count: number) => {
    const instance = autocannon({
      url: baseUrl,
      connections: count,
      duration: seconds,
      timeout: 10,
      ...(rate ? { connectionRate: rate } : {}),
      requests: named,
      setupClient: (client) => client.setRequests(withSession(named, sessions[next++ % sessions.length]!)),
    });
    instance.on('response', (_client, status, _bytes, ms) => {
      latenciesMs.push(ms);
      const route = byRoute.get(answered);
      if (!route) return;
      route.latenciesMs.push(ms);
      route.statuses.set(status, (route.statuses.get(status) ?? 0) + 1);
    });
    return instance;
  };
  // Paced connections each send on a timer from the moment they open; opened together they would
  // all send in the same instant, once a second, as no set of people does. They open in
  // STAGGER_STEPS groups spread over one interval instead.
  const steps = rate ? Math.min(STAGGER_STEPS, connections) : 1;
  const instances: AutocannonInstance[] = [];
  let stopped = false;
  const started = Array.from({ length: steps }, (_, i) => {
    const count = Math.floor(connections / steps) + (i < connections % steps ? 1 : 0);
    const delayMs = rate ? (i * 1000) / rate / steps : 0;
    return new Promise<AutocannonResult>((resolve) => {
      const go = () => {
        const instance = start(count);
        instances.push(instance);
        if (stopped) instance.stop();
        resolve(Promise.resolve(instance));
      };
      if (delayMs === 0) go();
      else setTimeout(go, delayMs);
    });
  });
  const done = Promise.all(started).then((results) => ({ group, connections, seconds, autocannon: mergeResults(results), latenciesMs, byRoute }));
  return {
    done,
    stop: () => {
      stopped = true;
      for (const i of instances) i.stop();
    },
  };
}

const STAGGER_STEPS = 10;

function mergeResults(results: AutocannonResult[]): AutocannonResult {
  if (results.length === 1) return results[0]!;
  const sum = (f: (r: AutocannonResult) => number) => results.reduce((n, r) => n + f(r), 0);
  const statusCodeStats: Record<string, { count: number }> = {};
  for (const r of results) for (const [code, { count }] of Object.entries(r.statusCodeStats)) statusCodeStats[code] = { count: (statusCodeStats[code]?.count ?? 0) + count };
  const first = results[0]!;
  return {
    ...first,
    duration: Math.max(...results.map((r) => r.duration)),
    errors: sum((r) => r.errors),
    timeouts: sum((r) => r.timeouts),
    non2xx: sum((r) => r.non2xx),
    resets: sum((r) => r.resets),
    statusCodeStats,
    // Of the histograms only these are read: the highest p99 of the groups, and the totals.
    latency: { ...first.latency, p99: Math.max(...results.map((r) => r.latency.p99)), totalCount: sum((r) => r.latency.totalCount) },
    requests: { ...first.requests, total: sum((r) => r.requests.total), sent: sum((r) => r.requests.sent) },
    throughput: { ...first.throughput, total: sum((r) => r.throughput.total) },
  };
}

/** The p-th percentile (0–100) by nearest rank; NaN for no samples. */
export function percentile(values: number[], p: number): number {
  if (values.length === 0) return Number.NaN;
  const sorted = Float64Array.from(values).sort();
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))]!;
}

// One group of load clients (reads or writes): an autocannon instance whose connections each
// carry one signed-in session (handed out round-robin), cycling through the group's requests.
// Every response's latency is kept per route, so percentiles (autocannon has no p95) and the
// slow routes come from the same numbers.
import autocannon, { type AutocannonResult } from 'autocannon';
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
  const instance = autocannon({
    url: baseUrl,
    connections,
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
  const done = Promise.resolve(instance).then((result) => ({ group, connections, seconds, autocannon: result, latenciesMs, byRoute }));
  return { done, stop: () => instance.stop() };
}

/** The p-th percentile (0–100) by nearest rank; NaN for no samples. */
export function percentile(values: number[], p: number): number {
  if (values.length === 0) return Number.NaN;
  const sorted = Float64Array.from(values).sort();
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))]!;
}

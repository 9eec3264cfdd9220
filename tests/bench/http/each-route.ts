// `--each-route`: every read route driven alone (no writes, no runs started, the worker idle), to
// tell what one request of each kind costs: requests per second, the CPU time of the API
// processes and of this database's PostgreSQL backends per request, and bytes per answer. The
// slowest routes of the mixed load are not always the dearest; this says which are.
import { runLoadGroup } from './load-group';
import type { NamedRequest } from './load-mix';
import type { BenchProcess } from './server-processes';
import type { BenchSession } from './sign-in';
import { databaseCpuSince, databaseCpuSnapshot } from './database-cpu';

export type RouteCost = { route: string; requests: number; perSecond: number; apiMs: number | null; databaseMs: number; bytesPerAnswer: number; non2xx: number };

export async function measureEachRoute(
  baseUrl: string,
  requests: NamedRequest[],
  sessions: BenchSession[],
  connections: number,
  seconds: number,
  api: BenchProcess,
  databaseUrl: string,
): Promise<RouteCost[]> {
  const costs: RouteCost[] = [];
  for (const request of requests) {
    // A second of the route alone first, so its first answer (a cache being filled) is not counted.
    await runLoadGroup('warm-up', baseUrl, [request], sessions, Math.min(connections, 10), 1).done;
    const apiBefore = api.cpuSeconds();
    const databaseBefore = await databaseCpuSnapshot(databaseUrl);
    const g = await runLoadGroup(request.route, baseUrl, [request], sessions, connections, seconds).done;
    const apiAfter = api.cpuSeconds();
    const databaseSeconds = await databaseCpuSince(databaseUrl, databaseBefore);
    const n = g.latenciesMs.length;
    costs.push({
      route: request.route,
      requests: n,
      perSecond: n / seconds,
      apiMs: apiBefore === null || apiAfter === null ? null : ((apiAfter - apiBefore) * 1000) / n,
      databaseMs: (databaseSeconds * 1000) / n,
      bytesPerAnswer: g.autocannon.throughput.total / n,
      non2xx: g.autocannon.non2xx,
    });
  }
  return costs;
}

export function formatRouteCosts(header: string, costs: RouteCost[]): string {
  const int = (x: number) => Math.round(x).toLocaleString('en-US');
  const ms = (x: number | null) => (x === null ? '—' : x.toFixed(2));
  return [
    header,
    '',
    '| route | req/s alone | API ms | PostgreSQL ms | bytes per answer, headers included | non-2xx |',
    '|---|---:|---:|---:|---:|---:|',
    ...costs.map((c) => `| ${c.route} | ${int(c.perSecond)} | ${ms(c.apiMs)} | ${ms(c.databaseMs)} | ${int(c.bytesPerAnswer)} | ${int(c.non2xx)} |`),
  ].join('\n');
}

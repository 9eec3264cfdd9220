// The bench's table: one row per group of clients, the paced run starts, what the worker solved,
// where the CPU went, and the per-route percentiles that say which requests are slow.
import { percentile, type GroupResult } from './load-group';
import type { RunStarterStats } from './run-starter';

export type WorkerRuns = { solved: number; failed: number; medianSolveSeconds: number | null; waitingAtEnd: number };
export type CpuShare = { name: string; seconds: number | null };

export type BenchReport = {
  header: string;
  groups: GroupResult[];
  runStarts: RunStarterStats;
  workerRuns: WorkerRuns;
  cpu: CpuShare[];
  loadAverageAfter: string;
  readP99TargetMs: number;
};

const ms = (x: number) => (Number.isFinite(x) ? (x < 10 ? x.toFixed(1) : Math.round(x).toLocaleString('en-US')) : '—');
const int = (x: number) => x.toLocaleString('en-US');
const non2xxOf = (statuses: Map<number, number>) => [...statuses].filter(([s]) => s < 200 || s >= 300).reduce((n, [, c]) => n + c, 0);

function statusList(stats: Record<string, { count: number }>): string {
  const odd = Object.entries(stats).filter(([s]) => !s.startsWith('2'));
  return odd.length === 0 ? '' : ` (${odd.map(([s, { count }]) => `${s}: ${int(count)}`).join(', ')})`;
}

export function formatReport(r: BenchReport): { text: string; readTargetMet: boolean } {
  const lines = [r.header, ''];
  lines.push('| group | connections | requests | req/s | p50 ms | p95 ms | p99 ms | max ms | errors | timeouts | non-2xx |');
  lines.push('|---|---:|---:|---:|---:|---:|---:|---:|---:|---:|---:|');
  for (const g of r.groups) {
    const a = g.autocannon;
    const all = g.latenciesMs;
    lines.push(
      `| ${g.group} | ${g.connections} | ${int(all.length)} | ${int(Math.round(all.length / g.seconds))} | ${ms(percentile(all, 50))} | ${ms(percentile(all, 95))} | ` +
        `${ms(percentile(all, 99))} | ${ms(percentile(all, 100))} | ${int(a.errors - a.timeouts)} | ${int(a.timeouts)} | ${int(a.non2xx)}${statusList(a.statusCodeStats)} |`,
    );
  }
  const s = r.runStarts;
  const seconds = r.groups[0]?.seconds ?? 1;
  lines.push(
    `| run starts (paced, 1 client) | 1 | ${int(s.startLatenciesMs.length)} | ${(s.startLatenciesMs.length / seconds).toFixed(2)} | ${ms(percentile(s.startLatenciesMs, 50))} | ` +
      `${ms(percentile(s.startLatenciesMs, 95))} | ${ms(percentile(s.startLatenciesMs, 99))} | ${ms(percentile(s.startLatenciesMs, 100))} | ${int(s.failed)} | — | ${int(s.refused)} refused (429) |`,
  );
  lines.push('');
  const w = r.workerRuns;
  lines.push(
    `Worker (1 process, WORKER_CONCURRENCY=1): ${int(w.solved)} runs solved during the load` +
      `${w.medianSolveSeconds === null ? '' : ` (median ${w.medianSolveSeconds.toFixed(1)} s from start to result)`}, ${int(w.failed)} failed, ${int(w.waitingAtEnd)} queued or running at the end.`,
  );
  lines.push(
    `CPU time during the load: ${r.cpu.map((c) => `${c.name} ${c.seconds === null ? '—' : `${c.seconds.toFixed(1)} s (${Math.round((100 * c.seconds) / seconds)} % of one core)`}`).join(', ')}; ` +
      `other processes on the machine take the rest. Load average after: ${r.loadAverageAfter}.`,
  );
  // CPU per request depends far less on what else the machine runs than latency does.
  const apiSeconds = r.cpu.find((c) => c.name === 'API')?.seconds ?? null;
  const answered = r.groups.reduce((n, g) => n + g.latenciesMs.length, 0) + s.startLatenciesMs.length;
  const databaseSeconds = r.cpu.find((c) => c.name.startsWith('PostgreSQL'))?.seconds ?? null;
  const perRequest = (x: number | null) => (x === null ? '—' : `${((1000 * x) / answered).toFixed(2)} ms`);
  if (answered > 0) lines.push(`CPU per request: API ${perRequest(apiSeconds)}, PostgreSQL ${perRequest(databaseSeconds)}.`);
  if (s.failures.length > 0) lines.push('', `Run starts that failed: ${[...new Set(s.failures)].slice(0, 5).join('; ')}`);
  lines.push('', '| route | requests | p50 ms | p95 ms | p99 ms | non-2xx |', '|---|---:|---:|---:|---:|---:|');
  for (const g of r.groups) {
    for (const [route, samples] of g.byRoute) {
      const l = samples.latenciesMs;
      lines.push(`| ${g.group}: ${route} | ${int(l.length)} | ${ms(percentile(l, 50))} | ${ms(percentile(l, 95))} | ${ms(percentile(l, 99))} | ${int(non2xxOf(samples.statuses))} |`);
    }
  }
  const reads = r.groups.find((g) => g.group === 'reads');
  const readP99 = reads ? percentile(reads.latenciesMs, 99) : Number.NaN;
  const errorsOf = (g: GroupResult) => g.autocannon.errors + g.autocannon.non2xx;
  const errorFree = r.groups.every((g) => errorsOf(g) === 0) && s.failed === 0;
  const readTargetMet = readP99 < r.readP99TargetMs;
  lines.push('', 'Targets:', '');
  lines.push(`- ${errorFree ? 'met' : 'NOT met'}: zero errors — ${r.groups.map((g) => `${g.group} ${int(errorsOf(g))}`).join(', ')}, run starts ${int(s.failed)} (errors + timeouts + non-2xx)`);
  lines.push(`- ${readTargetMet ? 'met' : 'NOT met'}: p99 under ${r.readP99TargetMs} ms on reads — ${ms(readP99)} ms`);
  return { text: lines.join('\n'), readTargetMet: readTargetMet && errorFree };
}

// `npm run bench [-- --quick] [-- --only NAME] [-- --families] [-- --readme]`: generates the bench instances,
// times every max-flow algorithm on each (one process per measurement, peak RSS included),
// times Boost's boykov_kolmogorov_max_flow and push_relabel_max_flow on the same instances
// (a small DIMACS reader of ours compiled with g++, when libboost-graph-dev is installed),
// times the full evacuation analysis of the time-expanded instance, and prints one table.
// --quick skips Edmonds–Karp and Dinic on the large instances; --readme writes the table into
// tests/bench/flow/README.md. Results also go to tests/output/flow-bench/results.json.
import { execFileSync, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import { INSTANCES, type BenchInstance } from './instances';

const root = fileURLToPath(new URL('../../../', import.meta.url));
const here = fileURLToPath(new URL('./', import.meta.url));
const out = `${root}tests/output/flow-bench/`;
const BOOST_HEADER = '/usr/include/boost/graph/boykov_kolmogorov_max_flow.hpp';
/** Edmonds–Karp and Dinic are stopped after this long on the large instances; the table then says so. */
const SLOW_BUDGET_MS = 300_000;
const ALGORITHMS = ['auto', 'incremental-bfs', 'boykov-kolmogorov', 'push-relabel', 'dinic', 'edmonds-karp'] as const;

const { values } = parseArgs({
  options: { quick: { type: 'boolean', default: false }, only: { type: 'string' }, readme: { type: 'boolean', default: false }, families: { type: 'boolean', default: false } },
});
/** --families: only the layered families (GENRMF-like, random level graphs), written to their own README table. */
const selected = (i: BenchInstance): boolean => (!values.only || i.name === values.only) && (values.families ? i.kind === 'family' : i.kind !== 'family' || !!values.only);
mkdirSync(out, { recursive: true });

interface Row {
  instance: string;
  solver: string;
  nodes?: number;
  arcs?: number;
  value?: number | null;
  /** Warm: the median of the runs after the first (wall clock and CPU time). */
  solveMs?: number;
  cpuMs?: number;
  /** The first run in a fresh process (ours: includes just-in-time compilation). */
  firstMs?: number;
  firstCpuMs?: number;
  peakRssMb?: number;
  aborted?: boolean;
  verified?: boolean | null;
  note?: string;
}

const child = (args: string[]): Record<string, unknown> => {
  const result = spawnSync(process.execPath, ['--import', 'tsx', `${here}solve-one.ts`, ...args], {
    cwd: root,
    encoding: 'utf8',
    maxBuffer: 1 << 26,
  });
  if (result.status !== 0) throw new Error(`solve-one ${args.join(' ')} failed:\n${result.stderr}`);
  return JSON.parse(result.stdout.trim().split('\n').pop()!) as Record<string, unknown>;
};

function compileBoost(): string | null {
  if (!existsSync(BOOST_HEADER)) return null;
  const source = `${here}boost/boost-max-flow.cpp`;
  const hash = createHash('sha256').update(readFileSync(source)).digest('hex').slice(0, 12);
  const binary = `${out}boost-max-flow-${hash}`;
  if (!existsSync(binary)) execFileSync('g++', ['-O2', '-DNDEBUG', '-std=c++17', '-o', binary, source], { stdio: 'inherit' });
  return binary;
}

const median = (xs: number[]): number => [...xs].sort((a, b) => a - b)[Math.floor((xs.length - 1) / 2)]!;

function benchInstance(instance: BenchInstance, boost: string | null): Row[] {
  const rows: Row[] = [];
  const large = instance.name === 'static-250k' || instance.kind !== 'static';
  for (const algorithm of ALGORITHMS) {
    const slow = algorithm === 'edmonds-karp' || algorithm === 'dinic';
    if (slow && large && values.quick) continue;
    // On the families: auto (which starts as incremental BFS), Boykov–Kolmogorov and push-relabel
    // only, and one Boykov–Kolmogorov run, so that the whole command takes minutes.
    const family = instance.kind === 'family';
    if (family && (slow || algorithm === 'incremental-bfs')) continue;
    // One cold run, then warm ones: 5 on the families, fewer where one run takes seconds.
    const repeat = (slow && large) || (family && algorithm === 'boykov-kolmogorov') || (instance.kind === 'time-expanded' && algorithm !== 'auto' && algorithm !== 'incremental-bfs')
      ? 1
      : family
        ? 6
        : instance.kind === 'time-expanded'
          ? 2
          : large
            ? 3
            : 4;
    const args = ['--instance', instance.name, '--algorithm', algorithm, '--repeat', String(repeat)];
    if (slow && large) args.push('--budget-ms', String(SLOW_BUDGET_MS));
    process.stderr.write(`  ${instance.name} ${algorithm} …`);
    const r = child(args);
    process.stderr.write(` ${r.solveMs} ms\n`);
    rows.push({
      instance: instance.name,
      solver: algorithm === 'auto' ? `ours: auto (shape ${String(r.shape)}, finished by ${String(r.algorithm)})` : `ours: ${algorithm}`,
      nodes: r.nodes as number,
      arcs: r.arcs as number,
      value: r.value as number | null,
      solveMs: r.solveMs as number,
      cpuMs: r.cpuMs as number,
      firstMs: r.firstMs as number,
      firstCpuMs: r.firstCpuMs as number,
      peakRssMb: r.peakRssMb as number,
      aborted: r.aborted as boolean,
      verified: r.verified as boolean | null,
      note: r.runs === 1 ? '1 run' : `1 cold + median of ${r.warmRuns as number} warm`,
    });
  }
  if (boost) {
    const file = `${out}${instance.name}.max`;
    if (!existsSync(file)) child(['--instance', instance.name, '--write-dimacs', file]);
    for (const algorithm of ['bk', 'push-relabel']) {
      const runs = instance.kind === 'time-expanded' || (instance.kind === 'family' && algorithm === 'bk') ? 1 : instance.kind === 'family' ? 5 : 3;
      const measured: { value: number; solveMs: number; cpuMs: number; peakRssMb: number }[] = [];
      for (let k = 0; k < runs; k++) {
        process.stderr.write(`  ${instance.name} boost ${algorithm} …`);
        const text = execFileSync(boost, [file, algorithm], { encoding: 'utf8' });
        measured.push(JSON.parse(text) as { value: number; solveMs: number; cpuMs: number; peakRssMb: number });
        process.stderr.write(` ${measured.at(-1)!.solveMs} ms\n`);
      }
      rows.push({
        instance: instance.name,
        solver: `Boost ${algorithm === 'bk' ? 'boykov_kolmogorov_max_flow' : 'push_relabel_max_flow'}`,
        value: measured[0]!.value,
        solveMs: median(measured.map((m) => m.solveMs)),
        cpuMs: median(measured.map((m) => m.cpuMs)),
        peakRssMb: Math.max(...measured.map((m) => m.peakRssMb)),
        note: runs === 1 ? '1 run' : `median of ${runs}`,
      });
    }
  }
  return rows;
}

function boostVersion(): string {
  try {
    const text = readFileSync('/usr/include/boost/version.hpp', 'utf8');
    return text.match(/BOOST_LIB_VERSION "([^"]+)"/)?.[1]?.replace('_', '.') ?? 'unknown';
  } catch {
    return 'not installed';
  }
}

const started = new Date();
const boost = compileBoost();
const machine = {
  date: started.toISOString(),
  cpu: `${os.cpus()[0]?.model ?? 'unknown'} × ${os.cpus().length}`,
  memoryGiB: Math.round(os.totalmem() / 2 ** 30),
  node: process.version,
  boost: boost ? `${boostVersion()} (g++ -O2)` : 'not installed: Boost rows skipped (docker-free-scripts/install-system-packages.sh --bench)',
  loadAverageAtStart: os.loadavg().map((x) => x.toFixed(2)).join(' '),
};
process.stderr.write(`${JSON.stringify(machine)}\n`);

const rows: Row[] = [];
for (const instance of INSTANCES.filter(selected)) rows.push(...benchInstance(instance, boost));
const evacuation = INSTANCES.filter((i) => i.kind === 'time-expanded' && selected(i)).map((i) => {
  process.stderr.write(`  ${i.name} solveEvacuation …`);
  const r = child(['--instance', i.name, '--evacuation']);
  process.stderr.write(` ${r.totalMs} ms\n`);
  return r;
});

// The table.
const fmt = (n: number | null | undefined): string => (n === null || n === undefined ? '—' : n.toLocaleString('en-US'));
const lines: string[] = [];
lines.push(`Measured ${machine.date} on ${machine.cpu}, ${machine.memoryGiB} GiB, Node ${machine.node}, Boost ${machine.boost}; load average at start ${machine.loadAverageAtStart}.`);
lines.push('');
lines.push('| instance | N | M | solver | value | warm ms | warm CPU ms | CPU ÷ faster Boost | first run ms | first run ÷ faster Boost | peak RSS MB | notes |');
lines.push('|---|---:|---:|---|---:|---:|---:|---:|---:|---:|---:|---|');
// "Faster Boost": the Boost solver with the smaller CPU time on that instance. Our first run is
// compared with it too (Boost, compiled ahead of time, has no cold start).
const fasterBoost = (mine: Row[]): Row | undefined => mine.filter((r) => r.solver.startsWith('Boost')).sort((a, b) => a.cpuMs! - b.cpuMs!)[0];
const ratio = (ours: number | undefined, boost: number | undefined, aborted = false): string =>
  ours && boost ? `${aborted ? '> ' : ''}${(ours / boost).toFixed(2)}` : '—';
for (const instance of INSTANCES) {
  const mine = rows.filter((r) => r.instance === instance.name);
  if (mine.length === 0) continue;
  const boostBest = fasterBoost(mine);
  const size = mine.find((r) => r.nodes !== undefined)!;
  for (const r of mine) {
    const isBoost = r.solver.startsWith('Boost');
    const boostValue = mine.find((x) => x.solver.startsWith('Boost'))?.value;
    const differs = boostValue !== undefined && r.value !== null && r.value !== undefined && r.value !== boostValue;
    const notes = [r.note, differs ? 'VALUE DIFFERS FROM BOOST' : undefined, r.aborted ? `stopped after ${fmt(SLOW_BUDGET_MS / 1000)} s` : undefined, r.verified === false ? 'VERIFY FAILED' : undefined].filter(Boolean).join('; ');
    const first = isBoost ? '—' : `${r.aborted ? '> ' : ''}${fmt(r.firstMs)}`;
    const firstRatio = isBoost ? '—' : ratio(r.firstCpuMs, boostBest?.cpuMs, r.aborted);
    lines.push(`| ${instance.name} | ${fmt(size.nodes)} | ${fmt(size.arcs)} | ${r.solver} | ${fmt(r.value)} | ${r.aborted ? '> ' : ''}${fmt(r.solveMs)} | ${r.aborted ? '> ' : ''}${fmt(r.cpuMs)} | ${ratio(r.cpuMs, boostBest?.cpuMs, r.aborted)} | ${first} | ${firstRatio} | ${fmt(r.peakRssMb)} | ${notes} |`);
  }
}
// Each of our solvers against the faster Boost solver, per instance above: the geometric mean of
// the CPU-time ratios, warm and first run.
const geometricMeans: string[] = [];
const solverKey = (label: string): string => label.replace(/ \(shape .*\)$/, '');
const geometricMean = (xs: number[]): string => Math.exp(xs.reduce((sum, x) => sum + Math.log(x), 0) / xs.length).toFixed(2);
for (const solver of [...new Set(rows.filter((r) => r.solver.startsWith('ours')).map((r) => solverKey(r.solver)))]) {
  const pairs = INSTANCES.flatMap((instance) => {
    const mine = rows.filter((r) => r.instance === instance.name);
    const boostBest = fasterBoost(mine);
    const r = mine.find((x) => solverKey(x.solver) === solver);
    return r && !r.aborted && r.cpuMs && boostBest?.cpuMs ? [[r.cpuMs / boostBest.cpuMs, r.firstCpuMs! / boostBest.cpuMs] as const] : [];
  });
  if (pairs.length > 0) {
    geometricMeans.push(`${solver} ${geometricMean(pairs.map((p) => p[0]))} warm, ${geometricMean(pairs.map((p) => p[1]))} first run (${pairs.length} instances)`);
  }
}
if (geometricMeans.length > 0) lines.push('', `Geometric mean of CPU time ÷ the faster Boost solver's over the instances above: ${geometricMeans.join('; ')}.`);
lines.push('');
for (const e of evacuation) {
  lines.push(
    `Full evacuation analysis of ${e.instance} (solveEvacuation, auto): ${fmt(e.totalMs as number)} ms in all — ${Object.entries(e.timingsMs as Record<string, number>).map(([k, v]) => `${k} ${fmt(v)}`).join(', ')} ms (CPU time: ${Object.entries(e.cpuTimingsMs as Record<string, number>).map(([k, v]) => `${k} ${fmt(v)}`).join(', ')} ms); ` +
      `${fmt(e.arcs as number)} expanded arcs; demand ${fmt(e.demand as number)} vehicles, ${fmt(e.deliveredByHorizon as number)} delivered by the horizon (clearance ${e.clearanceStep ?? 'not within T'}); peak RSS ${fmt(e.peakRssMb as number)} MB.`,
  );
}

// The targets of the issue, checked against the rows above.
const get = (instance: string, solver: string): Row | undefined => rows.find((r) => r.instance === instance && r.solver.startsWith(solver));
const targets: string[] = [];
const check = (label: string, ok: boolean | undefined, detail: string): void => {
  targets.push(`- ${ok === undefined ? 'not measured' : ok ? 'met' : 'NOT met'}: ${label} — ${detail}`);
};
const auto250 = get('static-250k', 'ours: auto');
check('static max flow on a 250,000-intersection city under 0.5 s', auto250 ? auto250.solveMs! < 500 : undefined, auto250 ? `${fmt(auto250.solveMs)} ms` : 'not run');
const auto5m = get('expanded-5m', 'ours: auto');
const bestOurs5m = rows.filter((r) => r.instance === 'expanded-5m' && r.solver.startsWith('ours') && !r.aborted).sort((a, b) => a.solveMs! - b.solveMs!)[0];
const boost5m = rows.filter((r) => r.instance === 'expanded-5m' && r.solver.startsWith('Boost')).sort((a, b) => a.solveMs! - b.solveMs!)[0];
if (auto5m && boost5m) {
  check('one max flow on the 5M-arc time-expanded network within 3× of the faster Boost solver', auto5m.solveMs! <= 3 * boost5m.solveMs!, `auto ${fmt(auto5m.solveMs)} ms vs ${boost5m.solver} ${fmt(boost5m.solveMs)} ms (${(auto5m.solveMs! / boost5m.solveMs!).toFixed(2)}×); our fastest, ${bestOurs5m!.solver}, ${(bestOurs5m!.solveMs! / boost5m.solveMs!).toFixed(2)}×`);
} else check('one max flow on the 5M-arc time-expanded network within 3× of the faster Boost solver', undefined, boost ? 'not run' : 'Boost not installed');
if (auto5m) check('… and under 2 GB', auto5m.peakRssMb! < 2048, `peak RSS ${fmt(auto5m.peakRssMb)} MB (whole process)`);
const evac = evacuation[0];
if (evac) check('full evacuation curve of that network under 15 s', (evac.timingsMs as Record<string, number>).curve! < 15_000, `curve ${fmt((evac.timingsMs as Record<string, number>).curve)} ms`);
for (const name of ['static-250k', 'expanded-5m']) {
  const fast = get(name, 'ours: auto');
  const ek = get(name, 'ours: edmonds-karp');
  if (fast && ek) check(`faster algorithm at least 10× Edmonds–Karp on ${name}`, ek.solveMs! >= 10 * fast.solveMs!, `${ek.aborted ? 'more than ' : ''}${(ek.solveMs! / fast.solveMs!).toFixed(0)}× (${ek.aborted ? '> ' : ''}${fmt(ek.solveMs)} ms vs ${fmt(fast.solveMs)} ms)`);
}
lines.push('', `Load average at the end: ${os.loadavg().map((x) => x.toFixed(2)).join(' ')}.`);
if (!values.families) lines.push('', 'Targets of issue 3:', '', ...targets);
const table = lines.join('\n');
process.stdout.write(`${table}\n`);
writeFileSync(`${out}results.json`, JSON.stringify({ machine, rows, evacuation, targets }, null, 2));
if (values.readme) {
  const readme = `${here}README.md`;
  const text = readFileSync(readme, 'utf8');
  const start = values.families ? '<!-- families:start -->' : '<!-- bench:start -->';
  const end = values.families ? '<!-- families:end -->' : '<!-- bench:end -->';
  writeFileSync(readme, text.replace(new RegExp(`${start}[\\s\\S]*${end}`), `${start}\n${table}\n${end}`));
}

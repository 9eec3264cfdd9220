// `npm run bench:county [-- --readme] [-- --step-seconds N]`: the generated county (county.ts,
// 179,108 road segments) through the whole HTTP path, against the real API server, a run worker
// and PostgreSQL as separate processes (production settings): sign in, create a plan, import
// roads, zones and shelters as import jobs, start a run (the default 60 s step unless
// --step-seconds; a refused start is recorded and retried at the next coarser step that fits),
// poll it to the end, then fetch what the Findings view fetches at the county's full extent,
// tiles at a street zoom, one road's figures, the choke-point geometry and a briefing PDF.
// Reports each phase's time, the bytes received, each process's peak memory (VmHWM) and the
// latency of a paced client (/healthz every 100 ms, the road-layer summary every 500 ms) per
// phase. A benchmark, run by hand once: never part of `npm test`. --readme writes the report
// into tests/bench/county/README.md; the JSON goes to tests/output/county-bench/results.json.
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import { basename } from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import { importSchema, type Import } from '../../../shared/api/imports';
import { planSchema } from '../../../shared/api/plans';
import { runSchema, runWithResultSchema, segmentGeometrySchema, roadResultAnswerSchema, type RunResult, type RunWithResult } from '../../../shared/api/runs';
import { demoAccounts } from '../../../server/seed/demo-accounts';
import { commitDescription, startBenchStack, type BenchStack } from '../http/bench-stack';
import { signIn, type BenchSession } from '../http/sign-in';
import { countyLayout, FULL_COUNTY } from './county';
import { DEFAULT_COUNTY_DIR, writeCountyFiles } from './generate';
import { percentile, startPacedProbe, type ProbeSample } from './paced-probe';

const root = fileURLToPath(new URL('../../../', import.meta.url));
const here = fileURLToPath(new URL('./', import.meta.url));
const out = `${root}tests/output/county-bench/`;

const { values } = parseArgs({
  options: {
    readme: { type: 'boolean', default: false },
    'step-seconds': { type: 'string', default: '60' },
    'horizon-minutes': { type: 'string', default: '360' },
    // A smaller county to try the bench itself out (the figures of record are the default 300).
    size: { type: 'string', default: String(FULL_COUNTY.size) },
    // A setting for the API and the worker, e.g. --env RUN_TIME_BUDGET_SECONDS=3600 --env WORKER_NICENESS=0
    // (on a machine shared with other work a worker at niceness 10 gets little of the CPU); said in the report.
    env: { type: 'string', multiple: true, default: [] },
  },
});
const extraEnv = Object.fromEntries(
  (values.env ?? []).map((pair) => {
    const at = pair.indexOf('=');
    if (at <= 0) throw new Error(`--env takes KEY=VALUE, got ${pair}`);
    return [pair.slice(0, at), pair.slice(at + 1)];
  }),
);
const firstStep = Number(values['step-seconds']);
const spec = { ...FULL_COUNTY, size: Number(values.size) };
const horizonMinutes = Number(values['horizon-minutes']);
const COARSER_STEPS = [60, 120, 180, 300, 360, 600, 900].filter((s) => s > firstStep);
mkdirSync(out, { recursive: true });
const say = (s: string) => process.stderr.write(`[bench:county] ${new Date().toISOString().slice(11, 19)} ${s}\n`);
const loadAverage = () => os.loadavg().map((x) => x.toFixed(2)).join(' ');

/** Peak resident memory of a process so far (VmHWM, which covers all its threads), MiB. */
function peakRssMiB(pid: number): number | null {
  try {
    const m = /VmHWM:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
    return m ? Number(m[1]) / 1024 : null;
  } catch {
    return null;
  }
}

// Web-map tile of a point (the usual XYZ scheme of web maps, spherical Mercator; common practice).
function tileOf(lon: number, lat: number, z: number): [number, number] {
  const n = 2 ** z;
  const r = (lat * Math.PI) / 180;
  return [Math.floor(((lon + 180) / 360) * n), Math.floor(((1 - Math.log(Math.tan(r) + 1 / Math.cos(r)) / Math.PI) / 2) * n)];
}
function tilesCovering([w, s, e, n]: number[], z: number): [number, number][] {
  const [x0, y0] = tileOf(w!, n!, z);
  const [x1, y1] = tileOf(e!, s!, z);
  const tiles: [number, number][] = [];
  for (let x = x0; x <= x1; x++) for (let y = y0; y <= y1; y++) tiles.push([x, y]);
  return tiles;
}
/** The zoom at which a viewport of width × height pixels shows the whole box (as a web map's fit-to-bounds picks it). */
function zoomToFit([w, s, e, n]: number[], width: number, height: number): number {
  for (let z = 18; z > 0; z--) {
    const [x0, y0] = tileOf(w!, n!, z);
    const [x1, y1] = tileOf(e!, s!, z);
    if ((x1 - x0 + 1) * 256 <= width + 256 && (y1 - y0 + 1) * 256 <= height + 256) return z;
  }
  return 0;
}

type Phase = { name: string; seconds: number; note?: string };
type Fetched = { what: string; requests: number; bytes: number; seconds: number; slowestMs: number };

let stack: BenchStack | null = null;
// A function, so that the finally below reads the stack main() started.
const stopStack = async () => stack?.stop();

async function main(): Promise<void> {
  const loadBefore = loadAverage();
  say(`load average before: ${loadBefore}`);
  const files = writeCountyFiles(spec, spec.size === FULL_COUNTY.size ? DEFAULT_COUNTY_DIR : `${out}county-${spec.size}/`);
  say(`county written: ${files.features.roads} road features, ${files.bytes.roads} bytes`);
  stack = await startBenchStack({ root, out, worker: true, say, env: extraEnv });
  const { baseUrl, api } = stack;
  const worker = stack.worker!;

  const phases: Phase[] = [];
  const fetched: Fetched[] = [];
  const peaks: Record<string, { api: number | null; worker: number | null }> = {};
  const probe = startPacedProbe();
  probe.add('/healthz', `${baseUrl}/healthz`, 100);
  let phaseStart = performance.now();
  const phase = (name: string) => {
    probe.setPhase(name);
    phaseStart = performance.now();
    say(name);
  };
  const endPhase = (name: string, note?: string) => {
    phases.push({ name, seconds: (performance.now() - phaseStart) / 1000, ...(note ? { note } : {}) });
    peaks[name] = { api: peakRssMiB(api.pid), worker: peakRssMiB(worker.pid) };
  };

  phase('sign in and create the plan');
  const planner = demoAccounts.find((a) => a.role === 'planner')!;
  const session: BenchSession = await signIn(baseUrl, planner.email, planner.password);
  const headers = { cookie: session.cookie };
  const writeHeaders = { cookie: session.cookie, 'x-csrf-token': session.csrfToken };
  const created = await fetch(`${baseUrl}/api/plans`, {
    method: 'POST',
    headers: { ...writeHeaders, 'content-type': 'application/json' },
    body: JSON.stringify({ name: 'Quellbrook County (benchmark)', description: 'Invented county for the scale benchmark.' }),
  });
  if (created.status !== 201) throw new Error(`creating the plan answered ${created.status}: ${await created.text()}`);
  const plan = planSchema.parse(await created.json());
  const base = `${baseUrl}/api/plans/${plan.id}`;
  probe.add('…/road-layer', `${base}/road-layer`, 500, headers);
  endPhase('sign in and create the plan');

  async function importFile(kind: 'road-layer' | 'zones' | 'shelters', path: string): Promise<{ answerMs: number; job: Import }> {
    phase(`import ${kind}`);
    const form = new FormData();
    form.append('file', new Blob([readFileSync(path)], { type: 'application/geo+json' }), basename(path));
    if (kind === 'road-layer') form.append('name', 'Quellbrook County roads');
    const t0 = performance.now();
    const res = await fetch(`${base}/imports/${kind}`, { method: 'POST', headers: writeHeaders, body: form });
    const answerMs = performance.now() - t0;
    if (res.status !== 202) throw new Error(`import ${kind} answered ${res.status}: ${await res.text()}`);
    let job = importSchema.parse(await res.json());
    while (job.status === 'queued' || job.status === 'running') {
      await new Promise((r) => setTimeout(r, 250));
      job = importSchema.parse(await (await fetch(`${base}/imports/${job.id}`, { headers })).json());
    }
    if (job.status !== 'succeeded') throw new Error(`import ${kind} ${job.status}: ${JSON.stringify(job.failure)}`);
    endPhase(`import ${kind}`, `upload answered in ${answerMs.toFixed(0)} ms`);
    return { answerMs, job };
  }
  const imports = {
    roads: await importFile('road-layer', files.roads),
    zones: await importFile('zones', files.zones),
    shelters: await importFile('shelters', files.shelters),
  };

  // A start the API refuses (its cheap lower bound) or a run the worker's preparation refuses (the
  // exact size) moves on to the next coarser step; each refusal is reported.
  const refusals: { timeStepSeconds: number; status: number | string; message: string }[] = [];
  let started: { id: string; timeStepSeconds: number; answerMs: number } | null = null;
  let run: RunWithResult | null = null;
  const runPhases: { phase: string; at: number }[] = [];
  for (const timeStepSeconds of [firstStep, ...COARSER_STEPS]) {
    phase(`start the run (Δ = ${timeStepSeconds} s)`);
    const t0 = performance.now();
    const res = await fetch(`${base}/runs`, {
      method: 'POST',
      headers: { ...writeHeaders, 'content-type': 'application/json' },
      body: JSON.stringify({ parameters: { horizonMinutes, timeStepSeconds, capacityFactor: 1, algorithm: 'auto' } }),
    });
    const answerMs = performance.now() - t0;
    if (res.status !== 202) {
      const body = (await res.json().catch(() => ({}))) as { error?: { message?: string } };
      refusals.push({ timeStepSeconds, status: res.status, message: body.error?.message ?? JSON.stringify(body) });
      say(`refused at ${timeStepSeconds} s: ${res.status} ${refusals.at(-1)!.message}`);
      endPhase(`start the run (Δ = ${timeStepSeconds} s)`, `refused in ${answerMs.toFixed(0)} ms`);
      continue;
    }
    started = { id: runSchema.parse(await res.json()).id, timeStepSeconds, answerMs };
    endPhase(`start the run (Δ = ${timeStepSeconds} s)`, `POST …/runs answered 202 in ${answerMs.toFixed(0)} ms`);

    phase(`run at Δ = ${timeStepSeconds} s: queued to finished`);
    runPhases.length = 0;
    const runT0 = performance.now();
    for (;;) {
      run = runWithResultSchema.parse(await (await fetch(`${base}/runs/${started.id}`, { headers })).json());
      const label = `${run.status}: ${run.phase.replace(/\d[\d,.]*/g, '#')}`;
      if (runPhases.at(-1)?.phase !== label) runPhases.push({ phase: label, at: (performance.now() - runT0) / 1000 });
      if (run.status === 'succeeded' || run.status === 'failed' || run.status === 'cancelled') break;
      if (performance.now() - runT0 > 1_800_000) throw new Error('the run did not finish within 30 minutes');
      await new Promise((r) => setTimeout(r, 1000));
    }
    endPhase(`run at Δ = ${timeStepSeconds} s: queued to finished`, `${run.status}${run.failureReason ? `: ${run.failureReason}` : ''}`);
    if (run.status === 'failed' && /time-expanded arcs|budget/i.test(run.failureReason ?? '')) {
      refusals.push({ timeStepSeconds, status: 'failed in the worker', message: run.failureReason ?? '' });
      continue;
    }
    break;
  }
  if (!started || !run) throw new Error('every time step was refused');
  if (run.status !== 'succeeded' || !run.result) throw new Error(`the run ${run.status}: ${run.failureReason}`);
  const finished = run;
  const result = finished.result!;

  async function fetchAll(what: string, urls: string[]): Promise<Fetched> {
    const t0 = performance.now();
    let bytes = 0;
    let slowestMs = 0;
    // Six at a time, as a browser fetches from one origin over HTTP/1.1.
    const queue = [...urls];
    await Promise.all(
      Array.from({ length: 6 }, async () => {
        for (let url = queue.shift(); url; url = queue.shift()) {
          const s = performance.now();
          const res = await fetch(url, { headers: { ...headers, 'accept-encoding': 'gzip' } });
          const body = await res.arrayBuffer();
          if (res.status !== 200 && res.status !== 204) throw new Error(`GET ${url} answered ${res.status}`);
          // fetch decodes gzip; count what travelled when the answer came compressed.
          const length = Number(res.headers.get('content-length') ?? body.byteLength);
          bytes += res.headers.get('content-encoding') ? length : body.byteLength;
          slowestMs = Math.max(slowestMs, performance.now() - s);
        }
      }),
    );
    const f = { what, requests: urls.length, bytes, seconds: (performance.now() - t0) / 1000, slowestMs };
    fetched.push(f);
    return f;
  }

  phase('Findings view at full extent');
  const layerAnswer = (await (await fetch(`${base}/road-layer`, { headers })).json()) as { layer: { bbox: number[] } };
  const bbox = layerAnswer.layer.bbox;
  const fullZoom = zoomToFit(bbox, 1280, 800);
  const findingsFixed = [`${base}/runs/${finished.id}`, `${base}/road-layer`, `${base}/zones`, `${base}/shelters`, `${base}/runs/${finished.id}/choke-point-geometry`];
  const fullTiles = tilesCovering(bbox, fullZoom).map(([x, y]) => `${base}/runs/${finished.id}/tiles/${fullZoom}/${x}/${y}`);
  const findingsData = await fetchAll('Findings data (result, layer summary, zones, shelters, choke-point geometry)', findingsFixed);
  const findingsTiles = await fetchAll(`run tiles at zoom ${fullZoom} (the whole county in 1280 × 800 px)`, fullTiles);
  endPhase('Findings view at full extent');

  phase('street zoom, a road and the choke points');
  const { layout, firstBridgeCentre } = (() => {
    const layout = countyLayout(spec);
    const [w, s, e, n] = bbox as [number, number, number, number];
    const x = w + ((layout.riverWest + 0.5) / (layout.n - 1)) * (e - w);
    const y = s + (layout.bridgeRows[0]! / (layout.n - 1)) * (n - s);
    return { layout, firstBridgeCentre: [x, y] as [number, number] };
  })();
  // A 1280 × 800 px viewport at zoom 15 around the first bridge: 5 × 4 tiles.
  const streetZoom = 15;
  const [cx, cy] = tileOf(firstBridgeCentre[0], firstBridgeCentre[1], streetZoom);
  const streetTiles: string[] = [];
  for (let dx = -2; dx <= 2; dx++) for (let dy = -2; dy <= 1; dy++) streetTiles.push(`${base}/runs/${finished.id}/tiles/${streetZoom}/${cx + dx}/${cy + dy}`);
  await fetchAll(`run tiles at zoom ${streetZoom} (1280 × 800 px around a bridge)`, streetTiles);
  await fetchAll(`road tiles at zoom ${streetZoom} (the plan's layer, same view)`, streetTiles.map((u) => u.replace(`/runs/${finished.id}/tiles/`, '/tiles/roads/')));
  const top = result.bottlenecks[0];
  const roadSegment = top?.segmentId ?? segmentGeometrySchema.parse(await (await fetch(`${base}/runs/${finished.id}/choke-point-geometry`, { headers })).json()).segments[0]?.id;
  if (roadSegment === undefined) throw new Error('the run has no choke point to ask about');
  const roadAnswer = roadResultAnswerSchema.parse(await (await fetch(`${base}/runs/${finished.id}/roads/${roadSegment}`, { headers })).json());
  await fetchAll('one road’s figures (the top choke point)', [`${base}/runs/${finished.id}/roads/${roadSegment}`]);
  await fetchAll('choke-point geometry', [`${base}/runs/${finished.id}/choke-point-geometry`]);
  endPhase('street zoom, a road and the choke points');

  phase('briefing PDF');
  const t0 = performance.now();
  const draft = await fetch(`${baseUrl}/api/briefings`, {
    method: 'POST',
    headers: { ...writeHeaders, 'content-type': 'application/json' },
    body: JSON.stringify({ runId: finished.id, title: 'Quellbrook County clearance (benchmark)' }),
  });
  const draftMs = performance.now() - t0;
  if (draft.status !== 201) throw new Error(`drafting the briefing answered ${draft.status}: ${await draft.text()}`);
  const { briefing } = (await draft.json()) as { briefing: { id: string } };
  const pdf = await fetchAll('briefing PDF', [`${baseUrl}/api/briefings/${briefing.id}/pdf`]);
  writeFileSync(`${out}briefing.pdf`, Buffer.from(await (await fetch(`${baseUrl}/api/briefings/${briefing.id}/pdf`, { headers })).arrayBuffer()));
  endPhase('briefing PDF', `POST /api/briefings (draft, rendered) answered in ${(draftMs / 1000).toFixed(1)} s`);

  const samples = await probe.stop();
  const finalPeaks = { api: peakRssMiB(api.pid), worker: peakRssMiB(worker.pid) };
  const report = formatReport({
    header:
      `Measured ${new Date().toISOString()} on ${os.cpus()[0]?.model ?? 'unknown'} × ${os.cpus().length}, ${Math.round(os.totalmem() / 2 ** 30)} GiB, Node ${process.version}, ` +
      `commit ${commitDescription(root, 'tests/bench/county/README.md')}; one API process, one worker (WORKER_CONCURRENCY 1, niceness ${extraEnv.WORKER_NICENESS ?? 10}), production settings${Object.keys(extraEnv).length > 0 ? ` with ${Object.entries(extraEnv).map(([k, v]) => `${k}=${v}`).join(', ')}` : ''}; load average (1, 5, 15 min) ${loadBefore} before, ${loadAverage()} after ` +
      `(the machine was shared with other work).`,
    county: `${files.features.roads} road features (${(files.bytes.roads / 1e6).toFixed(1)} MB): ${JSON.stringify(imports.roads.job.outcome)}; grid ${layout.n} × ${layout.n}, ${layout.bridgeRows.length} bridges`,
    phases,
    peaks,
    finalPeaks,
    fetched,
    findingsBytes: findingsData.bytes + findingsTiles.bytes,
    refusals,
    run: { step: started.timeStepSeconds, phases: runPhases, stats: result.stats, headline: result.headline, curveEnd: result.curve.deliveredVehicles.at(-1), demand: result.zones.reduce((s, z) => s + z.demandVehicles, 0) },
    road: { segmentId: roadSegment, found: roadAnswer.road !== null },
    pdfBytes: pdf.bytes,
    samples,
    uploadsMs: { roads: imports.roads.answerMs, zones: imports.zones.answerMs, shelters: imports.shelters.answerMs, run: started.answerMs },
  });
  process.stdout.write(`${report}\n`);
  writeFileSync(`${out}results.json`, JSON.stringify({ phases, peaks, finalPeaks, fetched, refusals, runPhases, stats: result.stats, headline: result.headline, samples }, null, 2));
  if (values.readme) {
    const readme = `${here}README.md`;
    const start = '<!-- bench:county:start -->';
    const end = '<!-- bench:county:end -->';
    const current = readFileSync(readme, 'utf8');
    const block = `${start}\n${report}\n${end}`;
    writeFileSync(readme, current.includes(start) ? current.replace(new RegExp(`${start}[\\s\\S]*${end}`), block) : `${current.trimEnd()}\n\n${block}\n`);
  }
}

type ReportInput = {
  header: string;
  county: string;
  phases: Phase[];
  peaks: Record<string, { api: number | null; worker: number | null }>;
  finalPeaks: { api: number | null; worker: number | null };
  fetched: Fetched[];
  findingsBytes: number;
  refusals: { timeStepSeconds: number; status: number | string; message: string }[];
  run: { step: number; phases: { phase: string; at: number }[]; stats: RunResult['stats']; headline: unknown; curveEnd: number | undefined; demand: number };
  road: { segmentId: number; found: boolean };
  pdfBytes: number;
  samples: ProbeSample[];
  uploadsMs: Record<string, number>;
};

function formatReport(r: ReportInput): string {
  const mib = (v: number | null) => (v === null ? '—' : `${Math.round(v).toLocaleString('en-GB')} MiB`);
  const kb = (b: number) => (b >= 1e6 ? `${(b / 1e6).toFixed(2)} MB` : `${(b / 1e3).toFixed(1)} kB`);
  const lines: string[] = [r.header, '', `County: ${r.county}.`, ''];
  lines.push('| phase | seconds | API peak RSS so far | worker peak RSS so far | /healthz p50 / p99 / max (ms) | road-layer p99 (ms) | note |', '|---|---|---|---|---|---|---|');
  for (const p of r.phases) {
    const health = r.samples.filter((s) => s.phase === p.name && s.target === '/healthz').map((s) => s.ms);
    const layer = r.samples.filter((s) => s.phase === p.name && s.target !== '/healthz').map((s) => s.ms);
    const f = (v: number) => (Number.isNaN(v) ? '—' : v.toFixed(0));
    lines.push(
      `| ${p.name} | ${p.seconds.toFixed(1)} | ${mib(r.peaks[p.name]?.api ?? null)} | ${mib(r.peaks[p.name]?.worker ?? null)} | ${f(percentile(health, 50))} / ${f(percentile(health, 99))} / ${f(health.length ? Math.max(...health) : NaN)} (${health.length}) | ${f(percentile(layer, 99))} (${layer.length}) | ${p.note ?? ''} |`,
    );
  }
  const allHealth = r.samples.filter((s) => s.target === '/healthz');
  const allLayer = r.samples.filter((s) => s.target !== '/healthz');
  const failed = r.samples.filter((s) => s.status !== 200).length;
  lines.push(
    '',
    `Whole bench: /healthz p99 ${percentile(allHealth.map((s) => s.ms), 99).toFixed(0)} ms, max ${Math.max(...allHealth.map((s) => s.ms)).toFixed(0)} ms over ${allHealth.length} samples; ` +
      `road-layer p99 ${percentile(allLayer.map((s) => s.ms), 99).toFixed(0)} ms over ${allLayer.length}; ${failed} probe answers not 200. ` +
      `Peak RSS (VmHWM) at the end: API ${mib(r.finalPeaks.api)}, worker ${mib(r.finalPeaks.worker)}.`,
    '',
    `Requests answered: road upload ${r.uploadsMs.roads!.toFixed(0)} ms, zones ${r.uploadsMs.zones!.toFixed(0)} ms, shelters ${r.uploadsMs.shelters!.toFixed(0)} ms, POST …/runs ${r.uploadsMs.run!.toFixed(0)} ms.`,
    '',
  );
  if (r.refusals.length) {
    lines.push('Refused starts:');
    for (const f of r.refusals) lines.push(`- Δ = ${f.timeStepSeconds} s: ${f.status} — ${f.message}`);
    lines.push('');
  }
  const s = r.run.stats;
  lines.push(
    `Run at Δ = ${r.run.step} s over ${horizonMinutes} min: ${s.algorithm}, ${s.nodes.toLocaleString('en-GB')} nodes, ${s.arcs.toLocaleString('en-GB')} arcs, ` +
      `${s.expandedArcs.toLocaleString('en-GB')} expanded arcs, solve ${(s.solveMs / 1000).toFixed(1)} s, engine peak ${(s.peakMemoryBytes / 2 ** 20).toFixed(0)} MiB (its own estimate); ` +
      `${(r.run.curveEnd ?? 0).toLocaleString('en-GB')} of ${r.run.demand.toLocaleString('en-GB')} vehicles arrived by the horizon; headline ${JSON.stringify(r.run.headline)}.`,
    `Run phases (seconds after the start answered): ${r.run.phases.map((p) => `${p.at.toFixed(0)} s ${p.phase}`).join('; ')}.`,
    '',
    '| fetched | requests | bytes received | seconds | slowest (ms) |',
    '|---|---|---|---|---|',
    ...r.fetched.map((f) => `| ${f.what} | ${f.requests} | ${kb(f.bytes)} | ${f.seconds.toFixed(2)} | ${f.slowestMs.toFixed(0)} |`),
    '',
    `The Findings view at the county's full extent received ${kb(r.findingsBytes)} (gzip where the server sent it). Road ${r.road.segmentId}: ${r.road.found ? 'figures found' : 'no figures'}. Briefing PDF ${kb(r.pdfBytes)}.`,
  );
  return lines.join('\n');
}

try {
  await main();
} catch (e) {
  process.exitCode = 2;
  say(e instanceof Error ? (e.stack ?? e.message) : String(e));
} finally {
  await stopStack();
}

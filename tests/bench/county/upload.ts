// `npx tsx tests/bench/county/upload.ts [--times N]`: the road upload request alone, against a real
// API process (production settings, no worker, so the jobs stay queued): how long the request takes
// to answer 202 for the generated county's roads as written (7.9 MB) and written with indentation
// (about four times larger), and the latency of a paced /healthz client meanwhile. A benchmark, run
// by hand; the whole path is `npm run bench:county`.
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import { planSchema } from '../../../shared/api/plans';
import { demoAccounts } from '../../../server/seed/demo-accounts';
import { startBenchStack, type BenchStack } from '../http/bench-stack';
import { signIn } from '../http/sign-in';
import { FULL_COUNTY } from './county';
import { DEFAULT_COUNTY_DIR, writeCountyFiles } from './generate';
import { percentile, startPacedProbe } from './paced-probe';
import { postForm } from './post-form';

const root = fileURLToPath(new URL('../../../', import.meta.url));
const out = `${root}tests/output/county-bench/`;
const { values } = parseArgs({ options: { times: { type: 'string', default: '5' } } });
const times = Number(values.times);
mkdirSync(out, { recursive: true });
const say = (s: string) => process.stderr.write(`[bench:upload] ${s}\n`);

let stack: BenchStack | null = null;

async function main(): Promise<void> {
  say(`load average before: ${os.loadavg().map((x) => x.toFixed(2)).join(' ')}`);
  const compact = readFileSync(writeCountyFiles(FULL_COUNTY, DEFAULT_COUNTY_DIR).roads);
  const indented = Buffer.from(JSON.stringify(JSON.parse(compact.toString('utf8')), null, 2));
  writeFileSync(`${out}roads-indented.geojson`, indented);
  stack = await startBenchStack({ root, out, logPrefix: 'upload-', worker: false, env: { UPLOAD_MAX_MEGABYTES: '64' }, say });
  const { baseUrl } = stack;
  const planner = demoAccounts.find((a) => a.role === 'planner')!;
  const session = await signIn(baseUrl, planner.email, planner.password);
  const writeHeaders = { cookie: session.cookie, 'x-csrf-token': session.csrfToken };
  const created = await fetch(`${baseUrl}/api/plans`, {
    method: 'POST',
    headers: { ...writeHeaders, 'content-type': 'application/json' },
    body: JSON.stringify({ name: 'Upload bench', description: 'Invented county.' }),
  });
  const plan = planSchema.parse(await created.json());
  const probe = startPacedProbe();
  for (const [label, bytes] of [
    ['compact', compact],
    ['indented', indented],
  ] as const) {
    const answers: number[] = [];
    const afterLast: number[] = [];
    probe.setPhase(label);
    probe.add(`/healthz ${label}`, `${baseUrl}/healthz`, 100);
    for (let i = 0; i < times; i++) {
      await new Promise((r) => setTimeout(r, 500));
      const form = new FormData();
      form.append('file', new Blob([bytes], { type: 'application/geo+json' }), 'roads.geojson');
      const { res, answerMs, afterLastByteMs } = await postForm(`${baseUrl}/api/plans/${plan.id}/imports/road-layer`, writeHeaders, form);
      answers.push(answerMs);
      afterLast.push(afterLastByteMs);
      if (res.status !== 202) throw new Error(`upload answered ${res.status}: ${await res.text()}`);
      await res.arrayBuffer();
    }
    await new Promise((r) => setTimeout(r, 500));
    say(`${label} (${(bytes.length / 1e6).toFixed(1)} MB): answered in ${answers.map((a) => a.toFixed(0)).join(', ')} ms; ${afterLast.map((a) => a.toFixed(0)).join(', ')} ms after the last byte was sent`);
  }
  const samples = await probe.stop();
  for (const label of ['compact', 'indented']) {
    const ms = samples.filter((s) => s.phase === label).map((s) => s.ms);
    say(`/healthz during ${label} uploads: p50 ${percentile(ms, 50).toFixed(0)} ms, p99 ${percentile(ms, 99).toFixed(0)} ms, max ${Math.max(...ms).toFixed(0)} ms (${ms.length} samples)`);
  }
  say(`load average after: ${os.loadavg().map((x) => x.toFixed(2)).join(' ')}`);
}

main()
  .catch((e: unknown) => {
    say(`failed: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}`);
    process.exitCode = 1;
  })
  .finally(async () => {
    await stack?.stop();
  });

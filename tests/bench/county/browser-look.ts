// `npx tsx tests/bench/county/browser-look.ts [--size N] [--step-seconds S] [--no-run]`: the
// generated county (county.ts; 179,108 roads at the default size) in a real browser, at the size
// planners have. Starts the product as the benches do (API, a run worker, PostgreSQL; production
// settings), signs in through the form in Debian's Chromium, imports roads, zones and shelters
// through the import jobs, runs the plan (a coarse step by default: this is a look at the map, not
// the engine's bench), then opens the workspace: the Findings tab at the county's full extent,
// then at street zoom (the first choke point), waits each time for the run's vector tiles, and
// clicks a road to its popup. With --no-run, the same on the road layer's own tiles. Screenshots and timings go to tests/output/county-browser/.
// By hand, once: never part of `npm test` (the 40 × 40 county is, tests/browser/county-map.test.ts).
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import { basename } from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import type { Page } from 'playwright-core';
import { importSchema } from '../../../shared/api/imports';
import { planSchema } from '../../../shared/api/plans';
import { runWithResultSchema } from '../../../shared/api/runs';
import { demoAccounts } from '../../../server/seed/demo-accounts';
import { launchChromium } from '../../browser/support/chromium';
import { signInThroughForm } from '../../browser/support/sign-in-form';
import { startBenchStack, type BenchStack } from '../http/bench-stack';
import { FULL_COUNTY } from './county';
import { DEFAULT_COUNTY_DIR, writeCountyFiles } from './generate';

const root = fileURLToPath(new URL('../../../', import.meta.url));
const out = `${root}tests/output/county-browser/`;
const { values } = parseArgs({
  options: {
    size: { type: 'string', default: String(FULL_COUNTY.size) },
    'step-seconds': { type: 'string', default: '300' },
    'no-run': { type: 'boolean', default: false },
  },
});
const spec = { ...FULL_COUNTY, size: Number(values.size) };
const withRun = !values['no-run'];
mkdirSync(out, { recursive: true });
const say = (s: string) => process.stderr.write(`[county:browser] ${new Date().toISOString().slice(11, 19)} ${s}\n`);
const loadAverage = () => os.loadavg().map((x) => x.toFixed(2)).join(' ');

type TileLoad = { zoom: number; status: number; bytes: number };
type View = { name: string; seconds: number; tiles: number; tileBytes: number; zooms: number[]; failed: number; screenshot: string };

/** Waits until the workspace map says its road tiles are drawn (the attributes the map keeps). */
async function tilesDrawn(page: Page): Promise<void> {
  await page.locator('[data-test="workspace-map"][data-roads-busy="false"]:not([data-road-tiles="0"])').waitFor({ timeout: 600_000 });
}

/** Metres per screen pixel, read off the map's scale bar (its label and its width). */
async function metresPerPixel(page: Page): Promise<number> {
  const line = page.locator('.leaflet-control-scale-line').first();
  const [label, width] = [await line.innerText(), (await line.boundingBox())!.width];
  const m = /([\d.]+)\s*(km|m)/.exec(label)!;
  return (Number(m[1]) * (m[2] === 'km' ? 1000 : 1)) / width;
}

let stack: BenchStack | null = null;

async function main(): Promise<void> {
  say(`load average before: ${loadAverage()}`);
  const files = writeCountyFiles(spec, spec.size === FULL_COUNTY.size ? DEFAULT_COUNTY_DIR : `${out}county-${spec.size}/`);
  say(`county written: ${files.features.roads} road features`);
  stack = await startBenchStack({ root, out, logPrefix: 'browser-', worker: true, say });
  const { baseUrl } = stack;
  const browser = await launchChromium({ width: 1366, height: 768 });
  const page = await browser.context.newPage();
  const errors: string[] = [];
  page.on('pageerror', (e) => errors.push(e.message));
  const tiles: TileLoad[] = [];
  page.on('response', (r) => {
    const m = /\/tiles\/(?:roads\/)?(\d+)\/\d+\/\d+/.exec(r.url());
    if (!m) return;
    void r.body().then(
      (b) => tiles.push({ zoom: Number(m[1]), status: r.status(), bytes: b.length }),
      () => tiles.push({ zoom: Number(m[1]), status: r.status(), bytes: 0 }),
    );
  });
  try {
    const planner = demoAccounts.find((a) => a.role === 'planner')!;
    await page.goto(`${baseUrl}/sign-in`);
    await signInThroughForm(page, planner.email, planner.password);
    await page.waitForURL(/\/plans$/);

    // The plan and its files, through the API with the browser's own session.
    const csrf = ((await (await page.request.get(`${baseUrl}/api/auth/session`)).json()) as { csrfToken: string }).csrfToken;
    const headers = { 'x-csrf-token': csrf };
    const created = await page.request.post(`${baseUrl}/api/plans`, { headers, data: { name: 'Quellbrook County (browser look)', description: 'Invented county for the look at full size.' } });
    if (created.status() !== 201) throw new Error(`creating the plan answered ${created.status()}`);
    const planId = planSchema.parse(await created.json()).id;
    const base = `${baseUrl}/api/plans/${planId}`;
    const timings: Record<string, number> = {};
    let segments = 0;
    for (const [kind, file] of [['road-layer', files.roads], ['zones', files.zones], ['shelters', files.shelters]] as const) {
      const t0 = performance.now();
      const answer = await page.request.post(`${base}/imports/${kind}`, {
        headers,
        timeout: 600_000,
        multipart: { file: { name: basename(file), mimeType: 'application/geo+json', buffer: readFileSync(file) }, ...(kind === 'road-layer' ? { name: 'Quellbrook County roads' } : {}) },
      });
      if (answer.status() !== 202) throw new Error(`import ${kind} answered ${answer.status()}: ${await answer.text()}`);
      let job = importSchema.parse(await answer.json());
      while (job.status === 'queued' || job.status === 'running') {
        await new Promise((r) => setTimeout(r, 500));
        job = importSchema.parse(await (await page.request.get(`${base}/imports/${job.id}`)).json());
      }
      if (job.status !== 'succeeded') throw new Error(`import ${kind} ${job.status}: ${JSON.stringify(job.failure)}`);
      timings[`import ${kind} (s)`] = (performance.now() - t0) / 1000;
      if (kind === 'road-layer') segments = Number(job.outcome?.['segments'] ?? 0);
      say(`imported ${kind} in ${timings[`import ${kind} (s)`]!.toFixed(1)} s`);
    }
    if (withRun) {
      const t0 = performance.now();
      const started = await page.request.post(`${base}/runs`, {
        headers,
        data: { parameters: { horizonMinutes: 360, timeStepSeconds: Number(values['step-seconds']), capacityFactor: 1, algorithm: 'auto' } },
      });
      if (started.status() !== 202) throw new Error(`starting the run answered ${started.status()}: ${await started.text()}`);
      const runId = ((await started.json()) as { id: string }).id;
      for (;;) {
        const run = runWithResultSchema.parse(await (await page.request.get(`${base}/runs/${runId}`, { timeout: 600_000 })).json());
        if (run.status === 'succeeded') break;
        if (run.status !== 'queued' && run.status !== 'running') throw new Error(`the run ${run.status}: ${run.failureReason}`);
        await new Promise((r) => setTimeout(r, 2000));
      }
      timings['run (s)'] = (performance.now() - t0) / 1000;
      say(`run finished in ${timings['run (s)']!.toFixed(1)} s`);
    }

    const views: View[] = [];
    const look = async (name: string, act: () => Promise<void>) => {
      tiles.length = 0;
      const t0 = performance.now();
      await act();
      await tilesDrawn(page);
      // Tiles drawn after the map said so (a late one) are counted too.
      await page.waitForTimeout(1000);
      const screenshot = `${out}${name}-1366x768.png`;
      await page.screenshot({ path: screenshot });
      const loaded = tiles.filter((t) => t.status === 200);
      views.push({
        name,
        seconds: (performance.now() - t0) / 1000,
        tiles: loaded.length,
        tileBytes: loaded.reduce((a, t) => a + t.bytes, 0),
        zooms: [...new Set(loaded.map((t) => t.zoom))].sort((a, b) => a - b),
        failed: tiles.length - loaded.length,
        screenshot: basename(screenshot),
      });
      say(`${name}: ${JSON.stringify(views.at(-1))}`);
    };

    // The whole county: the map fits the layer (once the plan has loaded: the scale bar leaves the world view).
    await look('county-whole', async () => {
      await page.goto(`${baseUrl}/plans/${planId}`);
      await page.getByText('Quellbrook County (browser look)').first().waitFor({ timeout: 120_000 });
      await page.waitForFunction(() => /\b\d+\s*(m|km)\b/.test(document.querySelector('.leaflet-control-scale-line')?.textContent ?? '') && !/\d{3,}\s*km/.test(document.querySelector('.leaflet-control-scale-line')?.textContent ?? ''), undefined, { timeout: 120_000 });
      if (withRun) {
        await page.locator('[data-test="tab-findings-button"]').click();
        await page.locator('[data-test="choke-point-row"]').first().waitFor({ timeout: 600_000 });
      }
    });
    // Street zoom: the first choke point (the map zooms to it: the point to click around is the
    // map's centre), or, without a run, the mouse wheel on the east bank beside the shelter nearest
    // the centre (outside the zones, which take a click of their own), until the scale bar reads
    // 100 m or less: the point to click around is where the wheel turned.
    const box = (await page.locator('.leaflet-container').boundingBox())!;
    let anchor = { x: box.x + box.width / 2, y: box.y + box.height / 2 };
    await look('county-street', async () => {
      if (withRun) {
        await page.locator('[data-test="choke-point-row"]').first().click();
        await page.locator('.cutline-choke-popup').waitFor({ timeout: 120_000 });
        return;
      }
      const markers = await Promise.all((await page.locator('.leaflet-marker-icon').all()).map((m) => m.boundingBox()));
      const near = markers.filter((b) => b !== null).sort((a, b) => Math.hypot(a.x - anchor.x, a.y - anchor.y) - Math.hypot(b.x - anchor.x, b.y - anchor.y))[0]!;
      anchor = { x: near.x + near.width / 2 + 40, y: near.y + near.height / 2 };
      await page.mouse.move(anchor.x, anchor.y);
      for (let i = 0; i < 20 && (await metresPerPixel(page)) > 1.5; i++) {
        await page.mouse.wheel(0, -120);
        await page.waitForTimeout(500);
      }
    });
    if (withRun) {
      await page.locator('.cutline-choke-popup .leaflet-popup-close-button').click();
      await page.locator('.cutline-choke-popup').waitFor({ state: 'detached' });
    }

    // A road: the choke point's midpoint is at the centre, half a block from a crossing street
    // (the county's blocks are 100 m): points half a block along and 40 m across are tried in turn;
    // then points 10 m apart along a line 23 m off the centre, which crosses a street every block.
    const t0 = performance.now();
    const centre = anchor;
    const perPixel = await metresPerPixel(page);
    let opened = false;
    const along = Array.from({ length: 13 }, (_, i) => [-60 + i * 10, 23] as const);
    for (const [east, north] of [[-50, -40], [-40, -50], [40, 50], [50, 40], ...along] as const) {
      await page.mouse.click(centre.x + east / perPixel, centre.y - north / perPixel);
      if (await page.locator('[data-test="segment-editor"]').isVisible({ timeout: 3000 }).catch(() => false)) {
        opened = true;
        break;
      }
    }
    if (!opened) throw new Error('no click near the centre opened a road');
    if (withRun) await page.locator('[data-test="segment-load"]').waitFor({ timeout: 60_000 });
    await page.waitForTimeout(500);
    const roadShot = `${out}county-road-popup-1366x768.png`;
    await page.screenshot({ path: roadShot });
    const roadName = await page.locator('[data-test="segment-editor"]').innerText();
    const report = {
      at: new Date().toISOString(),
      county: { size: spec.size, roadFeatures: files.features.roads, segments },
      stepSeconds: withRun ? Number(values['step-seconds']) : null,
      loadAverageAfter: loadAverage(),
      timings,
      views,
      roadPopup: { seconds: (performance.now() - t0) / 1000, firstLines: roadName.split('\n').slice(0, 4), screenshot: basename(roadShot) },
      pageErrors: errors,
    };
    writeFileSync(`${out}results.json`, JSON.stringify(report, null, 2));
    say(JSON.stringify(report, null, 2));
    if (errors.length) throw new Error(`the page reported errors: ${errors.join('; ')}`);
  } finally {
    await browser.close();
  }
}

main()
  .catch((e: unknown) => {
    say(`failed: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}`);
    process.exitCode = 1;
  })
  .finally(async () => {
    await stack?.stop();
  });

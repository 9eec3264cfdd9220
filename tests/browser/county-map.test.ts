// A generated county (tests/bench/county/county.ts, a modest 40 × 40 grid: 3,088 roads) on the
// workspace map: imported through the import jobs and analysed through the API, then opened in
// Chromium at the whole county and at street zoom. Checks that the run's vector tiles load at
// both zooms and that a click on a road opens its figures in the shown run. Screenshots land in
// tests/output/screenshots/county-*.png.
import path from 'node:path';
import { afterAll, beforeAll, expect, it } from 'vitest';
import type { APIRequestContext, BrowserContext, Page } from 'playwright-core';
import { importSchema } from '../../shared/api/imports';
import { planSchema } from '../../shared/api/plans';
import { runWithResultSchema } from '../../shared/api/runs';
import { booleanPointInPolygon, pointToLineDistance, polygonToLine } from '@turf/turf';
import { countyRoads, countyShelters, countyZones, type CountySpec } from '../bench/county/county';
import { signInThroughForm } from './support/sign-in-form';
import { launchChromium, screenshotDir } from './support/chromium';
import { startLiveServer, type LiveServer } from './support/live-server';

const spec: CountySpec = { size: 40, seed: 15 };
let server: LiveServer;
let browser: { context: BrowserContext; close: () => Promise<void> };

beforeAll(async () => {
  server = await startLiveServer();
  browser = await launchChromium({ width: 1366, height: 768 });
});
afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

/** The plan, its three files imported as jobs, and one finished run, through the API. */
async function countyPlan(request: APIRequestContext): Promise<string> {
  const csrf = ((await (await request.get(`${server.url}/api/auth/session`)).json()) as { csrfToken: string }).csrfToken;
  const headers = { 'x-csrf-token': csrf };
  const created = await request.post(`${server.url}/api/plans`, { headers, data: { name: 'Quellbrook County (small)' } });
  expect(created.status()).toBe(201);
  const planId = planSchema.parse(await created.json()).id;
  const base = `${server.url}/api/plans/${planId}`;
  const files = { 'road-layer': countyRoads(spec), zones: countyZones(spec), shelters: countyShelters(spec) };
  for (const [kind, collection] of Object.entries(files)) {
    const answer = await request.post(`${base}/imports/${kind}`, {
      headers,
      multipart: { file: { name: `${kind}.geojson`, mimeType: 'application/geo+json', buffer: Buffer.from(JSON.stringify(collection)) } },
    });
    expect(answer.status()).toBe(202);
    let job = importSchema.parse(await answer.json());
    while (job.status === 'queued' || job.status === 'running') {
      await new Promise((r) => setTimeout(r, 250));
      job = importSchema.parse(await (await request.get(`${base}/imports/${job.id}`)).json());
    }
    expect(job.status, JSON.stringify(job.failure)).toBe('succeeded');
  }
  const started = await request.post(`${base}/runs`, { headers, data: { parameters: { horizonMinutes: 360, timeStepSeconds: 60, capacityFactor: 1, algorithm: 'auto' } } });
  expect(started.status()).toBe(202);
  const runId = ((await started.json()) as { id: string }).id;
  for (;;) {
    const run = runWithResultSchema.parse(await (await request.get(`${base}/runs/${runId}`)).json());
    if (run.status === 'succeeded') break;
    expect(['queued', 'running'], run.failureReason ?? '').toContain(run.status);
    await new Promise((r) => setTimeout(r, 500));
  }
  return planId;
}

/**
 * The midpoint of a secondary street's block (drawn at every zoom the whole county shows) at least
 * 300 m inside a zone, and the centre of the road layer's extent (where the map centres it).
 */
function insideZoneArterialMidpoint(): { lon: number; lat: number; centre: [number, number] } {
  const roads = countyRoads(spec).features.filter((f) => f.properties?.waterway === undefined);
  const xs = roads.flatMap((f) => f.geometry.coordinates.map((c) => c[0]!));
  const ys = roads.flatMap((f) => f.geometry.coordinates.map((c) => c[1]!));
  const centre: [number, number] = [(Math.min(...xs) + Math.max(...xs)) / 2, (Math.min(...ys) + Math.max(...ys)) / 2];
  const zones = countyZones(spec).features;
  for (const road of roads) {
    if (road.properties?.highway !== 'secondary' || road.properties?.bridge) continue;
    const c = road.geometry.coordinates;
    const [a, b] = [c[0]!, c[1]!];
    const mid = [(a[0]! + b[0]!) / 2, (a[1]! + b[1]!) / 2];
    const zone = zones.find((z) => booleanPointInPolygon(mid, z));
    if (zone && pointToLineDistance(mid, polygonToLine(zone) as Parameters<typeof pointToLineDistance>[1], { units: 'meters' }) >= 300) {
      return { lon: mid[0]!, lat: mid[1]!, centre };
    }
  }
  throw new Error('no secondary street deep inside a zone');
}

async function tilesDrawn(page: Page) {
  await page.locator('[data-test="workspace-map"][data-roads-busy="false"]:not([data-road-tiles="0"])').waitFor({ timeout: 60_000 });
}

/** Metres per screen pixel, read off the map's scale bar (its label and its width). */
async function metresPerPixel(page: Page): Promise<number> {
  const line = page.locator('.leaflet-control-scale-line').first();
  const [label, width] = [await line.innerText(), (await line.boundingBox())!.width];
  const m = /([\d.]+)\s*(km|m)/.exec(label)!;
  return (Number(m[1]) * (m[2] === 'km' ? 1000 : 1)) / width;
}

it('shows the county at two zooms from vector tiles, and a clicked road opens its figures', async () => {
  const page = await browser.context.newPage();
  const errors: string[] = [];
  page.on('pageerror', (e) => errors.push(e.message));
  const runTiles: number[] = [];
  page.on('response', (r) => {
    const m = /\/runs\/[0-9a-f-]{36}\/tiles\/(\d+)\/\d+\/\d+/.exec(r.url());
    if (m && r.status() === 200) runTiles.push(Number(m[1]));
  });

  await page.goto(`${server.url}/sign-in`);
  await signInThroughForm(page, 'planner@cutline.example', 'planner-demo-2026');
  await page.waitForURL(/\/plans$/);
  const planId = await countyPlan(page.request);

  // The whole county: the map fits the layer; the run's tiles are drawn.
  await page.goto(`${server.url}/plans/${planId}`);
  await page.locator('[data-test="tab-findings-button"]').click();
  await page.locator('[data-test="choke-point-row"]').first().waitFor({ timeout: 60_000 });
  await tilesDrawn(page);
  await page.waitForTimeout(600);
  const wholeZoom = Math.max(...runTiles);
  expect(runTiles.length).toBeGreaterThan(0);
  await page.screenshot({ path: path.join(screenshotDir, 'county-whole-1366x768.png') });

  // Street zoom: the first choke point in the table; the map zooms to it.
  runTiles.length = 0;
  await page.locator('[data-test="choke-point-row"]').first().click();
  await page.locator('.cutline-choke-popup').waitFor();
  await tilesDrawn(page);
  await page.waitForTimeout(600);
  expect(runTiles.length).toBeGreaterThan(0);
  expect(Math.min(...runTiles)).toBeGreaterThan(wholeZoom);
  await page.screenshot({ path: path.join(screenshotDir, 'county-street-1366x768.png') });
  await page.locator('.cutline-choke-popup .leaflet-popup-close-button').click();
  await page.locator('.cutline-choke-popup').waitFor({ state: 'detached' });

  // The choke point's midpoint is at the map's centre, half a block from a crossing street: a
  // point half a block along and 40 m across lies on that street whichever way the choke point
  // runs (the county's blocks are 100 m; tried in turn until a road answers).
  const box = (await page.locator('.leaflet-container').boundingBox())!;
  const centre = { x: box.x + box.width / 2, y: box.y + box.height / 2 };
  const perPixel = await metresPerPixel(page);
  const offsets = [[-50, -40], [-40, -50], [40, 50], [50, 40]] as const;
  for (const [east, north] of offsets) {
    await page.mouse.click(centre.x + east / perPixel, centre.y - north / perPixel);
    if (await page.locator('[data-test="segment-editor"]').isVisible({ timeout: 1500 }).catch(() => false)) break;
  }
  await page.locator('[data-test="segment-editor"]').waitFor();
  const figures = page.locator('[data-test="segment-load"]');
  await figures.waitFor();
  expect(await figures.innerText()).toMatch(/veh\/h/);
  await page.waitForTimeout(300);
  await page.screenshot({ path: path.join(screenshotDir, 'county-road-figures-1366x768.png') });

  // A road inside a zone: the click picks the road alone, not also the zone drawn under it (whose
  // editor would then cover the road's). The whole county again, and the middle of an arterial
  // street deep inside a zone, placed on screen from the map's centre and its scale bar.
  await page.goto(`${server.url}/plans/${planId}`);
  await tilesDrawn(page);
  await page.waitForTimeout(600);
  const inside = insideZoneArterialMidpoint();
  const whole = (await page.locator('.leaflet-container').boundingBox())!;
  const wholePerPixel = await metresPerPixel(page);
  const R = 6_371_000; // Leaflet's Earth radius (L.CRS.Earth.R), as its scale bar measures
  const rad = Math.PI / 180;
  const [east, north] = [(inside.lon - inside.centre[0]) * rad * R * Math.cos(inside.centre[1] * rad), (inside.lat - inside.centre[1]) * rad * R];
  await page.mouse.click(whole.x + whole.width / 2 + east / wholePerPixel, whole.y + whole.height / 2 - north / wholePerPixel);
  await page.locator('[data-test="segment-editor"]').waitFor();
  await page.waitForTimeout(800);
  expect(await page.locator('[data-test="zone-form"]').isVisible()).toBe(false);
  expect(await page.locator('[data-test="segment-editor"]').isVisible()).toBe(true);
  await page.screenshot({ path: path.join(screenshotDir, 'county-road-in-zone-1366x768.png') });

  expect(errors).toEqual([]);
});

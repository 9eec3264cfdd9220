// The main path in Chromium: the demo planner opens the demo plan, uploads a road file, draws an
// evacuation zone and places a shelter on the map, analyses, and sees evacuees per hour and the
// choke points on the map. Screenshots before and after the run at 1366×768 and 1920×1080.
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { signInThroughForm } from './support/sign-in-form';
import { launchChromium, screenshotDir } from './support/chromium';
import { startLiveServer, type LiveServer } from './support/live-server';

let server: LiveServer;
let browser: { context: BrowserContext; close: () => Promise<void> };
const sizes = [
  { width: 1366, height: 768 },
  { width: 1920, height: 1080 },
];

beforeAll(async () => {
  server = await startLiveServer();
  browser = await launchChromium(sizes[0]);
});
afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

async function shoot(page: Page, name: string) {
  for (const size of sizes) {
    await page.setViewportSize(size);
    // Leaflet redraws on resize; give the canvas a moment.
    await page.waitForTimeout(700);
    await page.screenshot({ path: path.join(screenshotDir, `${name}-${size.width}x${size.height}.png`) });
  }
  await page.setViewportSize(sizes[0]!);
  await page.waitForTimeout(500);
}

/** Waits until the road tiles in view are drawn. */
async function roadTilesDrawn(page: Page) {
  await page.locator('[data-test="workspace-map"][data-roads-busy="false"]:not([data-road-tiles="0"])').waitFor();
}

/** A point on the map at a share of its width and height. */
async function mapPoint(page: Page, x: number, y: number) {
  const box = (await page.locator('.leaflet-container').boundingBox())!;
  return { x: box.x + box.width * x, y: box.y + box.height * y };
}

it('goes from the plans list to choke points on the map', async () => {
  const page = await browser.context.newPage();
  const errors: string[] = [];
  page.on('pageerror', (e) => errors.push(e.message));

  await page.goto(`${server.url}/sign-in`);
  await signInThroughForm(page, 'planner@cutline.example', 'planner-demo-2026');
  await page.waitForURL(/\/plans$/);
  await page.locator('[data-test="plan-card"]', { hasText: 'Veltmoor river crossings' }).click();
  await page.waitForURL(/\/plans\/[0-9a-f-]{36}$/);
  await page.locator('[data-test="side-panel"]').waitFor();
  expect(await page.locator('[data-test="page-title"]').innerText()).toBe('Veltmoor river crossings');

  // Upload a road file (the town's roads under a new name): the report replaces the old one.
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'cutline-roads-'));
  const roadFile = path.join(dir, 'veltmoor-roads-upload.geojson');
  fs.copyFileSync(path.resolve(import.meta.dirname, '../../server/seed/demo-town/roads.geojson'), roadFile);
  await page.locator('[data-test="tab-roads-button"]').click();
  await page.locator('[data-test="road-file"]').setInputFiles(roadFile);
  // The field-mapping step: an OSM-tagged GeoJSON needs no mapping; import as it is.
  await page.locator('[data-test="field-mapping-import"]:not([disabled])').click();
  await page.locator('[data-test="tab-roads"] h2', { hasText: 'veltmoor-roads-upload.geojson' }).waitFor();
  expect(await page.locator('[data-test="import-report"]').innerText()).toMatch(/[\d,]+ segments and [\d,]+ junctions/);
  await roadTilesDrawn(page);

  // Draw a zone on the west bank: four corners, then the first again to close it.
  await page.locator('[data-test="draw-zone"]').click();
  await page.locator('[data-test="drawing-hint"]').waitFor();
  const corners = [
    [0.2, 0.36],
    [0.3, 0.36],
    [0.3, 0.5],
    [0.2, 0.5],
    [0.2, 0.36],
  ] as const;
  for (const [x, y] of corners) {
    const p = await mapPoint(page, x, y);
    await page.mouse.click(p.x, p.y);
    await page.waitForTimeout(150);
  }
  await page.locator('[data-test="zone-form"]').waitFor();
  await page.locator('[data-test="zone-name"] input').fill('Drawn zone');
  await page.locator('[data-test="zone-population"] input').fill('2400');
  expect(await page.locator('[data-test="zone-vehicles"]').innerText()).toMatch(/About [\d,]+ vehicles/);
  await page.locator('[data-test="zone-save"]').click();
  await page.locator('[data-test="zone-item"]', { hasText: 'Drawn zone' }).waitFor();

  // Place a shelter on the east bank.
  await page.locator('[data-test="place-shelter"]').click();
  const at = await mapPoint(page, 0.62, 0.42);
  await page.mouse.click(at.x, at.y);
  await page.locator('[data-test="shelter-form"]').waitFor();
  await page.locator('[data-test="shelter-name"] input').fill('Drawn shelter');
  await page.locator('[data-test="shelter-capacity"] input').fill('4000');
  await page.locator('[data-test="shelter-save"]').click();
  await page.locator('[data-test="shelter-item"]', { hasText: 'Drawn shelter' }).waitFor();
  await page.locator('[data-test="shelter-item"]', { hasText: 'Drawn shelter' }).getByText(/Reached from junction/).waitFor();

  await page.locator('[data-test="tab-assumptions-button"]').click();
  // The class defaults with their sources; a changed value is refused until its source changes.
  await page.locator('[data-test="capacity-row-residential"]').getByText('Capacity:').waitFor();
  await page.locator('[data-test="capacity-edit-residential"]').click();
  await page.locator('[data-test="capacity-capacity"] input').fill('650');
  await page.locator('[data-test="capacity-save"]').click();
  await page.getByText('The value changed: say where the new one comes from.').waitFor();
  await page.locator('[data-test="capacity-capacity-source"] input').fill('Veltmoor street counts, 2026 (demo)');
  await page.locator('[data-test="capacity-save"]').click();
  await page.locator('[data-test="capacity-row-dialog"]').waitFor({ state: 'detached' });
  await page.locator('[data-test="capacity-row-residential"]').getByText('Veltmoor street counts, 2026 (demo)').waitFor();
  await page.locator('[data-test="capacity-history-toggle"]').click();
  await page.locator('[data-test="capacity-history"]').getByText(/lane capacity 600 veh\/h\/lane → 650 veh\/h\/lane/).waitFor();
  await shoot(page, 'workspace-before-run');

  // Analyse, follow the progress, read the findings.
  await page.locator('[data-test="analyse"]').click();
  await page.locator('[data-test="headline-throughput"]').waitFor({ timeout: 90_000 });
  const throughput = Number((await page.locator('[data-test="headline-throughput"] [data-test="headline-value"]').innerText()).replace(/ persons\/h$/, '').replaceAll(',', ''));
  expect(throughput).toBeGreaterThan(0);
  expect(await page.locator('[data-test="caution"]').innerText()).toContain("emergency operations plan");
  expect(await page.locator('[data-test="choke-point-row"]').count()).toBeGreaterThan(0);
  // Choke points are drawn on their own SVG pane, over the canvas roads (a straight bridge is a
  // path with no height, which Playwright calls hidden: wait for it to be there, then check it).
  const chokePaths = page.locator('.leaflet-cutline-choke-points-pane path.cutline-choke-point');
  await chokePaths.first().waitFor({ state: 'attached' });
  expect(await chokePaths.count()).toBeGreaterThan(0);
  expect(await chokePaths.first().getAttribute('stroke')).toBe('#4a1d7a');
  expect(await chokePaths.first().getAttribute('d')).toMatch(/^M-?\d+ -?\d+L/);
  await shoot(page, 'workspace-after-run');
  // What holds arrivals down, in words and parts that add up to the whole.
  const limits = page.locator('[data-test="arrival-limits"]');
  await limits.scrollIntoViewIfNeeded();
  expect(await page.locator('[data-test="arrival-limits-summary"]').innerText()).toMatch(/at most [\d,]+ vehicles can have arrived\. What holds that number down: /);
  expect(await limits.locator('[data-test^="arrival-limit-"]').count()).toBeGreaterThan(0);
  await page.screenshot({ path: path.join(screenshotDir, 'workspace-arrival-limits-1366x768.png') });

  // The downloads answer with the run's arcs, choke points and curve, and every table in one GeoPackage or KML.
  await page.locator('[data-test="exports"]').scrollIntoViewIfNeeded();
  await page.screenshot({ path: path.join(screenshotDir, 'workspace-run-files-1366x768.png') });
  for (const [file, type] of [
    ['arcs.geojson', 'geo+json'],
    ['choke-points.csv', 'text/csv'],
    ['curve.csv', 'text/csv'],
    ['results.gpkg', 'application/geopackage+sqlite3'],
    ['results.kml', 'application/vnd.google-earth.kml+xml'],
  ] as const) {
    const href = await page.locator(`[data-test="run-file-${file}"]`).getAttribute('href');
    const answer = await page.request.get(`${server.url}${href}`);
    expect(answer.status()).toBe(200);
    expect(answer.headers()['content-type']).toContain(type);
  }

  // The first choke point in the table: the map zooms to it and opens its figures.
  await page.locator('[data-test="choke-point-row"]').first().click();
  const popup = page.locator('.cutline-choke-popup');
  await popup.waitFor();
  expect(await popup.innerText()).toContain('Share of the limiting capacity');
  // Let the popup finish fading in.
  await page.waitForTimeout(400);
  await page.screenshot({ path: path.join(screenshotDir, 'workspace-choke-point-1366x768.png') });

  expect(errors).toEqual([]);
});

it('shows no basemap by default, and the tile layer with its attribution once an admin sets one', async () => {
  await browser.context.clearCookies();
  const page = await browser.context.newPage();
  await page.goto(`${server.url}/sign-in`);
  await signInThroughForm(page, 'admin@cutline.example', 'admin-demo-2026');
  await page.waitForURL(/\/plans$/);

  await page.locator('[data-test="plan-card"]', { hasText: 'Veltmoor river crossings' }).click();
  await roadTilesDrawn(page);
  expect(await page.locator('.leaflet-tile-pane img').count()).toBe(0);
  expect(await page.locator('.leaflet-control-scale').count()).toBe(1);

  // Tiles from a port nothing listens on: the layer and attribution appear, the images fail.
  await page.goto(`${server.url}/admin/map`);
  await page.locator('[data-test="map-settings-form"]').waitFor();
  await page.locator('[data-test="tile-url"] input').fill('http://127.0.0.1:9/{z}/{x}/{y}.png');
  await page.getByLabel('Attribution').fill('Test tiles');
  await page.locator('[data-test="map-settings-form"]').getByRole('button', { name: 'Save' }).click();
  await page.getByText('Saved.').waitFor();
  await page.goto(`${server.url}/plans`);
  await page.locator('[data-test="plan-card"]', { hasText: 'Veltmoor river crossings' }).click();
  await page.locator('.leaflet-tile-pane img').first().waitFor({ state: 'attached' });
  expect(await page.locator('.leaflet-control-attribution').innerText()).toContain('Test tiles');

  await page.goto(`${server.url}/admin/map`);
  await page.locator('[data-test="map-settings-form"]').waitFor();
  expect(await page.locator('[data-test="tile-url"] input').inputValue()).toBe('http://127.0.0.1:9/{z}/{x}/{y}.png');
  await page.locator('[data-test="tile-url"] input').fill('');
  await page.getByLabel('Attribution').fill('');
  await page.locator('[data-test="map-settings-form"]').getByRole('button', { name: 'Save' }).click();
  await page.getByText('Saved. Maps opened from now on use no basemap.').waitFor();

  // US customary: the scale bar in feet and miles only, road lengths and speeds in the table too.
  await page.locator('[data-test="unit-system-us-customary"] input').check();
  await page.locator('[data-test="time-zone"] input').fill('America/Chicago');
  await page.locator('[data-test="organization-settings-save"]').click();
  await page.locator('[data-test="organization-settings-saved"]').waitFor();
  expect(await page.locator('[data-test="organization-settings-saved"]').innerText()).toContain('America/Chicago');
  await page.goto(`${server.url}/plans`);
  await page.locator('[data-test="plan-card"]', { hasText: 'Veltmoor river crossings' }).click();
  await roadTilesDrawn(page);
  const scaleLines = page.locator('.leaflet-control-scale-line');
  expect(await scaleLines.count()).toBe(1);
  expect(await scaleLines.first().innerText()).toMatch(/\d+ (ft|mi)$/);
  await page.goto(`${server.url}/admin/map`);
  await page.locator('[data-test="unit-system-metric"] input').check();
  await page.locator('[data-test="time-zone"] input').fill('');
  await page.locator('[data-test="organization-settings-save"]').click();
  await page.locator('[data-test="organization-settings-saved"]').waitFor();
});

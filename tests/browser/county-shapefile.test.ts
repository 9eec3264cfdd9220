// A county's own road file through the upload dialog: the West Oakland OpenStreetMap extract
// (tests/fixtures/osm, an open dataset) written by GDAL's ogr2ogr (Debian's gdal-bin, the outside
// reference) as a zipped Shapefile in EPSG:2227 (California zone III, US survey feet) with
// county-style column names and class codes. The planner maps the columns and the codes, sees the
// preview, saves the choices, imports, adds a zone and a shelter, and runs. Screenshots land in
// tests/output/screenshots/county-shapefile-*.png.
import { join } from 'node:path';
import { writeFileSync } from 'node:fs';
import { afterAll, beforeAll, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { importSchema } from '../../shared/api/imports';
import { planSchema } from '../../shared/api/plans';
import { tool, westOaklandWorkspace, zipFolder } from '../shared/gis/reference-tools';
import { signInThroughForm } from './support/sign-in-form';
import { launchChromium, screenshotDir } from './support/chromium';
import { startLiveServer, type LiveServer } from './support/live-server';

let server: LiveServer;
let browser: Awaited<ReturnType<typeof launchChromium>>;
let shapefileZip: string;

beforeAll(async () => {
  server = await startLiveServer();
  browser = await launchChromium({ width: 1366, height: 900 });
  const w = westOaklandWorkspace();
  const dir = join(w.dir, 'shp');
  // County-style names and codes, as a county's centreline file has them (invented codes).
  const sql =
    "SELECT geometry, CASE highway WHEN 'primary' THEN 'ART1' WHEN 'secondary' THEN 'ART2' WHEN 'tertiary' THEN 'COL' WHEN 'residential' THEN 'LOC' WHEN 'service' THEN 'SVC' ELSE 'OTH' END AS RD_CLASS, " +
    "name AS FULLNAME, lanes AS NUM_LANES, CASE oneway WHEN 'yes' THEN 'F' WHEN '-1' THEN 'T' ELSE 'B' END AS ONE_WAY FROM lines WHERE highway IS NOT NULL";
  tool('ogr2ogr', ['-q', '-f', 'ESRI Shapefile', '-lco', 'ENCODING=UTF-8', '-t_srs', 'EPSG:2227', '-dialect', 'SQLite', '-sql', sql, '-nln', 'county_centerlines', dir, w.osm], { env: w.env });
  shapefileZip = join(w.dir, 'county_centerlines.zip');
  writeFileSync(shapefileZip, zipFolder(dir));
}, 120_000);
afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

/** Picks an option of a Vuetify select inside `scope`. */
async function choose(page: Page, scope: string, option: string) {
  await page.locator(`${scope} .v-field`).first().click();
  await page.locator('.v-overlay--active .v-list-item', { hasText: option }).first().click();
  await page.locator('.v-overlay--active .v-list').first().waitFor({ state: 'detached' }).catch(() => undefined);
}

it('maps a state-plane Shapefile with county columns, previews, imports and runs', async () => {
  const page = await browser.context.newPage();
  const errors: string[] = [];
  page.on('pageerror', (e) => errors.push(e.message));
  await page.goto(`${server.url}/sign-in`);
  await signInThroughForm(page, 'planner@cutline.example', 'planner-demo-2026');
  await page.waitForURL(/\/plans$/);

  const request = page.context().request;
  const csrf = ((await (await request.get(`${server.url}/api/auth/session`)).json()) as { csrfToken: string }).csrfToken;
  const headers = { 'x-csrf-token': csrf };
  const created = await request.post(`${server.url}/api/plans`, { headers, data: { name: 'Harbour district centrelines' } });
  expect(created.status()).toBe(201);
  const planId = planSchema.parse(await created.json()).id;
  await page.goto(`${server.url}/plans/${planId}`);
  await page.locator('[data-test="side-panel"]').waitFor();

  // Choose the file: the dialog shows what the server read, in the file's own CRS.
  await page.locator('[data-test="road-file"]').setInputFiles(shapefileZip);
  const dialog = page.locator('[data-test="field-mapping"]');
  await dialog.locator('[data-test="field-mapping-summary"]').waitFor({ timeout: 90_000 });
  const summary = await dialog.locator('[data-test="field-mapping-summary"]').innerText();
  expect(summary).toContain('shapefile');
  expect(summary).toMatch(/31 features/);
  expect(summary).toContain('California');
  // Before the county's codes are mapped, nothing is a class Cutline knows.
  expect(await dialog.locator('[data-test="field-mapping-outcome"]').innerText()).toMatch(/^0 of 31 kept/);

  // The columns were guessed from their names; the class codes get the value table.
  expect(await dialog.locator('[data-test="map-roadClass"]').innerText()).toContain('RD_CLASS');
  expect(await dialog.locator('[data-test="map-lanes"]').innerText()).toContain('NUM_LANES');
  for (const [code, label] of [['ART2', 'Secondary road'], ['LOC', 'Residential street'], ['SVC', 'Service road'], ['OTH', 'Leave out']] as const) {
    await choose(page, `[data-test="class-value-${code}"]`, label);
  }
  await choose(page, '[data-test="oneway-value-F"]', 'One-way, in drawing direction');
  await choose(page, '[data-test="oneway-value-B"]', 'Both ways');
  const outcome = await dialog.locator('[data-test="field-mapping-outcome"]').innerText();
  expect(outcome).toMatch(/^20 of 31 kept/);
  expect(outcome).toContain('11 left out: a class value the table does not map');
  // The preview map draws the first features (on its canvas; the map says how many).
  await page.locator('[data-test="field-mapping-map"][data-drawn="31"]').waitFor();
  await page.waitForTimeout(500);

  // Saved for next year's file.
  await dialog.locator('[data-test="mapping-preset-name"] input').fill('County centrelines');
  await dialog.locator('[data-test="mapping-preset-save"]').click();
  await dialog.locator('[data-test="mapping-preset-message"]', { hasText: 'Saved as' }).waitFor();
  await page.screenshot({ path: join(screenshotDir, 'county-shapefile-mapping-1366x900.png') });

  await dialog.locator('[data-test="field-mapping-import"]').click();
  await page.locator('[data-test="tab-roads"] h2', { hasText: 'county_centerlines.zip' }).waitFor({ timeout: 120_000 });
  expect(await page.locator('[data-test="import-report"]').innerText()).toMatch(/[\d,]+ segments and [\d,]+ junctions/);

  // A zone in the west of the district and a shelter in the east, through the import jobs.
  const base = `${server.url}/api/plans/${planId}`;
  const files = {
    zones: { type: 'FeatureCollection', features: [{ type: 'Feature', properties: { name: 'Lower Wharf', population: 800 }, geometry: { type: 'Polygon', coordinates: [[[-122.3024, 37.8064], [-122.3010, 37.8064], [-122.3010, 37.8078], [-122.3024, 37.8078], [-122.3024, 37.8064]]] } }] },
    shelters: { type: 'FeatureCollection', features: [{ type: 'Feature', properties: { name: 'Ropewalk Hall', capacityPersons: 1500 }, geometry: { type: 'Point', coordinates: [-122.2985, 37.8085] } }] },
  };
  for (const [kind, collection] of Object.entries(files)) {
    const answer = await request.post(`${base}/imports/${kind}`, { headers, multipart: { file: { name: `${kind}.geojson`, mimeType: 'application/geo+json', buffer: Buffer.from(JSON.stringify(collection)) } } });
    expect(answer.status()).toBe(202);
    let job = importSchema.parse(await answer.json());
    while (job.status === 'queued' || job.status === 'running') {
      await new Promise((r) => setTimeout(r, 250));
      job = importSchema.parse(await (await request.get(`${base}/imports/${job.id}`)).json());
    }
    expect(job.status, JSON.stringify(job.failure)).toBe('succeeded');
  }
  await page.reload();
  await page.locator('[data-test="analyse"]').click();
  await page.locator('[data-test="headline-throughput"]').waitFor({ timeout: 120_000 });
  const throughput = Number((await page.locator('[data-test="headline-throughput"] [data-test="headline-value"]').innerText()).replace(/ persons\/h$/, '').replaceAll(',', ''));
  expect(throughput).toBeGreaterThan(0);
  await page.screenshot({ path: join(screenshotDir, 'county-shapefile-run-1366x900.png') });

  // The next file with the same columns gets the saved choices at once.
  await page.locator('[data-test="tab-roads-button"]').click();
  await page.locator('[data-test="road-file"]').setInputFiles(shapefileZip);
  await dialog.locator('[data-test="mapping-preset-applied"]', { hasText: 'County centrelines' }).waitFor({ timeout: 90_000 });
  expect(await dialog.locator('[data-test="field-mapping-outcome"]').innerText()).toMatch(/^20 of 31 kept/);
  await dialog.locator('[data-test="field-mapping-cancel"]').click();
  expect(errors).toEqual([]);
}, 420_000);

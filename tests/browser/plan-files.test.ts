// The plan's inputs leave from the Roads tab: a planner opens the demo plan and finds the
// GeoPackage, Shapefile and GeoJSON downloads under the road layer; each link answers with its
// file and type. Screenshot of the section at 1366×768.
import path from 'node:path';
import { afterAll, beforeAll, expect, it } from 'vitest';
import type { BrowserContext } from 'playwright-core';
import { signInThroughForm } from './support/sign-in-form';
import { launchChromium, screenshotDir } from './support/chromium';
import { startLiveServer, type LiveServer } from './support/live-server';

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

it('offers the plan as GeoPackage, Shapefiles and GeoJSON under the road layer', async () => {
  const page = await browser.context.newPage();
  const errors: string[] = [];
  page.on('pageerror', (e) => errors.push(e.message));
  await page.goto(`${server.url}/sign-in`);
  await signInThroughForm(page, 'planner@cutline.example', 'planner-demo-2026');
  await page.waitForURL(/\/plans$/);
  await page.locator('[data-test="plan-card"]', { hasText: 'Veltmoor river crossings' }).click();
  await page.waitForURL(/\/plans\/[0-9a-f-]{36}$/);
  await page.locator('[data-test="tab-roads-button"]').click();
  const section = page.locator('[data-test="plan-files"]');
  await section.scrollIntoViewIfNeeded();
  expect(await section.innerText()).toContain('Take the plan out');
  await page.waitForTimeout(400);
  await page.screenshot({ path: path.join(screenshotDir, 'workspace-plan-files-1366x768.png') });

  for (const [file, type] of [
    ['plan-inputs.gpkg', 'application/geopackage+sqlite3'],
    ['plan-inputs.zip', 'application/zip'],
    ['roads.geojson', 'application/geo+json'],
    ['zones.geojson', 'application/geo+json'],
    ['shelters.geojson', 'application/geo+json'],
  ] as const) {
    const link = page.locator(`[data-test="plan-file-${file}"]`);
    expect(await link.getAttribute('download')).toBe(file);
    const answer = await page.request.get(`${server.url}${await link.getAttribute('href')}`);
    expect(answer.status()).toBe(200);
    expect(answer.headers()['content-type']).toContain(type);
    expect(answer.headers()['content-disposition']).toContain(file);
  }
  const roads = JSON.parse((await (await page.request.get(`${server.url}${await page.locator('[data-test="plan-file-roads.geojson"]').getAttribute('href')}`)).body()).toString('utf8'));
  expect(roads.cutline.caution).toMatch(/^A planning aid, not an order\./);
  expect(roads.features.length).toBeGreaterThan(0);
  expect(errors).toEqual([]);
});

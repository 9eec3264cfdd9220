// From a search to a compared scenario, in Chromium: the demo planner analyses the demo town,
// asks the Findings tab which roads to run one way, reads the answer with its caution, saves it
// as a scenario and lands on the comparison once the saved scenario's run has finished.
// The demo town's static cut is its four bridges, 2,000 + 2,000 + 850 + 750 = 5,600 veh/h
// (server/seed/demo-town/README.md); running every bridge one way outbound pools both
// carriageways, so the best contraflow doubles it to 11,200 veh/h (the same figure the
// brute force over every orientation reaches in tests/server/proposals.test.ts).
// Screenshots at 1366×768 in tests/output/screenshots.
import path from 'node:path';
import { afterAll, beforeAll, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { signInThroughForm } from './support/sign-in-form';
import { launchChromium, screenshotDir } from './support/chromium';
import { startLiveServer, type LiveServer } from './support/live-server';

let server: LiveServer;
let browser: { context: BrowserContext; close: () => Promise<void> };
let page: Page;
const errors: string[] = [];

beforeAll(async () => {
  server = await startLiveServer();
  browser = await launchChromium({ width: 1366, height: 768 });
  page = await browser.context.newPage();
  page.on('pageerror', (e) => errors.push(e.message));
}, 120_000);
afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

async function shoot(name: string) {
  await page.waitForTimeout(600);
  await page.screenshot({ path: path.join(screenshotDir, `${name}-1366x768.png`) });
}

it('searches for the best contraflow, saves the answer as a scenario and compares it with the plan', { timeout: 400_000 }, async () => {
  await page.goto(`${server.url}/sign-in`);
  await signInThroughForm(page, 'planner@cutline.example', 'planner-demo-2026');
  await page.waitForURL(/\/plans$/);
  await page.locator('[data-test="plan-card"]', { hasText: 'Veltmoor river crossings' }).click();
  await page.waitForURL(/\/plans\/[0-9a-f-]{36}$/);
  await page.locator('[data-test="side-panel"]').waitFor();

  // A short horizon and a coarse step keep the runs and the search quick; the steady state does not depend on them.
  await page.locator('[data-test="tab-assumptions-button"]').click();
  await page.locator('[data-test="param-horizon"] input').fill('120');
  await page.locator('[data-test="param-step"] input').fill('120');
  await page.locator('[data-test="analyse"]').click();
  await page.locator('[data-test="headline-throughput"]').waitFor({ timeout: 180_000 });

  // The search, from the Findings tab.
  const searches = page.locator('[data-test="findings-searches"]');
  await searches.scrollIntoViewIfNeeded();
  await page.locator('[data-test="search-start"]').click();
  const summary = page.locator('[data-test="search-answer"] [data-test="search-summary"]');
  await summary.waitFor({ timeout: 180_000 });
  expect(await summary.innerText()).toMatch(/raises evacuees per hour from 5,600 veh\/h to 11,200 veh\/h\s+— the most any choice of one-way roads can carry/);
  // The answer carries the optimum-is-not-a-plan sentence.
  expect(await page.locator('[data-test="search-answer"]').innerText()).toContain('A mathematical optimum under the stated assumptions is not an operational plan');
  expect(await page.locator('[data-test="search-answer"] tbody tr').count()).toBeGreaterThan(0);
  // The answer on the map, as the scenario it would save: corridor roads with their one-way arrows.
  await page.locator('.cutline-corridor-arrow').first().waitFor({ state: 'attached' });
  expect(await page.locator('.cutline-corridor-arrow').count()).toBeGreaterThan(0);
  expect(await page.locator('path.cutline-scenario-corridor').count()).toBeGreaterThan(0);
  await page.locator('[data-test="search-save-compare"]').scrollIntoViewIfNeeded();
  await shoot('findings-search-contraflow');

  // Save it as a scenario: its run starts at once and the comparison fills in when it ends.
  await page.locator('[data-test="search-save-compare"]').click();
  await page.waitForURL(/\/compare\?runs=/);
  await page.locator('[data-test="comparison-table"]').waitFor({ timeout: 180_000 });
  const header = await page.locator('[data-test="comparison-table"] thead').innerText();
  expect(header).toContain('Roads to run one way, outbound');
  // The saved scenario is named with the briefing's date format, not a numeric stamp.
  expect(header).not.toMatch(/\d+\/\d+\/\d+/);
  const vehicles = page.locator('[data-test="figure-steadyStateVehiclesPerHour"]');
  expect(await vehicles.innerText()).toContain('5,600 veh/h');
  expect(await vehicles.innerText()).toContain('11,200 veh/h');
  expect(await vehicles.locator('[data-test="difference"]').innerText()).toBe('+5,600 veh/h');
  await page.locator('[data-test="caution"]').waitFor();
  await page.locator('[data-test="comparison-map"]:not([data-drawn="0"])').waitFor();
  // Both runs are compared now: neither the still-working note nor the left-out note remains.
  expect(await page.locator('[data-test="comparison-working"], [data-test="comparison-left-out"]').count()).toBe(0);
  await shoot('search-scenario-comparison');

  expect(errors).toEqual([]);
});

async function searchFor(kind: string) {
  await page.locator('[data-test="search-kind"]').click();
  await page.locator('.v-overlay .v-list-item', { hasText: kind }).click();
  await page.locator('[data-test="search-start"]').click();
}

it('draws where each zone goes and the quickest departure order on the map, and exports the routes', { timeout: 400_000 }, async () => {
  // Back in the workspace, on the analysis the searches start from.
  await page.goBack();
  await page.waitForURL(/\/plans\/[0-9a-f-]{36}$/);
  await page.locator('[data-test="headline-throughput"]').waitFor({ timeout: 180_000 });
  await page.locator('[data-test="findings-searches"]').scrollIntoViewIfNeeded();

  await searchFor('Where each zone goes');
  const table = page.locator('[data-test="search-answer"] [data-test="zone-routes"]');
  await table.waitFor({ timeout: 180_000 });
  const zones = await table.locator('tbody tr').count();
  expect(zones).toBe(6);
  // Each zone's corridors on the map in its colour, and a label at each zone naming where it goes.
  await page.locator('path.cutline-zone-route').first().waitFor({ state: 'attached', timeout: 30_000 });
  const drawn = await page.locator('path.cutline-zone-route').count();
  expect(drawn).toBeGreaterThan(0);
  expect(drawn).toBe(Number(await page.locator('[data-test="workspace-map"]').getAttribute('data-zone-routes')));
  // A redraw (roads' geometry arriving) leaves the old labels in the page for Leaflet's 200 ms
  // fade, so the count is read once it settles.
  await expect.poll(() => page.locator('.cutline-search-label').count(), { timeout: 10_000 }).toBe(zones);
  expect(await page.locator('.cutline-search-label').first().innerText()).toContain('→');
  // The key says what is drawn over the utilisation colours.
  expect(await page.locator('[data-test="map-legend-search"]').innerText()).toContain('corridors in the zone’s colour');
  // The export: the cautions above the header, one row per zone and road.
  const href = await page.locator('[data-test="zone-routes-csv"]').getAttribute('href');
  const csv = await (await page.request.get(`${server.url}${href}`)).text();
  expect(csv).toContain('# caution: A planning aid, not an order.');
  expect(csv).toContain('A mathematical optimum under the stated assumptions is not an operational plan');
  expect(csv).toContain('zone_id,zone,zone_vehicles');
  await page.locator('[data-test="zone-routes-csv"]').scrollIntoViewIfNeeded();
  await shoot('findings-search-zone-routes');

  await searchFor('Quickest departure order');
  const order = page.locator('[data-test="search-answer"] [data-test="release-order"]');
  await order.waitFor({ timeout: 180_000 });
  expect(await page.locator('[data-test="search-answer"] [data-test="search-summary"]').innerText()).toMatch(
    /^The roads could clear everyone in .+ if zones left in this order; with the expected departures .+\.$/,
  );
  // The zone routes are gone from the map; each zone now shows its release window.
  await page.locator('.cutline-release-window').first().waitFor({ state: 'attached' });
  expect(await page.locator('path.cutline-zone-route').count()).toBe(0);
  await expect.poll(() => page.locator('.cutline-release-window').count(), { timeout: 10_000 }).toBe(6);
  expect(await page.locator('.cutline-release-window').first().innerText()).toMatch(/^leaves .+\nhalf by /);
  expect(await page.locator('[data-test="map-legend-search"]').innerText()).toContain('release window');
  await shoot('findings-search-release-order');

  expect(errors).toEqual([]);
});

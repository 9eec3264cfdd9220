// Scenarios end to end in Chromium: the demo planner makes a scenario that closes Quay Bridge
// (found with the editor's road search), analyses it, analyses the base plan, and compares the
// two: the steady state drops by the bridge's capacity and the bridge no longer limits. The
// demo town's static cut is its four bridges, 2,000 + 2,000 + 850 + 750 veh/h
// (server/seed/demo-town/README.md, checked in tests/server/scenarios.test.ts), so closing a
// 2,000 veh/h bridge must take exactly 2,000 veh/h off. Then a short capacity sweep.
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
let planId = '';
const errors: string[] = [];

beforeAll(async () => {
  server = await startLiveServer();
  browser = await launchChromium({ width: 1366, height: 768 });
  page = await browser.context.newPage();
  page.on('pageerror', (e) => errors.push(e.message));
  page.on('dialog', (d) => void d.accept());
}, 120_000);
afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

async function shoot(name: string) {
  await page.waitForTimeout(600);
  await page.screenshot({ path: path.join(screenshotDir, `${name}-1366x768.png`) });
}

// A short horizon and a coarse step keep each run quick; the steady state (the static maximum
// flow) does not depend on either.
async function assumptions(within: string) {
  await page.locator(`${within} [data-test="assumption-horizonMinutes"] input`).fill('120');
  await page.locator(`${within} [data-test="assumption-timeStepSeconds"] input`).fill('120');
}

it('closes a bridge in a scenario, runs it and the base plan, and compares them', async () => {
  await page.goto(`${server.url}/sign-in`);
  await signInThroughForm(page, 'planner@cutline.example', 'planner-demo-2026');
  await page.waitForURL(/\/plans$/);
  await page.locator('[data-test="plan-card"]', { hasText: 'Veltmoor river crossings' }).click();
  await page.waitForURL(/\/plans\/[0-9a-f-]{36}$/);
  planId = page.url().split('/').at(-1)!;

  // The scenarios page, then a new scenario: it opens in the editor.
  await page.goto(`${server.url}/plans/${planId}/scenarios`);
  await page.locator('[data-test="scenario-list"]').waitFor();
  await page.locator('[data-test="page-title"]', { hasText: 'Veltmoor river crossings' }).waitFor();
  await page.locator('[data-test="new-scenario-name"] input').fill('Quay Bridge closed');
  await page.locator('[data-test="new-scenario"]').click();
  await page.waitForURL(/\/scenarios\/[0-9a-f-]{36}$/);
  await page.locator('[data-test="scenario-map"]:not([data-roads="0"])').waitFor();

  // Find the bridge by name among the bridges, pick it, close it.
  await page.locator('[data-test="road-search-bridges"] input').check();
  await page.locator('[data-test="road-search-name"] input').fill('Quay');
  await page.locator('[data-test="road-search-result"]', { hasText: 'Quay Bridge' }).first().click();
  await page.locator('[data-test="picked-road-name"]', { hasText: 'Quay Bridge' }).waitFor();
  expect(await page.locator('[data-test="picked-road"]').innerText()).toContain('bridge');
  await page.locator('[data-test="toggle-closure"]').click();
  await page.locator('[data-test="closure-row"]', { hasText: 'Quay Bridge' }).waitFor();
  expect(await page.locator('[data-test="closure-row"]').count()).toBe(1);
  expect(await page.locator('[data-test="scenario-summary"]').innerText()).toBe('1 road closed');
  await page.locator('[data-test="unsaved"]').waitFor();
  await shoot('scenario-editor-bridge-closed');

  // Save, then analyse it from the Run tab.
  await page.locator('[data-test="save-scenario"]').click();
  await page.locator('[data-test="unsaved"]').waitFor({ state: 'detached' });
  await page.locator('[data-test="scenario-tab-run"]').click();
  await assumptions('[data-test="scenario-run"]');
  await page.locator('[data-test="run-scenario"]').click();
  await page.locator('[data-test="scenario-run-status"][data-status="succeeded"]').waitFor({ timeout: 180_000 });
  await page.locator('[data-test="caution"]').first().waitFor();
  await shoot('scenario-editor-run-finished');

  // Analyse the base plan from the scenarios page.
  await page.locator('[aria-label="Back to the scenarios"]').click();
  await page.waitForURL(/\/scenarios$/);
  await page.locator('[data-test="run-row"]').first().waitFor();
  await page.locator('[data-test="run-base"]').click();
  await assumptions('[data-test="run-base-card"]');
  await page.locator('[data-test="run-base-start"]').click();
  await page.locator('[data-test="run-row"][data-scenario="Base plan"][data-status="succeeded"]').waitFor({ timeout: 180_000 });
  await page.locator('[data-test="run-row"][data-scenario="Base plan"] input[type="checkbox"]').check();
  await page.locator('[data-test="run-row"][data-scenario="Quay Bridge closed"] input[type="checkbox"]').check();
  await shoot('scenario-list-runs-picked');
  await page.locator('[data-test="compare-selected"]').click();

  // The comparison: base plan first (the reference), the closed bridge second.
  await page.waitForURL(/\/compare\?runs=/);
  await page.locator('[data-test="comparison-table"]').waitFor();
  const header = await page.locator('[data-test="comparison-table"] thead').innerText();
  expect(header.indexOf('Base plan')).toBeLessThan(header.indexOf('Quay Bridge closed'));
  const vehicles = page.locator('[data-test="figure-steadyStateVehiclesPerHour"]');
  expect(await vehicles.innerText()).toContain('5,600 veh/h');
  expect(await vehicles.locator('[data-test="difference"]').innerText()).toBe('−2,000 veh/h');
  expect(await vehicles.innerText()).toContain('3,600 veh/h');
  const quay = page.locator('[data-test="presence-row"]', { hasText: 'Quay Bridge' });
  expect(await quay.getAttribute('data-change')).toBe('vanishes');
  expect(await quay.innerText()).toContain('No longer limits');
  // The other three bridges still limit in both runs.
  for (const bridge of ['Market Bridge', 'Heron Bridge', 'Mill Bridge']) {
    expect(await page.locator('[data-test="presence-row"]', { hasText: bridge }).first().getAttribute('data-change')).toBe('everywhere');
  }
  await page.locator('[data-test="caution"]').waitFor();
  await page.locator('[data-test="comparison-map"]:not([data-drawn="0"])').waitFor();
  expect(await page.locator('[data-test="presence-legend"]').innerText()).toMatch(/No longer limits \([1-9]\d*\)/);
  await page.waitForTimeout(800);
  await shoot('run-comparison');
  await page.locator('[data-test="comparison-curves"]').scrollIntoViewIfNeeded();
  await shoot('run-comparison-curves');
  expect(errors).toEqual([]);
}, 420_000);

it('sweeps the capacity factor of the bridge scenario and charts the figures', async () => {
  await page.goto(`${server.url}/plans/${planId}/scenarios`);
  await page.locator('[data-test="new-sweep"]').click();
  const dialog = page.locator('[data-test="sweep-dialog"]');
  await dialog.waitFor();
  await page.locator('[data-test="sweep-capacity"] input').check();
  await page.locator('[data-test="sweep-from"] input').fill('0.8');
  await page.locator('[data-test="sweep-to"] input').fill('1');
  await page.locator('[data-test="sweep-step"] input').fill('0.1');
  await page.locator('[data-test="sweep-horizonMinutes"] input').fill('120');
  await page.locator('[data-test="sweep-timeStepSeconds"] input').fill('120');
  expect(await page.locator('[data-test="sweep-preview"]').innerText()).toBe('3 runs: × 0.8, × 0.9, × 1');
  await page.locator('[data-test="sweep-scenario"]').click();
  await page.locator('.v-overlay .v-list-item', { hasText: 'Quay Bridge closed' }).click();
  await page.locator('[data-test="sweep-start"]').click();
  await page.waitForURL(/\/sweeps\/[0-9a-f-]{36}$/);
  await page.locator('[data-test="sweep-table"]').waitFor();
  await page.locator('[data-test="sweep-progress"]').waitFor({ state: 'detached', timeout: 300_000 });
  expect(await page.locator('[data-test="sweep-row"][data-status="succeeded"]').count()).toBe(3);
  // With one 2,000 veh/h bridge closed the cut is 3,600 veh/h; a factor scales every capacity.
  const rows = await page.locator('[data-test="sweep-row"]').allInnerTexts();
  expect(rows[0]).toContain('2,880');
  expect(rows[2]).toContain('3,600');
  await page.locator('[data-test="sweep-chart"]').waitFor();
  await shoot('sweep-sweep');
  expect(errors).toEqual([]);
}, 420_000);

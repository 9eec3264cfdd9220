// Every page of the app, at 1366×768: an axe-core check on each (no serious or critical
// violation; tests/browser/support/accessibility.ts) and a screenshot in both unit systems under
// tests/output/screenshots/pages/ for a look by eye.
// One analysis of the demo plan and a sweep of two gives the Findings tab, the comparison, the sweep page, a briefing and its
// review page something to show.
import path from 'node:path';
import fs from 'node:fs';
import { afterAll, beforeAll, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { signInThroughForm } from './support/sign-in-form';
import { launchChromium, screenshotDir } from './support/chromium';
import { startLiveServer, type LiveServer } from './support/live-server';
import { seriousAccessibilityViolations } from './support/accessibility';
import { demoPlanName } from '../../server/seed/seed-demo';

let server: LiveServer;
let browser: { context: BrowserContext; close: () => Promise<void> };
const pagesDir = path.join(screenshotDir, 'pages');

beforeAll(async () => {
  server = await startLiveServer();
  browser = await launchChromium();
  fs.mkdirSync(pagesDir, { recursive: true });
  fs.rmSync(path.join(pagesDir, 'axe-findings.txt'), { force: true });
});
afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

/** A call to the API from the signed-in page, with its CSRF token. */
async function api<T>(page: Page, method: string, url: string, body?: unknown): Promise<T> {
  return page.evaluate(
    async ({ method, url, body }) => {
      const session = await (await fetch('/api/auth/session')).json();
      const res = await fetch(url, { method, headers: { 'content-type': 'application/json', 'x-csrf-token': session.csrfToken }, body: body === undefined ? undefined : JSON.stringify(body) });
      if (!res.ok) throw new Error(`${method} ${url}: ${res.status} ${await res.text()}`);
      return res.status === 204 ? null : res.json();
    },
    { method, url, body },
  ) as Promise<T>;
}

async function settle(page: Page) {
  await page.waitForLoadState('networkidle');
  await page.waitForTimeout(600);
}

const findings: string[] = [];

async function look(page: Page, name: string, units: string) {
  await settle(page);
  await page.screenshot({ path: path.join(pagesDir, `${name}-${units}-1366x768.png`) });
  // Units change labels and figures, which axe reads too (names, contrast of new text): every page in both.
  for (const v of await seriousAccessibilityViolations(page)) {
    findings.push(`${name} (${units}): ${v}`);
    fs.appendFileSync(path.join(pagesDir, 'axe-findings.txt'), `${name} (${units}): ${v}\n`);
  }
}

it('checks and photographs every page in metric and US customary units', async () => {
  const page = await browser.context.newPage();
  await page.goto(`${server.url}/sign-in`);
  await look(page, 'sign-in', 'signed-out');
  await page.goto(`${server.url}/verify`);
  await look(page, 'verify', 'signed-out');
  await page.goto(`${server.url}/sign-in`);
  await signInThroughForm(page, 'admin@cutline.example', 'admin-demo-2026');
  await page.waitForURL(/\/plans$/);

  // One finished analysis of the demo plan, a briefing from it, and a scenario.
  const { plans } = await api<{ plans: { id: string; name: string }[] }>(page, 'GET', '/api/plans');
  const planId = plans.find((p) => p.name === demoPlanName)!.id;
  const parameters = { horizonMinutes: 180, timeStepSeconds: 300, capacityFactor: 1, algorithm: 'auto' };
  const { id: runId } = await api<{ id: string }>(page, 'POST', `/api/plans/${planId}/runs`, { parameters });
  for (let i = 0; i < 240; i++) {
    const state = await api<{ status: string }>(page, 'GET', `/api/plans/${planId}/runs/${runId}`);
    if (state.status === 'succeeded') break;
    if (state.status === 'failed' || state.status === 'cancelled') throw new Error(`the analysis ${state.status}`);
    await page.waitForTimeout(1000);
  }
  const scenario = await api<{ id: string }>(page, 'POST', `/api/plans/${planId}/scenarios`, { name: 'Mill bridge closed (drill)' });
  // A sweep of two capacity factors, finished, for the sweep page.
  const sweep = await api<{ id: string }>(page, 'POST', `/api/plans/${planId}/sweeps`, {
    name: 'Wet roads (drill)',
    parameters,
    sweep: { parameter: 'capacityFactor', values: [0.8, 1] },
  });
  for (let i = 0; i < 240; i++) {
    const state = await api<{ runs: { status: string }[] }>(page, 'GET', `/api/plans/${planId}/sweeps/${sweep.id}`);
    if (state.runs.length === 2 && state.runs.every((r) => r.status === 'succeeded')) break;
    if (state.runs.some((r) => r.status === 'failed' || r.status === 'cancelled')) throw new Error('a sweep run did not finish');
    await page.waitForTimeout(1000);
  }
  const briefing = await api<{ briefing: { id: string } }>(page, 'POST', '/api/briefings', { runId, title: 'Veltmoor evening order (drill)' });

  for (const units of ['metric', 'us-customary'] as const) {
    await api(page, 'PUT', '/api/settings/organization', { unitSystem: units, timeZone: units === 'metric' ? null : 'America/Chicago' });
    await page.goto(`${server.url}/plans`);
    await look(page, 'plans', units);
    await page.goto(`${server.url}/plans/${planId}`);
    await page.locator('[data-test="workspace-map"][data-roads-busy="false"]:not([data-road-tiles="0"])').waitFor();
    for (const tab of ['roads', 'zones', 'shelters', 'assumptions', 'findings']) {
      await page.locator(`[data-test="tab-${tab}-button"]`).click();
      await look(page, `workspace-${tab}`, units);
    }
    await page.goto(`${server.url}/plans/${planId}/scenarios`);
    await look(page, 'scenarios', units);
    await page.goto(`${server.url}/plans/${planId}/scenarios/${scenario.id}`);
    await look(page, 'scenario-editor', units);
    await page.goto(`${server.url}/plans/${planId}/sweeps/${sweep.id}`);
    await look(page, 'sweep', units);
    await page.goto(`${server.url}/plans/${planId}/compare?runs=${runId}`);
    await look(page, 'compare', units);
    await page.goto(`${server.url}/briefings`);
    await look(page, 'briefings', units);
    await page.goto(`${server.url}/briefings/${briefing.briefing.id}/review`);
    await look(page, 'briefing-review', units);
    for (const [name, url] of [['verify', '/verify'], ['outbox', '/outbox'], ['members', '/admin/members'], ['settings', '/admin/map'], ['account', '/account'], ['not-found', '/no-such-page']]) {
      await page.goto(`${server.url}${url}`);
      await look(page, name!, units);
    }
  }
  await api(page, 'PUT', '/api/settings/organization', { unitSystem: 'metric', timeZone: null });
  expect(findings).toEqual([]);
}, 900_000);

// A person signs in as the demo planner in Chromium and lands on the plans page.
import path from 'node:path';
import { afterAll, beforeAll, expect, it } from 'vitest';
import type { BrowserContext } from 'playwright-core';
import { signInThroughForm } from './support/sign-in-form';
import { launchChromium, screenshotDir } from './support/chromium';
import { startLiveServer, type LiveServer } from './support/live-server';
import { demoPlanName } from '../../server/seed/seed-demo';

let server: LiveServer;
let browser: { context: BrowserContext; close: () => Promise<void> };

beforeAll(async () => {
  server = await startLiveServer();
  browser = await launchChromium();
});
afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

it('signs in as the demo planner and shows the plans page', async () => {
  const page = await browser.context.newPage();
  await page.goto(`${server.url}/plans`);
  // Signed out, the app sends us to sign-in first.
  await page.waitForURL(/\/sign-in/);
  await page.screenshot({ path: path.join(screenshotDir, 'sign-in.png') });
  // The card sits in the middle of the window, across and down.
  const card = (await page.locator('[data-test="sign-in-card"]').boundingBox())!;
  const viewport = page.viewportSize()!;
  expect(Math.abs(card.x + card.width / 2 - viewport.width / 2)).toBeLessThan(2);
  expect(Math.abs(card.y + card.height / 2 - viewport.height / 2)).toBeLessThan(20);

  await signInThroughForm(page, 'planner@cutline.example', 'wrong-password');
  await page.locator('[data-test="sign-in-error"]').waitFor();
  expect(await page.locator('[data-test="sign-in-error"]').innerText()).toContain('Wrong e-mail address or password');

  await page.getByLabel('Password').fill('planner-demo-2026');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(/\/plans$/);
  await page.locator('[data-test="plan-card"]').first().waitFor();
  expect(await page.locator('[data-test="page-title"]').innerText()).toBe('Plans');
  expect(await page.locator('[data-test="user-role"]').innerText()).toBe('Planner');
  expect(await page.locator('[data-test="plan-card"]').first().innerText()).toContain(demoPlanName);
  // Roboto is served by the app itself.
  expect(await page.evaluate(() => document.fonts.check('16px Roboto'))).toBe(true);
  await page.screenshot({ path: path.join(screenshotDir, 'plans.png') });

  // The session survives a reload.
  await page.reload();
  await page.locator('[data-test="plan-card"]').first().waitFor();
});

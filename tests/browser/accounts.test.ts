// In Chromium: the administrator sets a new password for the demo viewer from the members page;
// the viewer signs in with it and changes it on their account page (a wrong current password
// is shown under its field); the newest password is the one that signs in.
import path from 'node:path';
import { afterAll, beforeAll, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { signInThroughForm } from './support/sign-in-form';
import { launchChromium, screenshotDir } from './support/chromium';
import { startLiveServer, type LiveServer } from './support/live-server';
import { demoAccounts } from '../../server/seed/demo-accounts';

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

const admin = demoAccounts.find((a) => a.role === 'admin')!;
const viewer = demoAccounts.find((a) => a.role === 'viewer')!;

async function signIn(page: Page, email: string, password: string, next = '/plans') {
  await page.goto(`${server.url}${next}`);
  await page.waitForURL(/\/sign-in/);
  await signInThroughForm(page, email, password);
  await page.waitForURL(new RegExp(`${next.replace(/\//g, '\\/')}$`));
}

async function signOut(page: Page) {
  await page.locator('[data-test="user-menu"]').click();
  await page.locator('[data-test="sign-out"]').click();
  await page.waitForURL(/\/sign-in/);
}

it('an administrator sets a member’s password, and the member changes it on their account page', async () => {
  const page = await browser.context.newPage();
  const failures: string[] = [];
  page.on('pageerror', (e) => failures.push(e.message));

  await signIn(page, admin.email, admin.password, '/admin/members');
  const row = page.locator('tr', { hasText: viewer.email });
  await row.locator('[data-test="member-set-password"]').click();
  const dialog = page.locator('[data-test="member-password-dialog"]');
  await dialog.getByLabel('New password', { exact: true }).fill('quayside-lantern-2026');
  await dialog.getByLabel('New password again').fill('quayside-lantern-2062');
  await dialog.locator('[data-test="member-password-save"]').click();
  await dialog.getByText('The two passwords differ.').waitFor();
  await dialog.getByLabel('New password again').fill('quayside-lantern-2026');
  await dialog.locator('[data-test="member-password-save"]').click();
  await page.locator('[data-test="member-password-set"]').waitFor();
  await page.screenshot({ path: path.join(screenshotDir, 'members-password-set.png') });
  await signOut(page);

  await signIn(page, viewer.email, 'quayside-lantern-2026');
  await page.locator('[data-test="user-menu"]').click();
  await page.locator('[data-test="your-account"]').click();
  await page.waitForURL(/\/account$/);
  await page.getByLabel('Current password').fill('not-my-password-2026');
  await page.getByLabel('New password', { exact: true }).fill('ferry-landing-2026');
  await page.getByLabel('New password again').fill('ferry-landing-2026');
  await page.locator('[data-test="password-save"]').click();
  await page.getByText('That is not your current password.').waitFor();
  await page.getByLabel('Current password').fill('quayside-lantern-2026');
  await page.locator('[data-test="password-save"]').click();
  await page.locator('[data-test="password-changed"]').waitFor();
  await page.screenshot({ path: path.join(screenshotDir, 'account-password-changed.png') });
  await signOut(page);

  await signIn(page, viewer.email, 'ferry-landing-2026');
  expect(await page.locator('[data-test="page-title"]').innerText()).toBe('Plans');
  expect(failures).toEqual([]);
}, 180_000);

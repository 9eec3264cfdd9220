// In Chromium, on the demo plan: the planner makes a briefing from a finished analysis and asks
// the demo official for sign-off; the official follows the link from the e-mail, reviews the
// embedded PDF and signs; the signed copy, uploaded on the verification page, is said to be
// valid and unaltered, with the signer and time; the admin finds the messages in the outbox.
// Screenshots and the signed briefing's pages (pdftoppm) go to tests/output/screenshots.
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { signInThroughForm } from './support/sign-in-form';
import { launchChromium, screenshotDir } from './support/chromium';
import { startBriefingServer, type BriefingServer } from './support/briefing-server';
import { insertDemoRun } from '../server/support/demo-run';
import { demoAccounts } from '../../server/seed/demo-accounts';
import { pdfSig, pdfToPng } from '../server/briefings/support/poppler';

let server: BriefingServer;
let browser: { context: BrowserContext; close: () => Promise<void> };
const shot = (page: Page, name: string) => page.screenshot({ path: path.join(screenshotDir, `briefing-${name}.png`) });

beforeAll(async () => {
  server = await startBriefingServer();
  await insertDemoRun(server.db, server.planId, server.userIds['planner@cutline.example'] ?? null);
  browser = await launchChromium({ width: 1440, height: 900 });
});
afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

async function signInAs(page: Page, role: 'planner' | 'official' | 'admin', next: string) {
  const account = demoAccounts.find((a) => a.role === role)!;
  await page.goto(`${server.url}${next}`);
  await page.waitForURL(/\/sign-in/);
  await signInThroughForm(page, account.email, account.password);
}

async function signOut(page: Page) {
  await page.locator('[data-test="user-menu"]').click();
  await page.locator('[data-test="sign-out"]').click();
  await page.waitForURL(/\/sign-in/);
}

it('a planner makes a briefing, the official signs it, and the verification page says it is valid', async () => {
  const page = await browser.context.newPage();
  const failures: string[] = [];
  page.on('pageerror', (e) => failures.push(e.message));
  page.on('console', (m) => {
    if (m.type() === 'error') failures.push(m.text());
  });

  // The planner: Briefings of the demo plan → Make a briefing → pick the finished run.
  await signInAs(page, 'planner', `/briefings?planId=${server.planId}`);
  await page.waitForURL(/\/briefings\?planId=/);
  await page.locator('[data-test="briefings-empty"]').waitFor();
  await page.locator('[data-test="make-briefing"]').click();
  await page.locator('[data-test="briefing-run"]').first().click();
  await page.locator('[data-test="briefing-draft-dialog"]').waitFor();
  await page.locator('[data-test="briefing-title"] input').fill('Veltmoor bridges — evening order');
  await page.locator('[data-test="add-recipient"]').click();
  await page.locator('[data-test="recipient-name-0"] input').fill('Ada Fenwick');
  await page.locator('[data-test="recipient-email-0"] input').fill('ada.fenwick@veltmoor.example');
  await shot(page, '1-draft-dialog');
  await page.locator('[data-test="briefing-draft-submit"]').click();
  await page.waitForURL(/\/briefings\/[0-9a-f-]+\/review$/);
  const reviewPath = new URL(page.url()).pathname;
  await page.locator('[data-test="briefing-status"]').waitFor();
  expect(await page.locator('[data-test="briefing-status"]').innerText()).toBe('Draft');

  // Ask the official; the e-mail carries the link to this page.
  await page.locator('[data-test="ask-sign-off"]').click();
  await page.locator('[data-test="official-official@cutline.example"] input').check();
  await page.locator('[data-test="sign-off-submit"]').click();
  await page.locator('[data-test="mail-sent"]').waitFor();
  expect(await page.locator('[data-test="briefing-status"]').innerText()).toBe('Awaiting sign-off');
  await shot(page, '2-awaiting');
  const request = await server.smtp.waitFor((m) => m.envelopeTo.includes('official@cutline.example'));
  const link = /Review it in Cutline: (\S+)/.exec(request.parsed.text ?? '')![1]!;
  expect(link).toBe(`${server.url}${reviewPath}`);
  await signOut(page);

  // The official follows the link, signs in, reviews the embedded PDF and signs.
  await page.goto(link);
  await page.waitForURL(/\/sign-in/);
  const official = demoAccounts.find((a) => a.role === 'official')!;
  await signInThroughForm(page, official.email, official.password);
  await page.waitForURL((u) => u.pathname === reviewPath);
  const frame = page.locator('[data-test="briefing-frame"]');
  await frame.waitFor();
  const frameSrc = (await frame.getAttribute('src'))!;
  // The frame's own answer: a PDF the page's CSP lets it show (same origin, inline).
  const framed = await page.request.get(`${server.url}${frameSrc.split('#')[0]}`);
  expect(framed.status()).toBe(200);
  expect(framed.headers()['content-type']).toBe('application/pdf');
  expect(framed.headers()['content-disposition']).toMatch(/^inline;/);
  await page.waitForTimeout(1500);
  await shot(page, '3-official-review');
  await page.locator('[data-test="sign"]').click();
  await page.locator('[data-test="sign-confirm-dialog"]').waitFor();
  await page.waitForTimeout(400); // the dialog's fade-in
  await shot(page, '4-sign-confirm');
  await page.locator('[data-test="sign-confirm"]').click();
  await page.locator('[data-test="signed-by"]').waitFor();
  expect(await page.locator('[data-test="briefing-status"]').innerText()).toBe('Signed');
  expect(await page.locator('[data-test="signed-by"]').innerText()).toContain('Signed by Mina Ashcombe, Official');
  await page.waitForTimeout(1500);
  await shot(page, '5-signed');

  // The signed copy, as downloaded, checked by poppler and rendered for a look.
  const download = await page.request.get(`${server.url}/api/briefings/${reviewPath.split('/')[2]}/pdf?download=1`);
  const signedPdf = Buffer.from(await download.body());
  expect(pdfSig(signedPdf)).toContain('Signature Validation: Signature is Valid.');
  const pages = pdfToPng(signedPdf, screenshotDir, 'briefing-signed-page', 80);
  expect(pages.length).toBeGreaterThanOrEqual(5);

  // The verification page, given that file.
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'cutline-verify-'));
  const file = path.join(dir, 'signed-briefing.pdf');
  fs.writeFileSync(file, signedPdf);
  await page.goto(`${server.url}/verify`);
  await page.locator('[data-test="verify-file"] input[type="file"]').setInputFiles(file);
  await page.locator('[data-test="verify-submit"]').click();
  await page.locator('[data-test="verify-result"]').waitFor();
  expect(await page.locator('[data-test="verify-verdict"]').innerText()).toBe('Valid: an unaltered signed briefing');
  expect(await page.locator('[data-test="verify-signer"]').innerText()).toBe('Mina Ashcombe, Official');
  expect(await page.locator('[data-test="verify-signed-at"]').innerText()).toMatch(/20\d\d/);
  await shot(page, '6-verify-valid');

  // A copy with one byte changed is not.
  const altered = Buffer.from(signedPdf);
  // The last digit of the first page's width: still a readable PDF, but not the bytes that were signed.
  const box = /\/MediaBox \[[\d. ]*?(\d) /.exec(altered.toString('latin1'))!;
  const at = box.index + box[0].length - 2;
  altered[at] = altered[at]! ^ 0x01;
  const alteredFile = path.join(dir, 'altered-briefing.pdf');
  fs.writeFileSync(alteredFile, altered);
  await page.locator('[data-test="verify-file"] input[type="file"]').setInputFiles(alteredFile);
  // Check only once the file field shows the new file.
  await page.locator('[data-test="verify-file"]', { hasText: 'altered-briefing.pdf' }).waitFor();
  await page.locator('[data-test="verify-submit"]').click();
  await page.locator('[data-test="verify-verdict"]', { hasText: 'Not valid' }).waitFor();
  await page.locator('[data-test="verify-problems"]').waitFor();
  expect(await page.locator('[data-test="verify-verdict"]').innerText()).toBe('Not valid');
  await shot(page, '7-verify-altered');
  fs.rmSync(dir, { recursive: true, force: true });

  // The admin reads what was "sent" in the outbox.
  await signOut(page);
  await signInAs(page, 'admin', '/outbox');
  await page.waitForURL(/\/outbox$/);
  // Mail goes out after each step has committed; on a busy machine the last message may still be
  // on its way when the page first loads.
  // (At least two: a retried attempt finds the first attempt's messages too.)
  for (let i = 0; i < 60 && (await page.locator('[data-test="outbox-message"]').count()) < 2; i++) {
    await page.waitForTimeout(1000);
    await page.reload();
    await page.waitForLoadState('networkidle');
  }
  expect(await page.locator('[data-test="outbox-message"]').count()).toBeGreaterThanOrEqual(2);
  await page.locator('[data-test="outbox-message"]').first().click();
  await page.locator('[data-test="outbox-attachment"]').waitFor();
  await shot(page, '8-outbox');

  expect(failures).toEqual([]);
});

// Debian's Chromium driven by playwright-core; no browser is ever downloaded.
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { chromium, type BrowserContext } from 'playwright-core';

export const screenshotDir = path.resolve(import.meta.dirname, '../../output/screenshots');

export async function launchChromium(viewport = { width: 1366, height: 768 }): Promise<{ context: BrowserContext; close: () => Promise<void> }> {
  const executablePath = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
  if (!fs.existsSync(executablePath)) throw new Error(`Chromium not found at ${executablePath}: run docker-free-scripts/install-system-packages.sh --tests`);
  const profile = fs.mkdtempSync(path.join(os.tmpdir(), 'cutline-chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath,
    headless: true,
    viewport,
    // Without the background-networking flags Chromium keeps trying hosts this machine cannot reach.
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
  fs.mkdirSync(screenshotDir, { recursive: true });
  return {
    context,
    close: async () => {
      await context.close();
      fs.rmSync(profile, { recursive: true, force: true });
    },
  };
}

/**
 * Debian's Chromium driven by playwright-core, the way a reader would open a report: headless, no sandbox (CI
 * runs as root), no GPU, and nothing that phones home (the machine has no network; background networking only
 * fills the log with refused connections). Each launch gets a fresh profile directory, removed at close.
 */
import { chromium, type BrowserContext } from 'playwright-core';
import { makeTempDir, removeTempDir } from './temp-dir.js';

export const CHROMIUM_PATH = '/usr/bin/chromium';

const ARGS = [
  '--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking',
  '--disable-component-update', '--disable-sync',
];

export async function withChromium<T>(fn: (context: BrowserContext) => Promise<T>): Promise<T> {
  const profile = makeTempDir('disksweep-chromium-');
  const context = await chromium.launchPersistentContext(profile, { executablePath: CHROMIUM_PATH, headless: true, args: ARGS, viewport: { width: 1280, height: 900 } });
  try {
    return await fn(context);
  } finally {
    await context.close();
    removeTempDir(profile);
  }
}

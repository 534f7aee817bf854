import { existsSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext } from 'playwright-core';

export const CHROMIUM = process.env.PLUMBLINE_CHROMIUM ?? '/usr/bin/chromium';

/**
 * Whether the browser suite can run here. On a developer machine without Chromium it is skipped
 * with a message saying what to install; in CI (PLUMBLINE_REQUIRE_BROWSER=1) a missing browser fails.
 */
export function browserAvailable(): boolean {
  if (existsSync(CHROMIUM)) return true;
  const msg = `Chromium not found at ${CHROMIUM}. Install it with: sudo apt-get install -y chromium`;
  if (process.env.PLUMBLINE_REQUIRE_BROWSER === '1') throw new Error(msg);
  console.warn(`[e2e skipped] ${msg}`);
  return false;
}

export function distBuilt(): void {
  if (!existsSync(join(process.cwd(), 'dist', 'index.html')) || !existsSync(join(process.cwd(), 'dist', 'sw.js'))) {
    throw new Error('dist/ is not built: run `npm run build` first (npm test does it).');
  }
}

/** A tablet: a persistent Chromium profile (so IndexedDB and the service worker survive reloads). */
export async function launchTablet(size: { width: number; height: number } = { width: 1280, height: 800 }): Promise<BrowserContext> {
  const profile = mkdtempSync(join(tmpdir(), 'plumbline-tablet-'));
  return chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM,
    viewport: size,
    deviceScaleFactor: 1,
    hasTouch: true,
    locale: 'en-GB',
    args: ['--headless=new', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking',
      '--disable-component-update', '--disable-sync'],
  });
}

import { mkdirSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import type { BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll } from 'vitest';
import { distBuilt, launchTablet } from './browser';
import { createServer } from '../../src/server/create-server';
import { DEMO_SITE_ID } from '../../src/server/demo/demo-site';
import { seedDemo } from '../../src/server/demo/seed-demo';
import { issueEnrolmentCode } from '../../src/server/routes/admin-enrolment-codes';
import type { ServerStore } from '../../src/server/store/server-store';
import { openSqliteStore } from '../../src/server/store/sqlite-store';

/** A demo site served from a temporary SQLite file and the built app, on a free loopback port. */
export interface DemoSite {
  readonly store: ServerStore;
  readonly base: string;
  newCode(): Promise<string>;
  close(): Promise<void>;
}

export async function startDemoSite(now = new Date()): Promise<DemoSite> {
  const dir = mkdtempSync(join(tmpdir(), 'plumbline-e2e-'));
  const store = openSqliteStore(join(dir, 'site.sqlite'));
  await seedDemo(store, now);
  const app = createServer({ store, distDir: resolve('dist'), logger: false });
  await app.listen({ host: '127.0.0.1', port: 0 });
  const address = app.server.address();
  const base = `http://127.0.0.1:${typeof address === 'object' && address ? address.port : 0}`;
  return {
    store,
    base,
    newCode: async () => (await issueEnrolmentCode(store, DEMO_SITE_ID, 'p-marguerite', new Date(), 60)).code,
    close: async () => {
      await app.close();
    },
  };
}

/** Counts how often each device record id appears in the server's log. */
export async function recordsOnServer(store: ServerStore): Promise<Map<string, number>> {
  const counts = new Map<string, number>();
  let after = 0;
  for (;;) {
    const rows = await store.readLog(DEMO_SITE_ID, after, 1000);
    if (!rows.length) break;
    for (const r of rows) if (r.entry.kind === 'record') counts.set(r.entry.id, (counts.get(r.entry.id) ?? 0) + 1);
    after = rows[rows.length - 1]!.serverSeq;
  }
  return counts;
}

/** Enrols the tablet with a fresh code and signs a demo person in. */
export async function enrolAndSignIn(page: Page, site: DemoSite, login: string, pin: string, tabletName = 'Line tablet'): Promise<void> {
  const logs: string[] = [];
  const onConsole = (m: { type(): string; text(): string }) => logs.push(`${m.type()}: ${m.text()}`);
  const onError = (e: Error) => logs.push(`pageerror: ${e.message}`);
  page.on('console', onConsole);
  page.on('pageerror', onError);
  await page.goto(site.base);
  try {
    await page.getByLabel('Connection code').waitFor({ timeout: 20_000 });
  } catch (e) {
    // Say what the page showed instead, so a failure here can be understood from the CI log.
    const shown = await page.evaluate(() => document.body.innerText.slice(0, 400)).catch((x: unknown) => String(x));
    await page.screenshot({ path: 'test-results/screenshots/enrol-failure.png' }).catch(() => undefined);
    throw new Error(`The enrol screen did not appear at ${site.base}. Page text: ${JSON.stringify(shown)}. Console: ${JSON.stringify(logs.slice(-20))}. ${String(e)}`);
  } finally {
    page.off('console', onConsole);
    page.off('pageerror', onError);
  }
  await page.getByLabel('Connection code').fill(await site.newCode());
  await page.getByLabel('Name of this tablet').fill(tabletName);
  await page.getByRole('button', { name: 'Connect tablet' }).click();
  await signIn(page, login, pin);
}

export async function signIn(page: Page, login: string, pin: string): Promise<void> {
  await page.getByLabel('Login').fill(login);
  await page.getByLabel('PIN').fill(pin);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.locator('.tile').first().waitFor({ state: 'visible', timeout: 15_000 });
}

/** "Sync now" as a person does it: open the sync details from the status pill, press Sync now, close. */
export async function syncNow(page: Page): Promise<void> {
  await page.getByTestId('sync-pill').click();
  const sheet = page.getByTestId('sync-sheet');
  await sheet.waitFor();
  await sheet.getByTestId('sync-now').click();
  await sheet.getByTestId('sync-now').filter({ hasText: 'Sync now' }).waitFor({ timeout: 20_000 });
  await sheet.getByRole('button', { name: 'Close' }).click();
  await sheet.waitFor({ state: 'detached' });
}

/**
 * The usual fixture of a browser test file: a demo site and one Chromium profile (a tablet) per
 * size given, started before the file's tests and closed after them.
 */
export function useDemoSite(sizes: readonly { width: number; height: number }[] = [{ width: 1280, height: 800 }]): {
  readonly site: () => DemoSite;
  readonly tablets: () => readonly BrowserContext[];
} {
  let site: DemoSite | undefined;
  const tablets: BrowserContext[] = [];
  beforeAll(async () => {
    distBuilt();
    mkdirSync('test-results/screenshots', { recursive: true });
    site = await startDemoSite();
    for (const size of sizes) tablets.push(await launchTablet(size));
  });
  afterAll(async () => {
    for (const t of tablets) await t.close();
    await site?.close();
  });
  return { site: () => site!, tablets: () => tablets };
}

/** The first tab of a tablet. */
export async function pageOf(tablet: BrowserContext): Promise<Page> {
  return tablet.pages()[0] ?? (await tablet.newPage());
}

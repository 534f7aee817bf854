/**
 * The walking skeleton, end to end in headless Chromium: enrol a tablet, sign in, go offline,
 * reload (the service worker serves the app), record a sample that breaks a rule, see the flag,
 * answer the prompt, go online, and check that the server holds the sample and the response
 * exactly once.
 */
import { join, resolve } from 'node:path';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { DEMO_SITE_ID } from '../../src/server/demo/demo-site';
import { browserAvailable } from './browser';
import { enrolAndSignIn, pageOf, recordsOnServer, syncNow, useDemoSite } from './site';

const run = browserAvailable();
const SHOTS = resolve('test-results/screenshots');

async function shot(page: Page, name: string) {
  await page.screenshot({ path: join(SHOTS, `${name}.png`), fullPage: false });
}

describe.skipIf(!run)('a tablet offline: record, flag, answer, sync', () => {
  const fx = useDemoSite();

  it('works end to end', async () => {
    const site = fx.site();
    const tablet = fx.tablets()[0]!;
    const page = await pageOf(tablet);
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    await enrolAndSignIn(page, site, 'rana', '2468', 'Assembly tablet');
    await shot(page, 'station-board-1280x800');

    // The service worker controls the page before we pull the plug.
    await page.waitForFunction(() => navigator.serviceWorker?.controller !== null, undefined, { timeout: 20_000 });

    await tablet.setOffline(true);
    await page.reload();
    await expect.poll(() => page.evaluate(() => navigator.onLine)).toBe(false);
    await page.getByTestId('tile-bonnet-torque').click();
    await page.getByTestId('main-chart').locator('canvas').first().waitFor({ state: 'visible' });

    // A value well beyond the upper control limit (but not so far that the typo guard asks).
    const ucl = Number(await page.locator('.figure', { hasText: 'UCL' }).locator('.v').innerText());
    const centre = Number(await page.locator('.figure', { hasText: 'Centre' }).locator('.v').innerText());
    const value = (ucl + (ucl - centre) * 0.3).toFixed(1);
    await page.getByLabel('Value (N·m)').fill(value);
    await shot(page, 'entry-1280x800');
    await page.getByLabel('Value (N·m)').press('Enter');

    const prompt = page.getByTestId('signal-prompt');
    await prompt.waitFor({ state: 'visible', timeout: 10_000 });
    await expect(prompt.innerText()).resolves.toContain('above the upper control limit');
    await expect.poll(() => page.getByTestId('sync-pill').innerText()).toMatch(/1 waiting to send · no connection/);
    await prompt.getByLabel('What happened at the machine?').fill('Nutrunner socket worn; two bolts over-tightened.');
    await prompt.getByRole('button', { name: 'Machine' }).click();
    await prompt.getByLabel('Suspected cause (optional)').fill('Worn socket');
    await prompt.locator('.choice').filter({ hasNotText: /^(People|Machine|Method|Material|Measurement|Environment)$/ }).first().click();
    await shot(page, 'signal-prompt-1280x800');
    await prompt.getByRole('button', { name: 'Save answer' }).click();
    await expect.poll(() => prompt.count()).toBe(0);
    await expect.poll(() => page.getByTestId('sync-pill').innerText()).toMatch(/2 waiting to send/);
    await shot(page, 'chart-after-answer-1280x800');

    // Back online: the outbox drains and the server holds each record once.
    const before = await recordsOnServer(site.store);
    await tablet.setOffline(false);
    await syncNow(page);
    await expect.poll(() => page.getByTestId('sync-pill').innerText(), { timeout: 20_000 }).toMatch(/All sent/);
    const after = await recordsOnServer(site.store);
    const added = [...after].filter(([id]) => !before.has(id));
    expect(added).toHaveLength(2);
    for (const [, n] of added) expect(n).toBe(1);
    const kinds = await Promise.all(added.map(async ([id]) => (await site.store.readLog(DEMO_SITE_ID, 0, 100000)).find((r) => r.entry.kind === 'record' && r.entry.id === id)!.entry));
    expect(kinds.map((k) => (k.kind === 'record' ? k.body.kind : k.kind)).sort()).toEqual(['response', 'sample']);

    // A second sync sends nothing again.
    await syncNow(page);
    await page.waitForTimeout(500);
    expect((await recordsOnServer(site.store)).size).toBe(after.size);

    await page.setViewportSize({ width: 800, height: 1280 });
    await shot(page, 'chart-800x1280');
    expect(errors).toEqual([]);
  });
});

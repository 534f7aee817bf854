/**
 * Two tablets at the same station record offline at the same time, then sync; a supervisor's
 * tablet pulls the site and holds every record of both exactly once (issue 5).
 */
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { browserAvailable } from './browser';
import { enrolAndSignIn, pageOf, recordsOnServer, syncNow, useDemoSite } from './site';

const run = browserAvailable();
const EACH = 6;

async function openTorque(page: Page) {
  await page.getByRole('navigation', { name: 'Stations' }).getByRole('button', { name: 'Bonnet assembly' }).click();
  await page.getByTestId('tile-bonnet-torque').click();
  await page.getByTestId('main-chart').locator('canvas').first().waitFor();
}

const points = async (page: Page) => Number(await page.locator('.figure', { hasText: 'Points' }).locator('.v').innerText());

/** Stored record ids as this tablet's IndexedDB holds them (read in the page, not from the app's memory). */
function samplesInDevice(page: Page): Promise<string[]> {
  return page.evaluate(() => new Promise<string[]>((resolve, reject) => {
    const open = indexedDB.open('plumbline');
    open.onerror = () => reject(open.error);
    open.onsuccess = () => {
      const req = open.result.transaction('samples').objectStore('samples').getAllKeys();
      req.onsuccess = () => { resolve(req.result as string[]); open.result.close(); };
      req.onerror = () => reject(req.error);
    };
  }));
}

describe.skipIf(!run)('two tablets offline at one station, one supervisor', () => {
  const fx = useDemoSite([{ width: 1280, height: 800 }, { width: 1280, height: 800 }, { width: 1280, height: 800 }]);

  it('every record of both tablets reaches the supervisor exactly once', async () => {
    const site = fx.site();
    const tablets = fx.tablets();
    const [a, b, sup] = await Promise.all(tablets.map(pageOf));
    await enrolAndSignIn(a!, site, 'rana', '2468', 'Assembly tablet A');
    await enrolAndSignIn(b!, site, 'tomasz', '1357', 'Assembly tablet B');
    for (const p of [a!, b!]) {
      await p.waitForFunction(() => navigator.serviceWorker?.controller !== null, undefined, { timeout: 20_000 });
      await openTorque(p);
    }
    const start = await points(a!);
    const before = await recordsOnServer(site.store);
    await tablets[0]!.setOffline(true);
    await tablets[1]!.setOffline(true);

    // Both record at once, interleaved, values inside the limits (no prompt).
    for (let i = 0; i < EACH; i++) {
      for (const [k, p] of [a!, b!].entries()) {
        const field = p.getByLabel('Value (N·m)');
        await field.fill((25 + (k ? 0.1 : -0.1) * (i % 3)).toFixed(1));
        await field.press('Enter');
      }
    }
    for (const p of [a!, b!]) await expect.poll(() => p.getByTestId('sync-pill').innerText()).toContain(`${EACH} waiting to send`);
    expect(await points(a!)).toBe(start + EACH); // each tablet sees only its own until it syncs

    // Back online at the same moment: both push, both pull.
    await tablets[0]!.setOffline(false);
    await tablets[1]!.setOffline(false);
    await Promise.all([a!, b!].map((p) => syncNow(p)));
    for (const p of [a!, b!]) await expect.poll(() => p.getByTestId('sync-pill').innerText(), { timeout: 20_000 }).toMatch(/All sent/);

    const after = await recordsOnServer(site.store);
    const added = [...after].filter(([id]) => !before.has(id));
    expect(added).toHaveLength(2 * EACH);
    expect(added.every(([, n]) => n === 1)).toBe(true);

    // The supervisor's tablet pulls the whole site: both tablets' samples, once each.
    await enrolAndSignIn(sup!, site, 'tomasz', '1357', 'Supervisor tablet');
    await openTorque(sup!);
    expect(await points(sup!)).toBe(start + 2 * EACH);
    const held = await samplesInDevice(sup!);
    expect(new Set(held).size).toBe(held.length);
    for (const [id] of added) expect(held).toContain(id);
    // And each recording tablet now has the other's samples too.
    await syncNow(a!);
    await expect.poll(() => points(a!), { timeout: 10_000 }).toBe(start + 2 * EACH);
  });
});

/**
 * Two tabs of the app on one tablet: a sample saved in one shows in the other at once (the tabs
 * keep in-memory copies of the records and tell each other what changed), and the one sender
 * of the tablet sends it exactly once.
 */
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { browserAvailable } from './browser';
import { enrolAndSignIn, pageOf, recordsOnServer, signIn, syncNow, useDemoSite } from './site';

const run = browserAvailable();
const points = async (page: Page) => Number(await page.locator('.figure', { hasText: 'Points' }).locator('.v').innerText());

async function openTorque(page: Page) {
  await page.getByRole('navigation', { name: 'Stations' }).getByRole('button', { name: 'Bonnet assembly' }).click();
  await page.getByTestId('tile-bonnet-torque').click();
  await page.getByTestId('main-chart').locator('canvas').first().waitFor();
}

describe.skipIf(!run)('two tabs on one tablet', () => {
  const fx = useDemoSite();

  it('see each other’s samples at once; each sample reaches the server once', async () => {
    const site = fx.site();
    const tablet = fx.tablets()[0]!;
    const a = await pageOf(tablet);
    await enrolAndSignIn(a, site, 'rana', '2468', 'Assembly tablet');
    await openTorque(a);
    const b = await tablet.newPage();
    await b.goto(site.base);
    await signIn(b, 'rana', '2468'); // a new tab is a new session: the person signs in again
    await openTorque(b);
    const start = await points(b);
    const before = await recordsOnServer(site.store);

    await a.getByLabel('Value (N·m)').fill('25.1');
    await a.getByLabel('Value (N·m)').press('Enter');
    await expect.poll(() => points(a)).toBe(start + 1);
    await expect.poll(() => points(b), { timeout: 5_000 }).toBe(start + 1);
    await b.getByLabel('Value (N·m)').fill('24.9');
    await b.getByLabel('Value (N·m)').press('Enter');
    await expect.poll(() => points(a), { timeout: 5_000 }).toBe(start + 2);

    await syncNow(a);
    await syncNow(b);
    const added = [...(await recordsOnServer(site.store))].filter(([id]) => !before.has(id));
    expect(added).toHaveLength(2);
    expect(added.every(([, n]) => n === 1)).toBe(true);
  });
});

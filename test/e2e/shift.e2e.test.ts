/**
 * A whole shift recorded offline on one tablet, then synced; a supervisor's tablet pulls the
 * shift and signs off the answered signal; the operator's tablet then sees the sign-off.
 * The page clock is driven by Playwright so the samples are an hour apart, as on the floor.
 */
import type { BrowserContext } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { browserAvailable } from './browser';
import { enrolAndSignIn, pageOf, recordsOnServer, syncNow, useDemoSite } from './site';

const run = browserAvailable();
const HOURS = 8;

describe.skipIf(!run)('a shift offline, then synced and signed off', () => {
  const fx = useDemoSite([{ width: 1280, height: 800 }, { width: 800, height: 1280 }]);

  it('loses nothing and duplicates nothing', async () => {
    const site = fx.site();
    const [operator, supervisor] = fx.tablets() as [BrowserContext, BrowserContext];
    const page = await pageOf(operator);
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    await page.clock.install({ time: new Date() });
    await enrolAndSignIn(page, site, 'rana', '2468', 'Turning tablet');
    await page.waitForFunction(() => navigator.serviceWorker?.controller !== null, undefined, { timeout: 20_000 });
    await page.getByRole('navigation', { name: 'Stations' }).getByRole('button', { name: 'Turning cell T4' }).click();
    await page.getByTestId('tile-bore-dia').click();
    await page.getByTestId('main-chart').locator('canvas').first().waitFor();

    const before = await recordsOnServer(site.store);
    await operator.setOffline(true);
    let prompts = 0;
    for (let hour = 0; hour < HOURS; hour++) {
      await page.clock.fastForward('01:00:00');
      // A quiet subgroup near the centre, except in hour 5 when the whole subgroup reads high.
      const values = hour === 5 ? ['25.009', '25.010', '25.008', '25.011', '25.009'] : ['25.001', '24.999', '25.002', '24.998', '25.000'];
      for (let i = 0; i < values.length; i++) {
        const field = page.getByLabel(`Value ${i + 1}`, { exact: true });
        await field.fill(values[i]!);
        await field.press('Enter');
      }
      const prompt = page.getByTestId('signal-prompt');
      await expect.poll(async () => (await prompt.count()) > 0 || (await page.getByTestId('sync-pill').innerText()).includes(`${hour + 1 + prompts} waiting`)).toBe(true);
      if (await prompt.count()) {
        prompts++;
        await prompt.getByLabel('What happened at the machine?').fill('Insert changed at 11:40; first parts oversize.');
        await prompt.getByRole('button', { name: 'Machine', exact: true }).click();
        await prompt.locator('.choice').last().click();
        await prompt.getByRole('button', { name: 'Save answer' }).click();
        await expect.poll(() => prompt.count()).toBe(0);
      }
    }
    expect(prompts).toBeGreaterThanOrEqual(1);
    const waiting = HOURS + prompts;
    await expect.poll(() => page.getByTestId('sync-pill').innerText()).toContain(`${waiting} waiting to send`);

    // Reconnect: everything goes up exactly once.
    await operator.setOffline(false);
    await syncNow(page);
    await expect.poll(() => page.getByTestId('sync-pill').innerText(), { timeout: 20_000 }).toMatch(/All sent/);
    const after = await recordsOnServer(site.store);
    const added = [...after].filter(([id]) => !before.has(id));
    expect(added).toHaveLength(waiting);
    expect(added.every(([, n]) => n === 1)).toBe(true);

    // The supervisor's tablet pulls the shift and signs off the answered signal.
    const sup = await pageOf(supervisor);
    await enrolAndSignIn(sup, site, 'tomasz', '1357', 'Supervisor tablet');
    await sup.getByRole('navigation', { name: 'Stations' }).getByRole('button', { name: 'Turning cell T4' }).click();
    await sup.getByTestId('tile-bore-dia').click();
    const history = sup.getByTestId('signal-history');
    await history.getByText('Insert changed at 11:40').first().waitFor({ timeout: 15_000 });
    const item = history.locator('.signal-item', { hasText: 'Insert changed at 11:40' }).first();
    await item.getByRole('button', { name: 'Sign off' }).click();
    await expect.poll(() => item.innerText()).toContain('Signed off by Tomasz Wilk');
    await expect.poll(() => sup.getByTestId('sync-pill').innerText(), { timeout: 20_000 }).toMatch(/All sent/);

    // Back on the operator's tablet the sign-off arrives with the next pull.
    await syncNow(page);
    await expect.poll(async () => {
      await syncNow(page);
      return page.getByTestId('signal-history').locator('.signal-item', { hasText: 'Insert changed at 11:40' }).first().innerText();
    }, { timeout: 20_000 }).toContain('Signed off by Tomasz Wilk');
    expect(errors).toEqual([]);
  });
});

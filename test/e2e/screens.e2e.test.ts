/**
 * Every screen at tablet sizes, in the light and the dark theme: axe-core finds no WCAG 2.1 AA
 * violation, and a screenshot of each is kept in test-results/screenshots for people to look at.
 */
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { DEMO_CHARACTERISTICS } from '../../src/server/demo/demo-site';
import { axeViolations, checkAtTabletSizes } from './axe';
import { browserAvailable } from './browser';
import { pageOf, signIn, useDemoSite } from './site';

const run = browserAvailable();

const check = (page: Page, name: string) => checkAtTabletSizes(page, name, { fullPage: false });

describe.skipIf(!run)('screens at tablet sizes, light and dark', () => {
  const fx = useDemoSite();

  it('have no accessibility violations', async () => {
    const site = fx.site();
    const page = await pageOf(fx.tablets()[0]!);
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    const problems: string[] = [];
    await page.goto(site.base);
    await page.getByLabel('Connection code').waitFor();
    problems.push(...(await check(page, 'enrol')));
    await page.getByLabel('Connection code').fill(await site.newCode());
    await page.getByLabel('Name of this tablet').fill('Quality office tablet');
    await page.getByRole('button', { name: 'Connect tablet' }).click();
    await page.getByLabel('Login').waitFor();
    problems.push(...(await check(page, 'sign-in')));
    await signIn(page, 'tomasz', '1357');

    for (const theme of ['light', 'dark'] as const) {
      if (theme === 'dark') await page.getByTestId('theme-toggle').click();
      const back = page.getByRole('button', { name: '← Station board' });
      if (await back.count()) await back.click();
      await expect.poll(() => page.evaluate(() => document.documentElement.dataset.theme)).toBe(theme);
      problems.push(...(await check(page, `board-${theme}`)));
      // The Tools menu of the top bar, open: Escape closes it and gives the focus back to its button.
      const tools = page.getByTestId('role-menu-button');
      await tools.focus();
      await page.keyboard.press('Enter');
      await page.getByTestId('menu-handover').waitFor();
      problems.push(...(await check(page, `tools-menu-${theme}`)));
      await page.keyboard.press('Escape');
      await page.getByTestId('role-menu-panel').waitFor({ state: 'hidden' });
      expect(await tools.evaluate((b) => b === document.activeElement && b.getAttribute('aria-expanded'))).toBe('false');
      await page.getByTestId('sync-pill').click();
      await page.getByTestId('sync-sheet').waitFor();
      problems.push(...(await check(page, `sync-details-${theme}`)));
      await page.getByTestId('sync-sheet').getByRole('button', { name: 'Close' }).click();
      await page.getByTestId('open-overview').click();
      await page.getByRole('heading', { name: 'Site overview' }).waitFor();
      await expect.poll(() => page.getByTestId('causes-panel').innerText()).toContain('Machine'); // the demo's answers name causes
      problems.push(...(await check(page, `site-overview-${theme}`)));
      await page.getByTestId('open-handover').click();
      await page.getByTestId('handover-table').waitFor();
      // The demo's last 8 hours: samples were taken, and the open burst of blemishes is listed.
      expect(await page.getByTestId('handover-table').innerText()).toContain('Coating blemishes per panel');
      problems.push(...(await check(page, `handover-${theme}`)));
      await page.getByRole('button', { name: 'Site overview' }).click();
      await page.getByRole('button', { name: 'Back to my station' }).click();
      for (const ch of DEMO_CHARACTERISTICS) {
        if (await back.count()) await back.click();
        const tile = page.getByTestId(`tile-${ch.id}`);
        if (!(await tile.count())) {
          // The characteristic lives at another station: pick each station until it shows.
          for (const b of await page.getByRole('navigation', { name: 'Stations' }).getByRole('button').all()) {
            await b.click();
            if (await tile.count()) break;
          }
        }
        await tile.click();
        await page.getByTestId('main-chart').locator('canvas').first().waitFor();
        problems.push(...(await check(page, `characteristic-${ch.id}-${theme}`)));
        if (ch.id === 'bore-dia') {
          await page.getByTestId('toggle-capability').click();
          await page.getByTestId('capability-panel').scrollIntoViewIfNeeded();
          expect(await page.getByTestId('capability-panel').innerText()).toContain('Cpk');
          problems.push(...(await check(page, `capability-${theme}`)));
          await page.getByTestId('toggle-capability').click();
        }
      }
      // The point details panel, and the prompt of the demo's open signal (the late burst of coating blemishes).
      await back.click();
      await page.getByTestId('tile-coating-blemish').click();
      const canvas = page.getByTestId('main-chart').locator('.u-over');
      await canvas.scrollIntoViewIfNeeded();
      const box = await canvas.boundingBox();
      if (box) await page.mouse.click(box.x + box.width - 4, box.y + box.height / 2);
      await page.getByTestId('point-details').waitFor({ timeout: 5_000 });
      problems.push(...(await check(page, `point-details-${theme}`)));
      await page.getByRole('button', { name: 'Answer now' }).first().click();
      await page.getByTestId('signal-prompt').waitFor();
      problems.push(...(await check(page, `signal-prompt-${theme}`)));
      await page.getByRole('button', { name: 'Answer later' }).click();
    }
    expect(problems).toEqual([]);
    expect(errors).toEqual([]);

    // Control: the check has teeth — an input with no label is reported.
    await page.evaluate(() => document.body.insertAdjacentHTML('beforeend', '<input id="unlabelled-control">'));
    expect((await axeViolations(page)).map((v) => v.id)).toContain('label');
  });
});

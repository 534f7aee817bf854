/**
 * A look-around tour, for people: every screen each demo role reaches, at 1280×800 and 800×1280, in
 * the light and the dark theme, saved as screenshots in test-results/tour/<label>/. It checks only
 * that the top bar keeps to two rows and that no screen scrolls sideways. Slow, so it runs only
 * when asked: PLUMBLINE_TOUR=<label> npx vitest run --project e2e test/e2e/tour.e2e.test.ts
 * (PLUMBLINE_TOUR_WHO=rana,marguerite limits it to some of the demo people).
 */
import { mkdirSync } from 'node:fs';
import { join, resolve } from 'node:path';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { browserAvailable } from './browser';
import { enrolAndSignIn, pageOf, useDemoSite } from './site';

const label = process.env.PLUMBLINE_TOUR;
const run = !!label && browserAvailable();
const SIZES = [
  { name: 'landscape', width: 1280, height: 800 },
  { name: 'portrait', width: 800, height: 1280 },
] as const;
const PEOPLE = [
  { login: 'rana', pin: '2468', role: 'operator' },
  { login: 'tomasz', pin: '1357', role: 'supervisor' },
  { login: 'imogen', pin: '8642', role: 'engineer' },
  { login: 'marguerite', pin: '9753', role: 'admin' },
] as const;

async function setTheme(page: Page, theme: 'light' | 'dark'): Promise<void> {
  if ((await page.evaluate(() => document.documentElement.dataset.theme)) !== theme) await page.getByTestId('theme-toggle').click();
  await expect.poll(() => page.evaluate(() => document.documentElement.dataset.theme)).toBe(theme);
}

/** Opens a role tool, through the role menu when there is one. */
async function openTool(page: Page, testId: string): Promise<void> {
  const menu = page.getByTestId('role-menu-button');
  if ((await menu.count()) && !(await page.getByTestId(testId).isVisible().catch(() => false))) await menu.click();
  await page.getByTestId(testId).click();
}

describe.skipIf(!run)('a tour of every screen, for people to look at', () => {
  const fx = useDemoSite();

  it('saves screenshots of each role\'s screens', async () => {
    const dir = resolve('test-results/tour', label ?? 'x');
    mkdirSync(dir, { recursive: true });
    const page = await pageOf(fx.tablets()[0]!);
    const notes: string[] = [];
    const shot = async (who: string, name: string, theme: string) => {
      for (const size of SIZES) {
        await page.setViewportSize(size);
        await page.waitForTimeout(150);
        const file = `${who}-${name}-${theme}-${size.width}x${size.height}.png`;
        await page.screenshot({ path: join(dir, file), fullPage: true });
        const m = await page.evaluate(() => {
          const bar = document.querySelector('.topbar');
          return { barH: bar?.getBoundingClientRect().height ?? 0, sw: document.documentElement.scrollWidth, cw: document.documentElement.clientWidth };
        });
        notes.push(`${file}: topbar ${Math.round(m.barH)} px${m.sw > m.cw ? `, SCROLLS SIDEWAYS ${m.sw}>${m.cw}` : ''}`);
      }
      await page.setViewportSize(SIZES[0]);
    };
    let enrolled = false;
    const who = process.env.PLUMBLINE_TOUR_WHO?.split(',');
    for (const p of PEOPLE.filter((x) => !who || who.includes(x.login))) {
      if (!enrolled) {
        await enrolAndSignIn(page, fx.site(), p.login, p.pin, 'Tour tablet');
        enrolled = true;
      } else {
        await page.getByTestId('person-pill').click();
        await page.getByLabel('Login').waitFor();
        await shot(p.login, 'sign-in', (await page.evaluate(() => document.documentElement.dataset.theme)) ?? 'light');
        await page.getByLabel('Login').fill(p.login);
        await page.getByLabel('PIN').fill(p.pin);
        await page.getByRole('button', { name: 'Sign in' }).click();
        await page.locator('.tile').first().waitFor();
      }
      for (const theme of ['light', 'dark'] as const) {
        await setTheme(page, theme);
        await page.getByTestId('person-pill').waitFor();
        const back = page.getByRole('button', { name: '← Station board' });
        if (await back.count()) await back.first().click();
        await page.locator('.tile').first().waitFor();
        await shot(p.login, 'board', theme);
        const menu = page.getByTestId('role-menu-button');
        if (await menu.count()) {
          await menu.click();
          await shot(p.login, 'menu-open', theme);
          await page.keyboard.press('Escape');
        }
        await page.getByTestId('sync-pill').click();
        await page.getByTestId('sync-sheet').waitFor();
        await shot(p.login, 'sync', theme);
        await page.getByTestId('sync-sheet').getByRole('button', { name: 'Close' }).click();
        await page.getByTestId('tile-bore-dia').click().catch(async () => page.locator('.tile').first().click());
        await page.getByTestId('main-chart').locator('canvas').first().waitFor();
        await shot(p.login, 'characteristic', theme);
        if (p.role === 'engineer' || p.role === 'admin') {
          await page.getByTestId('open-limits-history').click();
          await page.getByTestId('limits-history').waitFor();
          await shot(p.login, 'limits-history', theme);
          await page.getByRole('button', { name: /^← / }).first().click();
          await page.getByTestId('open-new-phase').click();
          await page.getByTestId('phase-form').waitFor();
          await page.getByTestId('limits-given').check();
          await shot(p.login, 'new-phase', theme);
          await page.getByRole('button', { name: 'Cancel' }).click();
          await page.getByTestId('edit-characteristic').click();
          await page.getByTestId('characteristic-editor').waitFor();
          const step = page.getByLabel('Step 1', { exact: true });
          if (await step.count()) await step.fill('Stop the cell, tag the last two parts red, measure them again on the bench gauge and call the setter before restarting the spindle');
          await shot(p.login, 'editor', theme);
          await page.getByRole('button', { name: 'Cancel' }).click();
          await openTool(page, 'open-setup');
          await page.getByRole('heading', { name: /Set-up of lines/ }).waitFor();
          await shot(p.login, 'setup', theme);
        }
        if (p.role === 'admin') {
          await openTool(page, 'open-admin');
          await page.getByTestId('people-table').waitFor();
          await shot(p.login, 'admin-people', theme);
          await page.getByTestId('add-person').click();
          await shot(p.login, 'admin-add-person', theme);
          await page.getByTestId('add-person-form').getByRole('button', { name: 'Cancel' }).click();
          await page.getByRole('group', { name: 'Section' }).getByRole('button', { name: 'Tablets' }).click();
          await page.getByTestId('tablets-table').waitFor();
          await shot(p.login, 'admin-tablets', theme);
        }
        if (await page.getByRole('button', { name: '← Station board' }).count()) await page.getByRole('button', { name: '← Station board' }).first().click();
        else await page.getByRole('button', { name: /^← / }).first().click().catch(() => undefined);
        await openTool(page, 'open-overview');
        await page.getByRole('heading', { name: 'Site overview' }).waitFor();
        await shot(p.login, 'overview', theme);
        await openTool(page, 'open-handover');
        await page.getByTestId('handover-table').waitFor();
        await shot(p.login, 'handover', theme);
        await page.getByRole('button', { name: 'Site overview' }).last().click().catch(() => undefined);
        await page.getByRole('button', { name: 'Back to my station' }).click().catch(() => undefined);
      }
    }
    console.log(notes.join('\n'));
  }, 600_000);
});

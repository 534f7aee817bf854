/**
 * The site admin at work, in headless Chromium on the demo site: Marguerite (admin) adds an operator
 * who then signs in on a line tablet; she withdraws their access and their next sign-in is refused;
 * she makes a connection code and a new tablet joins with it; she withdraws that tablet, which then
 * says so and keeps its unsent reading; she reinstates it and its next sync sends the reading. The admin screens pass axe (WCAG 2.1 AA) in both themes at
 * 1280×800 and 800×1280.
 */
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { checkAtTabletSizes } from './axe';
import { browserAvailable } from './browser';
import { enrolAndSignIn, pageOf, signIn, syncNow, useDemoSite } from './site';

const run = browserAvailable();

const check = checkAtTabletSizes;

async function setTheme(page: Page, theme: 'light' | 'dark') {
  if ((await page.evaluate(() => document.documentElement.dataset.theme)) !== theme) await page.getByTestId('theme-toggle').click();
  await expect.poll(() => page.evaluate(() => document.documentElement.dataset.theme)).toBe(theme);
}

describe.skipIf(!run)('the site admin: people and tablets', () => {
  const fx = useDemoSite([{ width: 1280, height: 800 }, { width: 800, height: 1280 }, { width: 1280, height: 800 }]);

  it('adds, withdraws, connects and withdraws a tablet, with accessible screens', async () => {
    const site = fx.site();
    const [office, line, fresh] = await Promise.all(fx.tablets().map(pageOf));
    const errors: string[] = [];
    for (const p of [office!, line!, fresh!]) p.on('pageerror', (e) => errors.push(e.message));
    const problems: string[] = [];
    const admin = office!;

    // Only admins see the way in.
    await enrolAndSignIn(line!, site, 'rana', '2468', 'Line tablet');
    expect(await line!.getByTestId('open-admin').count()).toBe(0);
    await line!.getByTestId('person-pill').click();

    await enrolAndSignIn(admin, site, 'marguerite', '9753', 'Office tablet');
    await admin.getByTestId('role-menu-button').click(); // people & tablets is one of the tools in the top bar's menu
    await admin.getByTestId('open-admin').click();
    const people = admin.getByTestId('people-table');
    await people.waitFor();
    expect(await people.innerText()).toContain('Rana Okafor');

    // Add an operator: a mismatched PIN is caught in the form first.
    await admin.getByTestId('add-person').click();
    const form = admin.getByTestId('add-person-form');
    await form.getByLabel('Full name').fill('Lina Berg');
    await form.getByLabel('Login').fill('lina');
    await form.getByLabel('Role').selectOption('operator');
    await form.getByLabel('First PIN', { exact: true }).fill('4826');
    await form.getByLabel('First PIN again').fill('4862');
    await form.getByRole('button', { name: 'Add person' }).click();
    await form.getByText('The two PINs are not the same.').waitFor();
    for (const theme of ['light', 'dark'] as const) {
      await setTheme(admin, theme);
      problems.push(...(await check(admin, `admin-add-person-${theme}`)));
    }
    await setTheme(admin, 'light');
    await form.getByLabel('First PIN again').fill('4826');
    await form.getByRole('button', { name: 'Add person' }).click();
    await admin.getByTestId('admin-notice').filter({ hasText: 'Lina Berg can now sign in' }).waitFor();
    await admin.getByTestId('person-lina').waitFor();

    // Lina signs in on the line tablet.
    await signIn(line!, 'lina', '4826');
    await expect.poll(() => line!.getByTestId('person-pill').innerText()).toContain('Lina Berg');

    // Marguerite withdraws Lina's access (two steps).
    await admin.getByRole('button', { name: 'Withdraw access of Lina Berg' }).click();
    await admin.getByRole('button', { name: "Withdraw Lina Berg's access" }).click();
    await admin.getByTestId('person-lina').getByText('Access withdrawn').waitFor();
    for (const theme of ['light', 'dark'] as const) {
      await setTheme(admin, theme);
      problems.push(...(await check(admin, `admin-people-${theme}`)));
    }

    // The line tablet learns it at its next sync: Lina is signed out, and her next sign-in is refused.
    await syncNow(line!);
    await line!.getByText("Lina Berg's access to this site has been withdrawn by an administrator").waitFor({ timeout: 15_000 });
    await line!.getByLabel('Login').fill('lina');
    await line!.getByLabel('PIN').fill('4826');
    await line!.getByRole('button', { name: 'Sign in' }).click();
    await line!.getByRole('alert').filter({ hasText: /access .*has been withdrawn/ }).waitFor();
    expect(await line!.locator('.tile').count()).toBe(0);

    // A connection code for a new tablet, with its expiry and how to use it.
    await admin.getByRole('button', { name: 'Tablets', exact: true }).click();
    await admin.getByTestId('tablets-table').waitFor();
    await admin.getByTestId('issue-code').click();
    const code = await admin.getByTestId('enrolment-code').innerText();
    expect(code).toMatch(/^[2-9A-HJ-NP-Z]{5}-[2-9A-HJ-NP-Z]{5}$/);
    expect(await admin.getByTestId('code-expiry').innerText()).toMatch(/Works once, until \d\d:\d\d \(about 15 min from now\)/);
    for (const theme of ['light', 'dark'] as const) {
      await setTheme(admin, theme);
      problems.push(...(await check(admin, `admin-tablets-${theme}`)));
    }

    // A second browser profile joins with the code, and someone records a reading there while offline.
    await fresh!.goto(site.base);
    await fresh!.getByLabel('Connection code').fill(code);
    await fresh!.getByLabel('Name of this tablet').fill('Paint shop tablet');
    await fresh!.getByRole('button', { name: 'Connect tablet' }).click();
    await signIn(fresh!, 'rana', '2468');
    await fx.tablets()[2]!.setOffline(true);
    await fresh!.getByTestId('tile-bonnet-torque').click();
    const centre = Number(await fresh!.locator('.figure', { hasText: 'Centre' }).locator('.v').innerText());
    await fresh!.getByLabel('Value (N·m)').fill(centre.toFixed(1));
    await fresh!.getByLabel('Value (N·m)').press('Enter');
    await expect.poll(() => fresh!.getByTestId('sync-pill').innerText()).toMatch(/1 waiting to send/);
    const prompt = fresh!.getByTestId('signal-prompt');
    if (await prompt.count()) await prompt.getByRole('button', { name: /later/i }).click();

    // Marguerite sees the new tablet and withdraws it.
    await admin.getByRole('button', { name: 'Refresh' }).click();
    await admin.getByTestId('tablet-Paint shop tablet').waitFor();
    await admin.getByRole('button', { name: 'Withdraw tablet Paint shop tablet' }).click();
    await admin.getByRole('button', { name: 'Withdraw “Paint shop tablet”' }).click();
    await admin.getByTestId('tablet-Paint shop tablet').getByText(/^Withdrawn/).waitFor();

    // Back online, the withdrawn tablet says so and keeps its unsent reading.
    await fx.tablets()[2]!.setOffline(false);
    await fresh!.getByTestId('sync-pill').click();
    await fresh!.getByTestId('sync-now').click();
    await fresh!.getByTestId('sync-sheet').getByRole('button', { name: 'Close' }).click();
    const notice = fresh!.getByTestId('withdrawn-notice');
    await notice.waitFor({ timeout: 15_000 });
    expect(await notice.innerText()).toContain('1 record saved here has not reached the server: it stays on this tablet');
    // Further runs (the online event, the timer) fail the same way; the reading stays waiting.
    await expect.poll(() => fresh!.getByTestId('sync-pill').innerText()).toMatch(/1 waiting to send/);
    for (const theme of ['light', 'dark'] as const) {
      await setTheme(fresh!, theme);
      problems.push(...(await check(fresh!, `withdrawn-tablet-${theme}`)));
    }

    // It was withdrawn by mistake: Marguerite reinstates it (two steps), and its next sync sends the reading.
    await admin.getByRole('button', { name: 'Reinstate tablet Paint shop tablet' }).click();
    await admin.getByTestId('reinstate-confirm').getByText(/records it has not sent go to\s+the server at its next sync/).waitFor();
    for (const theme of ['light', 'dark'] as const) {
      await setTheme(admin, theme);
      problems.push(...(await check(admin, `admin-reinstate-${theme}`)));
    }
    await admin.getByRole('button', { name: 'Reinstate “Paint shop tablet”' }).click();
    await admin.getByTestId('tablet-Paint shop tablet').getByText('In use').waitFor();
    await fresh!.getByTestId('sync-pill').click();
    await fresh!.getByTestId('sync-now').click();
    await fresh!.getByTestId('sync-sheet').getByRole('button', { name: 'Close' }).click();
    await notice.waitFor({ state: 'detached', timeout: 15_000 });
    await expect.poll(() => fresh!.getByTestId('sync-pill').innerText()).not.toMatch(/waiting to send|withdrawn/);
    await admin.getByRole('button', { name: 'Refresh' }).click();
    await expect.poll(() => admin.getByTestId('tablet-Paint shop tablet').innerText()).toMatch(/Records 1–\d+ received/);

    expect(problems).toEqual([]);
    expect(errors).toEqual([]);
  });
});

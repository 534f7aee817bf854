/**
 * A quality engineer's set-up, in Chromium: a new characteristic reaches an operator's tablet through
 * sync and takes a sample there; a new phase with its reason shows on the chart as a boundary; the
 * set-up screens pass axe (WCAG 2.1 AA) in both themes at 1280×800 and 800×1280.
 */
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { checkAtTabletSizes, SHOTS } from './axe';
import { browserAvailable } from './browser';
import { enrolAndSignIn, pageOf, syncNow, useDemoSite } from './site';

const run = browserAvailable();

const check = checkAtTabletSizes;

describe.skipIf(!run)('set-up by a quality engineer', () => {
  const fx = useDemoSite([{ width: 1280, height: 800 }, { width: 1280, height: 800 }]);

  it('creates a characteristic that an operator records on, starts a phase the chart shows, and the screens pass axe', async () => {
    const site = fx.site();
    const [engTablet, opTablet] = fx.tablets();
    const eng = await pageOf(engTablet!);
    const errors: string[] = [];
    eng.on('pageerror', (e) => errors.push(e.message));
    const problems: string[] = [];
    await enrolAndSignIn(eng, site, 'imogen', '8642', 'Quality office tablet');

    // The set-up screen and a new characteristic at the turning cell.
    await eng.getByTestId('role-menu-button').click(); // set-up is one of the tools in the top bar's menu
    await eng.getByTestId('open-setup').click();
    await eng.getByRole('heading', { name: /Set-up of lines/ }).waitFor();
    problems.push(...(await check(eng, 'setup-light')));
    await eng.getByTestId('new-characteristic-st-turning').click();
    const editor = eng.getByTestId('characteristic-editor');
    await editor.waitFor();
    // Nothing is sent while the form is incomplete; the problems are named beside the fields.
    await eng.getByTestId('save-characteristic').click();
    await expect.poll(() => editor.innerText()).toContain('Required.');
    await eng.getByLabel('Name', { exact: true }).fill('Gland nut height');
    await eng.getByLabel('Unit (or what is counted)').fill('mm');
    await eng.getByLabel('Lower limit (LSL)').fill('11.80');
    await eng.getByLabel('Upper limit (USL)').fill('12.2');
    await eng.getByLabel('Target').fill('12');
    await eng.getByLabel('Step 1', { exact: true }).fill('Re-measure the nut on the height gauge.');
    await eng.getByRole('button', { name: 'Add a step' }).click();
    await eng.getByLabel('Step 2', { exact: true }).fill('Check the press stop and tell the setter.');
    await eng.getByRole('button', { name: 'Nelson 1–4' }).click();
    await eng.getByTestId('safety-critical').check();
    await eng.getByTestId('safety-caution').waitFor();
    problems.push(...(await check(eng, 'characteristic-editor-light')));

    // Offline: said plainly, nothing sent, the form kept.
    await engTablet!.setOffline(true);
    await eng.evaluate(() => window.dispatchEvent(new Event('offline')));
    await eng.getByTestId('save-characteristic').click();
    await expect.poll(() => eng.getByRole('alert').first().innerText(), { timeout: 10_000 }).toMatch(/need a connection/);
    expect(await eng.getByLabel('Name', { exact: true }).inputValue()).toBe('Gland nut height');
    await engTablet!.setOffline(false);
    await eng.getByTestId('save-characteristic').click();
    await eng.getByRole('heading', { name: 'Gland nut height' }).waitFor({ timeout: 20_000 });
    expect(await site.store.getSetup('characteristic', 'gland-nut-height')).toBeTruthy();

    // The operator's tablet pulls it and records a sample on it.
    const op = await pageOf(opTablet!);
    await enrolAndSignIn(op, site, 'rana', '2468', 'Turning cell tablet');
    expect(await op.getByTestId('open-setup').count()).toBe(0); // operators never see the set-up entry point
    await syncNow(op);
    await op.getByRole('navigation', { name: 'Stations' }).getByRole('button', { name: 'Turning cell T4' }).click();
    await op.getByTestId('tile-gland-nut-height').click();
    await op.getByTestId('safety-caution').waitFor();
    expect(await op.getByTestId('open-new-phase').count()).toBe(0);
    const field = op.getByLabel('Value (mm)');
    await field.fill('12.01');
    await field.press('Enter');
    await expect.poll(() => op.getByTestId('sync-pill').innerText(), { timeout: 20_000 }).toMatch(/All sent/);

    // A new phase on the demo's bonnet torque (XmR), from a point already on the chart, with a reason.
    await eng.getByRole('button', { name: '← Station board' }).click().catch(() => undefined);
    await eng.getByTestId('role-menu-button').click(); // set-up is one of the tools in the top bar's menu
    await eng.getByTestId('open-setup').click();
    await eng.getByRole('button', { name: 'Change Bonnet bolt torque' }).click();
    await eng.getByTestId('characteristic-editor').waitFor();
    await eng.getByRole('button', { name: '← Bonnet bolt torque' }).click();
    await eng.getByTestId('main-chart').locator('canvas').first().waitFor();
    expect(await eng.getByTestId('phase-boundaries').count()).toBe(0);
    await eng.getByTestId('open-new-phase').click();
    await eng.getByTestId('phase-form').waitFor();
    problems.push(...(await check(eng, 'new-phase-light')));
    await eng.getByTestId('save-phase').click();
    await expect.poll(() => eng.getByTestId('phase-form').innerText()).toContain('Required.');
    await eng.getByLabel('Reason: the documented process change').fill('New torque tool calibrated, change note CN-118');
    await eng.getByTestId('start-at-point').check();
    const options = await eng.getByTestId('start-point').locator('option').allInnerTexts();
    await eng.getByTestId('start-point').selectOption({ index: 9 }); // ten points from the newest
    await eng.getByLabel('Subgroups in the baseline').fill('8');
    await eng.getByTestId('save-phase').click();
    // Nothing is sent before the engineer has read what will change on the chart.
    await expect.poll(() => eng.getByTestId('confirm-phase').innerText()).toMatch(/Limits from point \d+ on will be recomputed from the next 8 subgroups \(phase 2\)/);
    problems.push(...(await check(eng, 'new-phase-confirm-light')));
    await eng.getByTestId('confirm-phase-yes').click();
    await eng.getByTestId('main-chart').locator('canvas').first().waitFor({ timeout: 20_000 });
    await expect.poll(() => eng.getByTestId('phase-boundaries').innerText(), { timeout: 10_000 }).toMatch(/New phase 2 from point \d+/);
    const chosen = Number(/Point (\d+)/.exec(options[9]!)![1]);
    expect(await eng.getByTestId('phase-boundaries').innerText()).toContain(`from point ${chosen}`);
    await eng.screenshot({ path: join(SHOTS, 'phase-boundary-light-1280x800.png') });

    // Limits by phase: both phases, the reason, the baseline of 8 marked provisional.
    await eng.getByTestId('open-limits-history').click();
    const table = eng.getByTestId('limits-history');
    await table.waitFor();
    expect(await eng.getByTestId('history-row-2').innerText()).toMatch(/CN-118[\s\S]*Baseline of 8 subgroups — provisional/);
    problems.push(...(await check(eng, 'limits-history-light')));
    // Printable: the print stylesheet drops the top bar and the buttons, and keeps the table.
    await eng.emulateMedia({ media: 'print' });
    expect(await eng.locator('.topbar').isVisible()).toBe(false);
    expect(await eng.getByRole('button', { name: 'Print' }).isVisible()).toBe(false);
    expect(await table.isVisible()).toBe(true);
    await eng.screenshot({ path: join(SHOTS, 'limits-history-print.png'), fullPage: true });
    await eng.emulateMedia({ media: 'screen' });

    // The reason had a typo: corrected, with a note, as a new version of the phase.
    await eng.getByTestId('change-phase-2').click();
    await eng.getByTestId('phase-change-form').waitFor();
    problems.push(...(await check(eng, 'phase-change-light')));
    await eng.getByLabel('Reason: the documented process change').fill('New torque tool calibrated, change note CN-119');
    await eng.getByTestId('save-change').click();
    await expect.poll(() => eng.getByTestId('phase-change-form').innerText()).toContain('Say why the phase is being changed.');
    await eng.getByLabel('Why this correction').fill('Wrong change note number');
    await eng.getByTestId('save-change').click();
    await expect.poll(() => eng.getByTestId('confirm-change').innerText()).toContain('Only the reason changes, to “New torque tool calibrated, change note CN-119”: the chart stays as it is.');
    await eng.getByTestId('confirm-change-yes').click();
    await expect.poll(() => eng.getByTestId('history-row-2').innerText(), { timeout: 20_000 }).toMatch(/CN-119[\s\S]*Corrected .* by .*: Wrong change note number/);
    expect((await site.store.getSetup('phase', 'bonnet-torque:phase-2'))?.body).toMatchObject({ reason: 'New torque tool calibrated, change note CN-119' });

    // Then withdrawn (dark theme here): the confirmation names the points that go back to phase 1's limits.
    await eng.getByTestId('change-phase-2').click();
    await eng.getByTestId('phase-withdraw-form').waitFor();
    await eng.getByTestId('theme-toggle').click();
    await expect.poll(() => eng.evaluate(() => document.documentElement.dataset.theme)).toBe('dark');
    problems.push(...(await check(eng, 'phase-change-dark')));
    await eng.getByTestId('withdraw-note').fill('The tool change was on the other spindle');
    await eng.getByTestId('withdraw-phase').click();
    await expect.poll(() => eng.getByTestId('confirm-withdraw').innerText()).toMatch(/Phase 2 will be withdrawn: points \d+–\d+ will be judged against phase 1's limits\./);
    expect(await eng.getByTestId('confirm-withdraw').innerText()).toContain(`points ${chosen}–`);
    problems.push(...(await check(eng, 'phase-withdraw-confirm-dark')));
    await eng.getByTestId('confirm-withdraw-yes').click();
    await expect.poll(() => eng.getByTestId('history-row-2').innerText(), { timeout: 20_000 }).toMatch(/withdrawn[\s\S]*Withdrawn .*: The tool change was on the other spindle/);
    expect(await eng.getByTestId('change-phase-2').count()).toBe(0);
    await eng.getByTestId('theme-toggle').click();
    await expect.poll(() => eng.evaluate(() => document.documentElement.dataset.theme)).toBe('light');
    await eng.getByRole('button', { name: '← Bonnet bolt torque' }).click();
    await eng.getByTestId('main-chart').locator('canvas').first().waitFor();
    await expect.poll(() => eng.getByTestId('phase-boundaries').count(), { timeout: 10_000 }).toBe(0);
    await eng.getByTestId('open-limits-history').click();
    await eng.getByTestId('limits-history').waitFor();

    // The same screens in the dark theme.
    await eng.getByTestId('theme-toggle').click();
    await expect.poll(() => eng.evaluate(() => document.documentElement.dataset.theme)).toBe('dark');
    problems.push(...(await check(eng, 'limits-history-dark')));
    await eng.getByRole('button', { name: '← Bonnet bolt torque' }).click();
    await eng.getByTestId('open-new-phase').click();
    await eng.getByTestId('phase-form').waitFor();
    await eng.getByTestId('limits-given').check();
    problems.push(...(await check(eng, 'new-phase-dark')));
    await eng.getByRole('button', { name: 'Cancel' }).click();
    await eng.getByTestId('edit-characteristic').click();
    await eng.getByTestId('characteristic-editor').waitFor();
    await eng.getByTestId('chart-type').selectOption('ewma');
    await eng.getByTestId('phase-notice').waitFor();
    problems.push(...(await check(eng, 'characteristic-editor-dark')));
    await eng.getByRole('button', { name: 'Cancel' }).click();
    await eng.getByTestId('role-menu-button').click(); // set-up is one of the tools in the top bar's menu
    await eng.getByTestId('open-setup').click();
    await eng.getByRole('heading', { name: /Set-up of lines/ }).waitFor();
    problems.push(...(await check(eng, 'setup-dark')));

    expect(problems).toEqual([]);
    expect(errors).toEqual([]);
  });
});

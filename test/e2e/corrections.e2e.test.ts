/**
 * Corrections and exclusions at a tablet in portrait: an engineer corrects a subgroup and leaves
 * another out of the limit calculation, each with a reason; both reach the server as new records
 * that supersede the originals, which stay in the record (nothing is overwritten).
 */
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { DEMO_SITE_ID } from '../../src/server/demo/demo-site';
import type { Sample } from '../../src/schema';
import { browserAvailable } from './browser';
import { enrolAndSignIn, pageOf, syncNow, useDemoSite, type DemoSite } from './site';

const run = browserAvailable();

async function tapPoint(page: Page, fromRight: number) {
  const over = page.getByTestId('main-chart').locator('.u-over');
  await over.scrollIntoViewIfNeeded();
  const box = (await over.boundingBox())!;
  // 40 points fill the plot: one point is box.width / 41 wide (half a step of margin each side).
  const step = box.width / 41;
  await page.mouse.click(box.x + box.width - step * (0.5 + fromRight) - 1, box.y + box.height / 2);
  await page.getByTestId('point-details').waitFor();
}

async function samplesOnServer(site: DemoSite): Promise<Sample[]> {
  const rows = await site.store.readLog(DEMO_SITE_ID, 0, 100_000);
  return rows.flatMap((r) => (r.entry.kind === 'record' && r.entry.body.kind === 'sample' ? [r.entry.body] : []));
}

describe.skipIf(!run)('corrections and exclusions', () => {
  const fx = useDemoSite([{ width: 800, height: 1280 }]);

  it('supersede the originals with a reason and keep them', async () => {
    const site = fx.site();
    const page = await pageOf(fx.tablets()[0]!);
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    await enrolAndSignIn(page, site, 'imogen', '8642', 'Engineer tablet');
    await page.getByRole('navigation', { name: 'Stations' }).getByRole('button', { name: 'Turning cell T4' }).click();
    await page.getByTestId('tile-bore-dia').click();
    await page.getByTestId('main-chart').locator('canvas').first().waitFor();
    const before = await samplesOnServer(site);

    // Correct the newest subgroup: a value was keyed with a digit swapped.
    await tapPoint(page, 0);
    const details = page.getByTestId('point-details');
    await details.getByRole('button', { name: 'Correct this sample' }).click();
    await details.getByLabel(/Corrected values/).fill('25.001 25.002 24.999 25.000 25.003');
    await details.getByLabel('Reason (kept with the record)').fill('Digits swapped on the third value');
    await details.getByRole('button', { name: 'Save correction' }).click();
    await details.waitFor({ state: 'detached' });
    await tapPoint(page, 0);
    await expect.poll(() => details.innerText()).toContain('Digits swapped on the third value');
    await page.screenshot({ path: 'test-results/screenshots/point-corrected-800x1280.png' });
    await details.getByRole('button', { name: 'Close' }).click();

    // Leave the subgroup before it out of the limits.
    await tapPoint(page, 1);
    await details.getByRole('button', { name: 'Leave out of limits' }).click();
    await details.getByLabel('Reason (kept with the record)').fill('Set-up part after the insert change');
    await details.getByRole('button', { name: 'Leave out', exact: true }).click();
    await details.waitFor({ state: 'detached' });

    await syncNow(page);
    const after = await samplesOnServer(site);
    const added = after.filter((s) => !before.some((b) => b.id === s.id));
    expect(added).toHaveLength(2);
    const correction = added.find((s) => s.reason === 'Digits swapped on the third value')!;
    const exclusion = added.find((s) => s.reason === 'Set-up part after the insert change')!;
    expect(correction.values).toEqual([25.001, 25.002, 24.999, 25.0, 25.003]);
    expect(exclusion.excluded).toBe(true);
    // The originals are still on the server, untouched.
    for (const s of [correction, exclusion]) {
      const original = after.find((o) => o.id === s.supersedes)!;
      expect(original).toBeDefined();
      expect(original.excluded).toBeUndefined();
      expect(before.find((b) => b.id === original.id)).toEqual(original);
    }
    // The history exports as CSV with the correction in place and its reason.
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-csv').click()]);
    expect(download.suggestedFilename()).toBe('bore-dia-history.csv');
    const csv = await (await import('node:fs/promises')).readFile((await download.path())!, 'utf8');
    expect(csv.split('\r\n')[0]).toContain('correction_or_exclusion_reason');
    expect(csv).toContain('Digits swapped on the third value');
    expect(csv).toContain('Set-up part after the insert change');
    expect(errors).toEqual([]);
  });
});

/**
 * History import at a tablet: an engineer brings in a small check sheet with one bad row, sees the
 * problem with its line number, records the good rows, sees them on the chart; after sync the server
 * holds each once, and importing the same file again adds nothing. The import screen is checked with
 * axe in both themes at both tablet sizes. A second test imports 10,000 rows and measures how long the
 * main thread is kept busy at a stretch.
 */
import { join, resolve } from 'node:path';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { DEMO_SITE_ID } from '../../src/server/demo/demo-site';
import type { Sample } from '../../src/schema';
import { axeViolations } from './axe';
import { browserAvailable } from './browser';
import { enrolAndSignIn, pageOf, recordsOnServer, syncNow, useDemoSite, type DemoSite } from './site';

const run = browserAvailable();
const SHOTS = resolve('test-results/screenshots');
const SIZES = [{ width: 1280, height: 800 }, { width: 800, height: 1280 }] as const;

async function importedOnServer(site: DemoSite, characteristicId: string): Promise<Sample[]> {
  const rows = await site.store.readLog(DEMO_SITE_ID, 0, 1_000_000);
  return rows.flatMap((r) => (r.entry.kind === 'record' && r.entry.body.kind === 'sample' && r.entry.body.characteristicId === characteristicId
    && r.entry.body.imported ? [r.entry.body] : []));
}

async function openCharacteristic(page: Page, station: string, id: string) {
  await page.getByRole('navigation', { name: 'Stations' }).getByRole('button', { name: station }).click();
  await page.getByTestId(`tile-${id}`).click();
  await page.getByTestId('main-chart').locator('canvas').first().waitFor();
}

async function pointCount(page: Page): Promise<number> {
  return Number(await page.getByLabel('Current limits').locator('.figure', { hasText: 'Points' }).locator('.v').innerText());
}

async function chooseFile(page: Page, name: string, text: string) {
  await page.getByTestId('import-file').setInputFiles({ name, mimeType: 'text/csv', buffer: Buffer.from(text, 'utf8') });
}

/** ISO time `minutesAgo` before now, on an odd second so no demo sample shares it. */
const ago = (minutesAgo: number) => new Date(Math.floor(Date.now() / 60_000) * 60_000 - minutesAgo * 60_000 + 17_000).toISOString();

describe.skipIf(!run)('history import', () => {
  const fx = useDemoSite([{ width: 1280, height: 800 }]);

  it('shows the bad row, records the good ones once, and adds nothing the second time', async () => {
    const site = fx.site();
    const page = await pageOf(fx.tablets()[0]!);
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    await enrolAndSignIn(page, site, 'imogen', '8642', 'Quality office tablet');
    await openCharacteristic(page, 'Bonnet assembly', 'bonnet-torque');
    const before = await pointCount(page);

    const sheet = [
      'Taken,Torque,Batch,Notes',
      `${ago(200)},25.1,B-101,`,
      `${ago(190)},24.9,B-101,"Re-checked, analyser OK"`,
      `${ago(180)},not read,B-101,`,
      `${ago(170)},25.0,B-102,`,
      `${ago(160)},25.2,B-102,`,
    ].join('\r\n');
    await page.getByTestId('import-csv').click();
    await page.getByRole('heading', { name: 'Import history into Bonnet bolt torque' }).waitFor();
    await chooseFile(page, 'torque-check-sheet.csv', sheet);
    const preview = page.getByTestId('import-preview');
    await preview.waitFor();
    expect(await page.getByTestId('count-ready').innerText()).toBe('4');
    expect(await page.getByTestId('count-problem').innerText()).toBe('1');
    expect(await page.getByTestId('problem-rows').innerText()).toContain('Line 4: “not read” is not a number.');

    // The screen as the engineer sees it, in both themes at both sizes: no WCAG 2.1 AA violation.
    const problems: string[] = [];
    for (const theme of ['light', 'dark'] as const) {
      if (theme === 'dark') await page.getByTestId('theme-toggle').click();
      await expect.poll(() => page.evaluate(() => document.documentElement.dataset.theme)).toBe(theme);
      for (const size of SIZES) {
        await page.setViewportSize(size);
        await page.waitForTimeout(150);
        await page.screenshot({ path: join(SHOTS, `import-${theme}-${size.width}x${size.height}.png`), fullPage: true });
        for (const v of await axeViolations(page)) problems.push(`${theme} ${size.width}x${size.height}: ${v.id} (${v.impact}) ${v.help} → ${v.nodes.slice(0, 3).join(', ')}`);
      }
    }
    expect(problems).toEqual([]);
    await page.getByTestId('theme-toggle').click();
    await page.setViewportSize(SIZES[0]);

    await page.getByTestId('import-confirm').click();
    await expect.poll(() => page.getByTestId('import-outcome').innerText(), { timeout: 20_000 }).toContain('4 samples recorded');
    // The preview now finds every good row on the chart.
    await expect.poll(() => page.getByTestId('count-already').innerText()).toBe('4');
    await page.getByRole('button', { name: 'Back to the chart' }).click();
    await page.getByTestId('main-chart').locator('canvas').first().waitFor();
    await expect.poll(() => pointCount(page)).toBe(before + 4);
    await page.screenshot({ path: join(SHOTS, 'import-chart-after-1280x800.png') });

    await syncNow(page);
    const onServer = await importedOnServer(site, 'bonnet-torque');
    expect(onServer.map((s) => s.values![0]).sort()).toEqual([24.9, 25, 25.1, 25.2]);
    expect(onServer.every((s) => s.recordedBy === 'p-imogen' && s.imported?.file === 'torque-check-sheet.csv')).toBe(true);
    expect(onServer.find((s) => s.values![0] === 24.9)!.comment).toBe('Re-checked, analyser OK');
    const counts = await recordsOnServer(site.store);
    for (const s of onServer) expect(counts.get(s.id)).toBe(1);

    // The same file again: every good row is recognised, nothing is recorded, the server is unchanged.
    await page.getByTestId('import-csv').click();
    await chooseFile(page, 'torque-check-sheet.csv', sheet);
    await page.getByTestId('import-preview').waitFor();
    expect(await page.getByTestId('count-already').innerText()).toBe('4');
    expect(await page.getByTestId('count-ready').innerText()).toBe('0');
    expect(await page.getByTestId('import-confirm').isDisabled()).toBe(true);
    await page.getByRole('button', { name: 'Cancel' }).click();
    expect(await pointCount(page)).toBe(before + 4);
    await syncNow(page);
    expect(await importedOnServer(site, 'bonnet-torque')).toHaveLength(4);
    expect(errors).toEqual([]);
  });

  it('imports 10,000 rows without freezing the screen', async () => {
    const page = await pageOf(fx.tablets()[0]!);
    await page.getByRole('button', { name: '← Station board' }).click();
    await openCharacteristic(page, 'Cartridge filler F2', 'sealant-viscosity');
    const before = await pointCount(page);
    // One reading every 5 minutes over the 35 days before the demo's history, around the demo's level.
    const start = Date.now() - 80 * 24 * 3_600_000;
    const lines = ['taken_at,value'];
    for (let i = 0; i < 10_000; i++) lines.push(`${new Date(start + i * 300_000).toISOString()},${(42 + ((i * 7919) % 21) / 10 - 1).toFixed(1)}`);
    await page.getByTestId('import-csv').click();
    await page.getByRole('heading', { name: /Import history into/ }).waitFor();

    // Long tasks (main thread busy > 50 ms) while the file is read, checked, previewed and recorded.
    await page.evaluate(() => {
      const w = window as unknown as { longTasks: number[] };
      w.longTasks = [];
      new PerformanceObserver((list) => { for (const e of list.getEntries()) w.longTasks.push(e.duration); }).observe({ type: 'longtask' });
    });
    const t0 = Date.now();
    await chooseFile(page, 'viscosity-2026.csv', lines.join('\n'));
    await expect.poll(() => page.getByTestId('count-ready').innerText(), { timeout: 30_000 }).toBe('10000');
    const previewMs = Date.now() - t0;
    const t1 = Date.now();
    await page.getByTestId('import-confirm').click();
    await expect.poll(() => page.getByTestId('import-outcome').count(), { timeout: 120_000, interval: 200 }).toBe(1);
    const recordMs = Date.now() - t1;
    const longTasks = await page.evaluate(() => (window as unknown as { longTasks: number[] }).longTasks);
    const longest = Math.max(0, ...longTasks);
    console.log(`[import 10,000 rows] read+check+preview ${previewMs} ms; record ${recordMs} ms; long tasks: ${longTasks.length}, longest ${longest.toFixed(0)} ms, all: ${longTasks.map((d) => d.toFixed(0)).join(' ')}`);
    expect(await page.getByTestId('import-outcome').innerText()).toContain('10000 samples recorded');
    await page.getByRole('button', { name: 'Back to the chart' }).click();
    await expect.poll(() => pointCount(page), { timeout: 30_000 }).toBe(before + 10_000);
    // No stretch of main-thread work long enough to feel frozen. Measured here 137–174 ms (the chart's
    // re-read of 10,000 samples at the end); before the check ran in slices it was 487 ms.
    expect(longest).toBeLessThan(400);
  });
});

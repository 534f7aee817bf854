import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { join, resolve } from 'node:path';
import type { Page } from 'playwright-core';

/** Where the browser tests put their screenshots (git-ignored). */
export const SHOTS = resolve('test-results/screenshots');

const axeSource = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8');

export interface AxeViolation {
  id: string;
  impact: string | null;
  help: string;
  nodes: string[];
}

/**
 * Runs axe-core (WCAG 2.1 A and AA rules) on the page as it is and returns the violations.
 * The source is evaluated through the DevTools protocol, so the app's CSP stays in force.
 */
export async function axeViolations(page: Page): Promise<AxeViolation[]> {
  await page.evaluate(axeSource);
  return page.evaluate(async () => {
    const axe = (window as unknown as { axe: { run: (ctx: unknown, opts: unknown) => Promise<{ violations: { id: string; impact: string | null; help: string; nodes: { target: string[] }[] }[] }> } }).axe;
    const r = await axe.run(document, { runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'] } });
    return r.violations.map((v) => ({ id: v.id, impact: v.impact, help: v.help, nodes: v.nodes.map((n) => n.target.join(' ')) }));
  });
}

/** The two tablet sizes every screen is checked at. */
export const TABLET_SIZES = [
  { name: 'landscape', width: 1280, height: 800 },
  { name: 'portrait', width: 800, height: 1280 },
] as const;

/**
 * The page at both tablet sizes: a screenshot of each in test-results/screenshots/<name>-<w>x<h>.png
 * (the whole page unless `fullPage` is false), and what is wrong, in words: the axe violations, a
 * page that scrolls sideways, a top bar of more than two rows. Leaves the page in landscape.
 */
export async function checkAtTabletSizes(page: Page, name: string, { fullPage = true } = {}): Promise<string[]> {
  const problems: string[] = [];
  for (const size of TABLET_SIZES) {
    await page.setViewportSize(size);
    await page.waitForTimeout(150); // one layout pass for the charts' resize observers
    await page.screenshot({ path: join(SHOTS, `${name}-${size.width}x${size.height}.png`), fullPage });
    for (const v of await axeViolations(page)) problems.push(`${name} @${size.name}: ${v.id} (${v.impact}) ${v.help} → ${v.nodes.slice(0, 3).join(', ')}`);
    // Nothing scrolls sideways, and the top bar keeps to two rows of 48 px touch targets at most.
    const m = await page.evaluate(() => ({ sw: document.documentElement.scrollWidth, cw: document.documentElement.clientWidth, bar: document.querySelector('.topbar')?.getBoundingClientRect().height ?? 0 }));
    if (m.sw > m.cw) problems.push(`${name} @${size.name}: scrolls sideways (${m.sw} > ${m.cw} px)`);
    if (m.bar > 2 * 48 + 40) problems.push(`${name} @${size.name}: the top bar is ${m.bar} px high (more than two rows)`);
  }
  await page.setViewportSize(TABLET_SIZES[0]);
  await page.waitForTimeout(150);
  return problems;
}

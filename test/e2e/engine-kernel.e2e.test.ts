/**
 * The engine's WebAssembly SIMD kernel (src/engine/zone-kernel.ts) in the tablet's browser: the
 * app's content security policy must let it compile (else every chart falls back to the slower
 * JavaScript loop, silently). A page served without 'wasm-unsafe-eval' is the control: there the
 * same bytes are refused, so the check can fail.
 */
import { describe, expect, it } from 'vitest';
import { zoneModule } from '../../src/engine/zone-kernel';
import { browserAvailable } from './browser';
import { pageOf, useDemoSite } from './site';

const run = browserAvailable();

describe.skipIf(!run)('engine kernel in Chromium', () => {
  const fx = useDemoSite();
  const bytes = Array.from(zoneModule());
  const compile = (b: number[]) => {
    const wasm = (globalThis as unknown as { WebAssembly: { validate(x: Uint8Array): boolean; Module: new (x: Uint8Array) => object } }).WebAssembly;
    const u8 = new Uint8Array(b);
    if (!wasm.validate(u8)) return 'invalid';
    try {
      new wasm.Module(u8);
      return 'compiled';
    } catch (e) {
      return `refused: ${String(e)}`;
    }
  };

  it('compiles under the app’s policy, and is refused by a page whose policy lacks wasm-unsafe-eval', async () => {
    const page = await pageOf(fx.tablets()[0]!);
    await page.goto(fx.site().base);
    expect(await page.evaluate(compile, bytes)).toBe('compiled');

    await page.route('**/csp-control', (route) =>
      route.fulfill({ status: 200, contentType: 'text/html', headers: { 'content-security-policy': "default-src 'self'; script-src 'self'" }, body: '<!doctype html><title>control</title>' }),
    );
    await page.goto(`${fx.site().base}/csp-control`);
    expect(await page.evaluate(compile, bytes)).toMatch(/^refused/);
  });
});

import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from './fixtures';

let server: TestServer;
let dist: string;
beforeEach(async () => {
  server = await startTestServer({ distDir: 'placeholder' });
  await server.app.close();
  // A second server on the same store, with a real dist folder inside the test's temp dir.
  dist = join(server.dir, 'dist');
  mkdirSync(join(dist, 'assets'), { recursive: true });
  writeFileSync(join(dist, 'index.html'), '<!doctype html><title>Plumbline</title><script type="module" src="/assets/index-AbCd1234.js"></script>');
  writeFileSync(join(dist, 'sw.js'), 'self.addEventListener("install", () => {});');
  writeFileSync(join(dist, 'assets', 'index-AbCd1234.js'), 'console.log(1);');
  writeFileSync(join(dist, 'manifest.webmanifest'), '{"name":"Plumbline"}');
  writeFileSync(join(server.dir, 'secret.txt'), 'not for the web');
  const { createServer } = await import('../../src/server/create-server');
  const app = createServer({ store: server.store, distDir: dist, now: server.now });
  server = { ...server, app };
});
afterEach(async () => server.close());

const get = (url: string, headers: Record<string, string> = {}) => server.app.inject({ method: 'GET', url, headers });

describe('serving the built app', () => {
  it('serves index.html at / with no-cache and the security headers', async () => {
    const res = await get('/');
    expect(res.statusCode).toBe(200);
    expect(res.headers['content-type']).toBe('text/html; charset=utf-8');
    expect(res.headers['cache-control']).toBe('no-cache');
    expect(res.body).toContain('<title>Plumbline</title>');
    const csp = String(res.headers['content-security-policy']);
    for (const part of ["default-src 'self'", "img-src 'self' data:", "style-src 'self' 'unsafe-inline'", "connect-src 'self'", "worker-src 'self'", "manifest-src 'self'", "frame-ancestors 'none'"]) {
      expect(csp).toContain(part);
    }
    expect(csp).not.toMatch(/script-src[^;]*unsafe-inline/);
    // WebAssembly compilation for the engine's SIMD kernel, never eval() of JavaScript
    expect(csp).toMatch(/script-src 'self' 'wasm-unsafe-eval'(;|$)/);
    expect(csp).not.toContain("'unsafe-eval'");
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['referrer-policy']).toBe('no-referrer');
  });

  it('serves sw.js with no-cache and hashed assets with a year of immutable cache', async () => {
    const sw = await get('/sw.js');
    expect(sw.statusCode).toBe(200);
    expect(sw.headers['content-type']).toBe('text/javascript; charset=utf-8');
    expect(sw.headers['cache-control']).toBe('no-cache');
    const asset = await get('/assets/index-AbCd1234.js');
    expect(asset.headers['cache-control']).toBe('public, max-age=31536000, immutable');
    expect((await get('/manifest.webmanifest')).headers['content-type']).toBe('application/manifest+json; charset=utf-8');
  });

  it('falls back to index.html for app routes, with the query string ignored', async () => {
    const res = await get('/characteristics/bore-dia?tab=chart');
    expect(res.statusCode).toBe(200);
    expect(res.body).toContain('<title>Plumbline</title>');
    expect(res.headers['cache-control']).toBe('no-cache');
  });

  it('answers 404 for a missing file with an extension rather than sending HTML', async () => {
    const res = await get('/assets/index-Gone0000.js');
    expect(res.statusCode).toBe(404);
    expect(res.json().error).toBe('not-found');
    expect(res.headers['content-security-policy']).toBeDefined();
  });

  it('does not serve files outside dist', async () => {
    for (const url of ['/../secret.txt', '/%2e%2e/secret.txt', '/assets/..%2f..%2fsecret.txt']) {
      const res = await get(url);
      expect(res.body).not.toContain('not for the web');
    }
  });

  it('answers 304 to a matching If-None-Match', async () => {
    const first = await get('/sw.js');
    const again = await get('/sw.js', { 'if-none-match': String(first.headers.etag) });
    expect(again.statusCode).toBe(304);
  });

  it('does not need the protocol header outside /api', async () => {
    expect((await get('/')).statusCode).toBe(200);
  });
});

describe('without a build', () => {
  it('says the app has not been built', async () => {
    const { createServer } = await import('../../src/server/create-server');
    const app = createServer({ store: server.store, distDir: join(server.dir, 'missing'), now: server.now });
    const res = await app.inject({ method: 'GET', url: '/' });
    expect(res.statusCode).toBe(404);
    expect(res.json().error).toBe('not-built');
    await app.close();
  });
});

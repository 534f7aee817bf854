/**
 * Content-Security-Policy for the built Preact app: no inline scripts and no eval; inline styles
 * are allowed because uPlot sets style attributes; data: images for small icons.
 * 'wasm-unsafe-eval' lets the engine compile its WebAssembly SIMD kernel (src/engine/zone-kernel.ts,
 * assembled by our own code, never fetched): it allows WebAssembly compilation only, not eval()
 * of JavaScript. Without it the engine would fall back to its JavaScript loop.
 */
export const CONTENT_SECURITY_POLICY = [
  "default-src 'self'",
  "script-src 'self' 'wasm-unsafe-eval'",
  "img-src 'self' data:",
  "style-src 'self' 'unsafe-inline'",
  "connect-src 'self'",
  "worker-src 'self'",
  "manifest-src 'self'",
  "frame-ancestors 'none'",
  "base-uri 'self'",
  "form-action 'self'",
  "object-src 'none'",
].join('; ');

/** Headers set on every response, API and static alike. */
export const SECURITY_HEADERS: Readonly<Record<string, string>> = {
  'content-security-policy': CONTENT_SECURITY_POLICY,
  'x-content-type-options': 'nosniff',
  'referrer-policy': 'no-referrer',
  'x-frame-options': 'DENY',
};

// Stubs for DOM-less test environments: uPlot needs matchMedia and a 2D canvas context,
// neither of which happy-dom provides (stack.md P5). Only installed where a DOM exists.
if (typeof window !== 'undefined') {
  if (!window.matchMedia) {
    (window as unknown as { matchMedia: unknown }).matchMedia = () => ({
      matches: false, addListener() {}, removeListener() {}, addEventListener() {}, removeEventListener() {},
    });
  }
  const noop = new Proxy({}, { get: () => () => ({ width: 0 }) });
  HTMLCanvasElement.prototype.getContext = (() => noop) as unknown as typeof HTMLCanvasElement.prototype.getContext;
  (globalThis as unknown as { Path2D: unknown }).Path2D ??= class { moveTo() {} lineTo() {} rect() {} arc() {} closePath() {} };
}

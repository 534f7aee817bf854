/** Standard normal density, cumulative distribution and quantile. */

const SQRT_2PI = Math.sqrt(2 * Math.PI);

export function normalPdf(x: number): number {
  return Math.exp(-0.5 * x * x) / SQRT_2PI;
}

/**
 * Φ(x) by Hart's rational approximation (Hart et al. 1968, algorithm 5666, as arranged by
 * G. West, "Better approximations to cumulative normal functions", 2005): double precision
 * in both tails, so far-tail ppm values keep their relative accuracy.
 */
export function normalCdf(x: number): number {
  const ax = Math.abs(x);
  let tail: number;
  if (ax > 37) {
    tail = 0;
  } else {
    const e = Math.exp(-0.5 * ax * ax);
    if (ax < 7.07106781186547) {
      let num = 3.52624965998911e-2 * ax + 0.700383064443688;
      num = num * ax + 6.37396220353165;
      num = num * ax + 33.912866078383;
      num = num * ax + 112.079291497871;
      num = num * ax + 221.213596169931;
      num = num * ax + 220.206867912376;
      let den = 8.83883476483184e-2 * ax + 1.75566716318264;
      den = den * ax + 16.064177579207;
      den = den * ax + 86.7807322029461;
      den = den * ax + 296.564248779674;
      den = den * ax + 637.333633378831;
      den = den * ax + 793.826512519948;
      den = den * ax + 440.413735824752;
      tail = (e * num) / den;
    } else {
      let b = ax + 0.65;
      b = ax + 4 / b;
      b = ax + 3 / b;
      b = ax + 2 / b;
      b = ax + 1 / b;
      tail = e / b / SQRT_2PI;
    }
  }
  return x > 0 ? 1 - tail : tail;
}

/** Upper tail 1 − Φ(x) without cancellation. */
export function normalSf(x: number): number {
  return normalCdf(-x);
}

// Acklam's rational starting approximation, refined by Newton steps on normalCdf.
const A = [-3.969683028665376e1, 2.209460984245205e2, -2.759285104469687e2, 1.38357751867269e2, -3.066479806614716e1, 2.506628277459239];
const B = [-5.447609879822406e1, 1.615858368580409e2, -1.556989798598866e2, 6.680131188771972e1, -1.328068155288572e1];
const C = [-7.784894002430293e-3, -3.223964580411365e-1, -2.400758277161838, -2.549732539343734, 4.374664141464968, 2.938163982698783];
const D = [7.784695709041462e-3, 3.224671290700398e-1, 2.445134137142996, 3.754408661907416];

function poly(c: readonly number[], x: number): number {
  let r = 0;
  for (const k of c) r = r * x + k;
  return r;
}

/** Φ⁻¹(p) for 0 < p < 1; ±Infinity at 0 and 1, NaN outside [0, 1] (programmer error). */
export function normalQuantile(p: number): number {
  if (!(p >= 0 && p <= 1)) return NaN;
  if (p === 0) return -Infinity;
  if (p === 1) return Infinity;
  if (p > 0.5) return -lowerQuantile(1 - p);
  return lowerQuantile(p);
}

function lowerQuantile(p: number): number {
  let x: number;
  if (p < 0.02425) {
    const q = Math.sqrt(-2 * Math.log(p));
    x = poly(C, q) / (poly(D, q) * q + 1);
  } else {
    const q = p - 0.5;
    const r = q * q;
    x = (poly(A, r) * q) / (poly(B, r) * r + 1);
  }
  // Two Halley steps take the ~1e-9 starting value to machine precision.
  for (let i = 0; i < 2; i++) {
    const u = (normalCdf(x) - p) * SQRT_2PI * Math.exp(0.5 * x * x);
    x = x - u / (1 + 0.5 * x * u);
  }
  return x;
}

/** Gamma function helpers and the chi-square distribution. */

// Lanczos approximation, g = 7, nine coefficients (relative error ~1e-15 for x > 0).
const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059,
  12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
];

/** ln Γ(x) for x > 0. */
export function lnGamma(x: number): number {
  if (x < 0.5) return Math.log(Math.PI / Math.abs(Math.sin(Math.PI * x))) - lnGamma(1 - x); // reflection
  const z = x - 1;
  let a = LANCZOS[0]!;
  const t = z + 7.5;
  for (let i = 1; i < 9; i++) a += LANCZOS[i]! / (z + i);
  return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(t) - t + Math.log(a);
}

/** Regularised lower incomplete gamma P(a, x): series for x < a + 1, continued fraction otherwise. */
export function gammaP(a: number, x: number): number {
  if (x <= 0) return 0;
  const lnPre = a * Math.log(x) - x - lnGamma(a);
  if (x < a + 1) {
    let term = 1 / a;
    let sum = term;
    for (let k = 1; k < 1000; k++) {
      term *= x / (a + k);
      sum += term;
      if (Math.abs(term) < Math.abs(sum) * 1e-16) break;
    }
    return Math.min(1, sum * Math.exp(lnPre));
  }
  return 1 - gammaQFraction(a, x, lnPre);
}

// Upper tail Q(a, x) by the modified Lentz continued fraction.
function gammaQFraction(a: number, x: number, lnPre: number): number {
  const tiny = 1e-300;
  let b = x + 1 - a;
  let c = 1 / tiny;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < 1000; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < tiny) d = tiny;
    c = b + an / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < 1e-16) break;
  }
  return Math.exp(lnPre) * h;
}

export function chiSquareCdf(x: number, df: number): number {
  return gammaP(df / 2, x / 2);
}

/** Lower-q quantile of chi-square with df degrees of freedom (0 < q < 1). */
export function chiSquareQuantile(q: number, df: number): number {
  if (!(q > 0 && q < 1) || !(df > 0)) return NaN;
  // Wilson–Hilferty start, then safeguarded Newton on the cdf.
  const z = normalQuantileApprox(q);
  const v = 2 / (9 * df);
  let x = Math.max(1e-8, df * Math.pow(1 - v + z * Math.sqrt(v), 3));
  let lo = 0;
  let hi = Infinity;
  for (let i = 0; i < 100; i++) {
    const f = chiSquareCdf(x, df) - q;
    if (f > 0) hi = x;
    else lo = x;
    const logPdf = (df / 2 - 1) * Math.log(x) - x / 2 - (df / 2) * Math.LN2 - lnGamma(df / 2);
    let next = x - f / Math.exp(logPdf);
    if (!(next > lo && next < hi)) next = Number.isFinite(hi) ? (lo + hi) / 2 : x * 2;
    if (Math.abs(next - x) <= 1e-14 * x) return next;
    x = next;
  }
  return x;
}

// A rough normal quantile is enough for a starting value (refined above).
function normalQuantileApprox(p: number): number {
  const t = Math.sqrt(-2 * Math.log(p < 0.5 ? p : 1 - p));
  const z = t - (2.515517 + 0.802853 * t + 0.010328 * t * t) / (1 + 1.432788 * t + 0.189269 * t * t + 0.001308 * t * t * t);
  return p < 0.5 ? -z : z;
}

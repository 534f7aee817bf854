/**
 * Anderson–Darling test of normality with mean and sigma estimated from the data.
 * A² = −n − (1/n)·Σ(2i−1)[ln Φ(zᵢ) + ln(1 − Φ(z₍ₙ₊₁₋ᵢ₎))], adjusted A*² = A²(1 + 0.75/n + 2.25/n²),
 * p-value from D'Agostino & Stephens, Goodness-of-Fit Techniques (1986), Table 4.9 formulas.
 */
import { normalCdf } from './normal';

export interface AndersonDarling {
  readonly a2: number;
  readonly a2Adjusted: number;
  readonly pValue: number;
}

/** Needs at least 8 values with some spread; otherwise null. */
export function andersonDarling(values: readonly number[]): AndersonDarling | null {
  const n = values.length;
  if (n < 8) return null;
  let mean = 0;
  for (const v of values) mean += v;
  mean /= n;
  let ss = 0;
  for (const v of values) ss += (v - mean) * (v - mean);
  const sd = Math.sqrt(ss / (n - 1));
  if (!(sd > 0)) return null;
  const z = values.map((v) => (v - mean) / sd).sort((a, b) => a - b);
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const lower = Math.max(normalCdf(z[i]!), 1e-300); // ln Φ(zᵢ)
    const upper = Math.max(normalCdf(-z[n - 1 - i]!), 1e-300); // ln(1 − Φ(z₍ₙ₊₁₋ᵢ₎)) without cancellation
    sum += (2 * i + 1) * (Math.log(lower) + Math.log(upper));
  }
  const a2 = -n - sum / n;
  const a = a2 * (1 + 0.75 / n + 2.25 / (n * n));
  let p: number;
  if (a >= 0.6) p = Math.exp(1.2937 - 5.709 * a + 0.0186 * a * a);
  else if (a >= 0.34) p = Math.exp(0.9177 - 4.279 * a - 1.38 * a * a);
  else if (a >= 0.2) p = 1 - Math.exp(-8.318 + 42.796 * a - 59.938 * a * a);
  else p = 1 - Math.exp(-13.436 + 101.14 * a - 223.73 * a * a);
  return { a2, a2Adjusted: a, pValue: Math.min(1, Math.max(0, p)) };
}

/** Capability indices, their confidence intervals and expected nonconforming ppm (normal model). */
import { chiSquareQuantile } from './gamma';
import { normalCdf, normalQuantile } from './normal';
import type { ConfidenceInterval } from './types';

export interface Indices {
  /** (USL − LSL)/6σ; null with a one-sided specification. */
  readonly potential: number | null;
  /** (USL − μ)/3σ */
  readonly upper: number | null;
  /** (μ − LSL)/3σ */
  readonly lower: number | null;
  /** min of the available sides. */
  readonly actual: number | null;
}

export function capabilityIndices(mean: number, sigma: number | null, lsl: number | undefined, usl: number | undefined): Indices {
  if (sigma === null || !(sigma > 0)) return { potential: null, upper: null, lower: null, actual: null };
  const upper = usl === undefined ? null : (usl - mean) / (3 * sigma);
  const lower = lsl === undefined ? null : (mean - lsl) / (3 * sigma);
  const potential = usl !== undefined && lsl !== undefined ? (usl - lsl) / (6 * sigma) : null;
  const actual = upper === null ? lower : lower === null ? upper : Math.min(upper, lower);
  return { potential, upper, lower, actual };
}

/** Cpm = (USL − LSL)/(6√(σ² + (μ − T)²)). */
export function cpm(mean: number, sigma: number | null, lsl: number, usl: number, target: number): number | null {
  if (sigma === null || !(sigma >= 0)) return null;
  const d = Math.sqrt(sigma * sigma + (mean - target) * (mean - target));
  return d > 0 ? (usl - lsl) / (6 * d) : null;
}

/** Chi-square interval for Cp or Pp: Ĉ·√(χ²_{α/2,n−1}/(n−1)) to Ĉ·√(χ²_{1−α/2,n−1}/(n−1)). */
export function chiSquareInterval(estimate: number, n: number, confidence: number): ConfidenceInterval | null {
  if (n < 2) return null;
  const a = 1 - confidence;
  const df = n - 1;
  return { lower: estimate * Math.sqrt(chiSquareQuantile(a / 2, df) / df), upper: estimate * Math.sqrt(chiSquareQuantile(1 - a / 2, df) / df) };
}

/** Bissell (1990): Ĉpk ± z_{α/2}·√(1/(9n) + Ĉpk²/(2(n−1))). */
export function bissellInterval(estimate: number, n: number, confidence: number): ConfidenceInterval | null {
  if (n < 2) return null;
  const z = normalQuantile(1 - (1 - confidence) / 2);
  const half = z * Math.sqrt(1 / (9 * n) + (estimate * estimate) / (2 * (n - 1)));
  return { lower: estimate - half, upper: estimate + half };
}

/** Expected parts per million outside each specification limit for N(mean, sigma²). */
export function expectedPpm(mean: number, sigma: number | null, lsl: number | undefined, usl: number | undefined): { below: number; above: number; total: number } | null {
  if (sigma === null || !(sigma > 0)) return null;
  const below = lsl === undefined ? 0 : normalCdf((lsl - mean) / sigma) * 1e6;
  const above = usl === undefined ? 0 : normalCdf((mean - usl) / sigma) * 1e6; // 1 − Φ((USL−μ)/σ) without cancellation
  return { below, above, total: below + above };
}

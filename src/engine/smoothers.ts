/**
 * EWMA and tabular CUSUM: statistics that carry state from point to point. Each writes two
 * columns per point (EWMA: z and its sigma; CUSUM: the upper and lower sums) and pushes its signals.
 */
import { grow } from './columns';
import type { LimitValues } from './limits';
import type { Signal } from './types';

export class SmoothedColumns {
  a: Float64Array = new Float64Array(0);
  b: Float64Array = new Float64Array(0);

  reserve(n: number): void {
    this.a = grow(this.a, n);
    this.b = grow(this.b, n);
  }

  copy(length: number): SmoothedColumns {
    const c = new SmoothedColumns();
    c.a = this.a.slice(0, length);
    c.b = this.b.slice(0, length);
    return c;
  }
}

export interface Smoother {
  /** Start of a phase: z₀ = μ0, sums at 0. */
  reset(centre: number): void;
  /** Point i with observed mean x; `lim` holds centre μ0 and sigma of the mean σ/√n. */
  step(i: number, x: number, lim: LimitValues, cols: SmoothedColumns, out: Signal[]): void;
}

export class EwmaSmoother implements Smoother {
  private z = 0;
  private t = 0;

  constructor(
    private readonly lambda: number,
    private readonly L: number,
    private readonly asymptotic: boolean,
  ) {}

  reset(centre: number): void {
    this.z = centre;
    this.t = 0;
  }

  step(i: number, x: number, lim: LimitValues, cols: SmoothedColumns, out: Signal[]): void {
    const lambda = this.lambda;
    const z = lambda * x + (1 - lambda) * this.z; // zᵢ = λxᵢ + (1−λ)zᵢ₋₁, z₀ = μ0
    this.z = z;
    this.t++;
    // Var(zᵢ) = σ²·λ/(2−λ)·[1 − (1−λ)^{2i}]; the asymptotic form drops the bracket.
    const steady = lambda / (2 - lambda);
    const sigma = lim.sigma * Math.sqrt(this.asymptotic ? steady : steady * (1 - Math.pow(1 - lambda, 2 * this.t)));
    cols.a[i] = z;
    cols.b[i] = sigma;
    const ucl = lim.centre + this.L * sigma;
    const lcl = lim.centre - this.L * sigma;
    if (z > ucl || z < lcl) {
      const side = z > ucl ? 'above' : 'below';
      out.push({ rule: 'ewma', index: i, points: [i], side, explanation: `EWMA ${side} its ${side === 'above' ? 'upper' : 'lower'} control limit` });
    }
  }
}

export class CusumSmoother implements Smoother {
  private upper = 0;
  private lower = 0;
  private upperRun = 0;
  private lowerRun = 0;

  constructor(
    private readonly k: number,
    private readonly h: number,
  ) {}

  reset(): void {
    this.upper = this.lower = this.upperRun = this.lowerRun = 0;
  }

  step(i: number, x: number, lim: LimitValues, cols: SmoothedColumns, out: Signal[]): void {
    const mu = lim.centre;
    const K = this.k * lim.sigma;
    const H = this.h * lim.sigma;
    this.upper = Math.max(0, x - (mu + K) + this.upper); // C⁺ᵢ = max(0, xᵢ − (μ0+K) + C⁺ᵢ₋₁)
    this.lower = Math.max(0, mu - K - x + this.lower); // C⁻ᵢ = max(0, (μ0−K) − xᵢ + C⁻ᵢ₋₁)
    this.upperRun = this.upper > 0 ? this.upperRun + 1 : 0; // N⁺: periods since C⁺ was last 0
    this.lowerRun = this.lower > 0 ? this.lowerRun + 1 : 0;
    cols.a[i] = this.upper;
    cols.b[i] = this.lower;
    if (this.upper > H) {
      const start = i - this.upperRun + 1;
      const estimate = mu + K + this.upper / this.upperRun; // μ0 + K + C⁺/N⁺
      out.push({ rule: 'cusum', index: i, points: [i], side: 'above', shiftStart: start, shiftEstimate: estimate, explanation: `Upper CUSUM beyond its decision limit: the mean appears to have risen to about ${round(estimate)} since point ${start + 1}` });
    }
    if (this.lower > H) {
      const start = i - this.lowerRun + 1;
      const estimate = mu - K - this.lower / this.lowerRun; // μ0 − K − C⁻/N⁻
      out.push({ rule: 'cusum', index: i, points: [i], side: 'below', shiftStart: start, shiftEstimate: estimate, explanation: `Lower CUSUM beyond its decision limit: the mean appears to have fallen to about ${round(estimate)} since point ${start + 1}` });
    }
  }
}

// Shown in explanations only: 4 significant digits are what a person reads.
function round(x: number): string {
  return String(Number(x.toPrecision(4)));
}

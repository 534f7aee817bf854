/**
 * Control-chart constants computed from their definitions (no hard-coded table):
 * d2(n) = E[W] and d3(n) = SD[W] for W the range of n independent N(0,1) values,
 * c4(n) = √(2/(n−1))·Γ(n/2)/Γ((n−1)/2), and the factors derived from them.
 */
import { lnGamma } from './gamma';
import { normalCdf, normalPdf } from './normal';

export interface ChartConstants {
  readonly n: number;
  readonly d2: number;
  readonly d3: number;
  readonly c4: number;
  /** 3/(d2√n) */
  readonly A2: number;
  /** 3/(c4√n) */
  readonly A3: number;
  readonly B3: number;
  readonly B4: number;
  readonly D3: number;
  readonly D4: number;
  /** 3/d2 */
  readonly E2: number;
}

/** Median of |X1 − X2| for N(0,1): √2·Φ⁻¹(0.75). σ̂ = median MR / this. */
export const MEDIAN_MR_FACTOR = Math.SQRT2 * 0.6744897501960817;

// Grid for the range integrals: Simpson with step H over [−X_MAX, X_MAX]; the integrands
// are below 1e-17 outside it.
const H = 0.0125;
const X_MAX = 9;
const STEPS = Math.round((2 * X_MAX) / H);
let phiGrid: Float64Array | undefined;
let pdfGrid: Float64Array | undefined;

function grids(): { phi: Float64Array; pdf: Float64Array } {
  if (!phiGrid || !pdfGrid) {
    phiGrid = new Float64Array(STEPS + 1);
    pdfGrid = new Float64Array(STEPS + 1);
    for (let i = 0; i <= STEPS; i++) {
      const x = -X_MAX + i * H;
      phiGrid[i] = normalCdf(x);
      pdfGrid[i] = normalPdf(x);
    }
  }
  return { phi: phiGrid, pdf: pdfGrid };
}

const simpsonWeight = (i: number, last: number): number => (i === 0 || i === last ? 1 : i % 2 === 1 ? 4 : 2);

/** d2(n) = ∫ (1 − Φ(x)ⁿ − (1 − Φ(x))ⁿ) dx. */
function rangeMean(n: number): number {
  const { phi } = grids();
  let sum = 0;
  for (let i = 0; i <= STEPS; i++) {
    const p = phi[i]!;
    sum += simpsonWeight(i, STEPS) * (1 - Math.pow(p, n) - Math.pow(1 - p, n));
  }
  return (sum * H) / 3;
}

/** E[W²] = ∫₀^∞ 2w(1 − F_W(w)) dw with F_W(w) = n∫φ(x)[Φ(x+w) − Φ(x)]ⁿ⁻¹ dx, w on the same grid. */
function rangeSecondMoment(n: number): number {
  const { phi, pdf } = grids();
  const wSteps = Math.round(14 / H); // P(W > 14) is negligible for n ≤ 25 (and for n = 2)
  let outer = 0;
  for (let j = 0; j <= wSteps; j++) {
    const w = j * H;
    let inner = 0;
    for (let i = 0; i <= STEPS; i++) {
      const upper = i + j <= STEPS ? phi[i + j]! : 1;
      inner += simpsonWeight(i, STEPS) * pdf[i]! * Math.pow(upper - phi[i]!, n - 1);
    }
    const survival = 1 - (n * inner * H) / 3;
    outer += simpsonWeight(j, wSteps) * 2 * w * survival;
    if (survival < 1e-17 && j % 2 === 0) break; // the rest of the tail adds nothing at double precision
  }
  return (outer * H) / 3;
}

/** d2(n) and d3(n) by numerical integration of the range distribution (the definitions). */
export function rangeMoments(n: number): { d2: number; d3: number } {
  const d2 = rangeMean(n);
  return { d2, d3: Math.sqrt(rangeSecondMoment(n) - d2 * d2) };
}

export function c4(n: number): number {
  return Math.sqrt(2 / (n - 1)) * Math.exp(lnGamma(n / 2) - lnGamma((n - 1) / 2));
}

const cache = new Map<number, ChartConstants>();

/** Constants for subgroup size n ≥ 2 (memoised; the first call for an n costs a few ms). */
export function chartConstants(n: number): ChartConstants {
  if (!Number.isInteger(n) || n < 2) throw new RangeError(`chart constants need an integer subgroup size of at least 2, got ${n}`);
  const hit = cache.get(n);
  if (hit) return hit;
  // n = 2 has closed forms (W = |X1 − X2| is half-normal with scale √2): no integration on the
  // XmR path, which every individuals chart needs at once. rangeMoments(2) checks them in the tests.
  const { d2, d3 } = n === 2 ? { d2: 2 / Math.sqrt(Math.PI), d3: Math.sqrt(2 - 4 / Math.PI) } : rangeMoments(n);
  const c = c4(n);
  const sq = Math.sqrt(1 - c * c);
  const k: ChartConstants = {
    n, d2, d3, c4: c,
    A2: 3 / (d2 * Math.sqrt(n)),
    A3: 3 / (c * Math.sqrt(n)),
    B3: Math.max(0, 1 - (3 * sq) / c),
    B4: 1 + (3 * sq) / c,
    D3: Math.max(0, 1 - (3 * d3) / d2),
    D4: 1 + (3 * d3) / d2,
    E2: 3 / d2,
  };
  cache.set(n, k);
  return k;
}

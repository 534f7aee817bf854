/** Limits of one point from the phase parameters and the subgroup size (3-sigma Shewhart limits). */
import { c4, chartConstants } from './constants';
import type { PhaseParams } from './estimate';
import type { ChartKind } from './types';

/** Scratch record filled by `computeLimits` (reused to avoid an allocation per point). */
export interface LimitValues {
  centre: number;
  sigma: number;
  ucl: number;
  lcl: number;
  /** Companion chart (MR, R or s); NaN where there is none. */
  cCentre: number;
  cUcl: number;
  cLcl: number;
}

export const emptyLimits = (): LimitValues => ({ centre: NaN, sigma: NaN, ucl: NaN, lcl: NaN, cCentre: NaN, cUcl: NaN, cLcl: NaN });

export function computeLimits(kind: ChartKind, p: PhaseParams, n: number, out: LimitValues): void {
  const c = p.centre;
  out.cCentre = out.cUcl = out.cLcl = NaN;
  switch (kind) {
    case 'xmr': {
      const k = chartConstants(2);
      setShewhart(out, c, p.sigma, -Infinity, Infinity);
      out.cCentre = p.mrCentreFactor * p.sigma; // MR̄ (or median MR)
      out.cUcl = (k.d2 + 3 * k.d3) * p.sigma; // D4·MR̄ (or 3.86413·median MR)
      out.cLcl = 0;
      return;
    }
    case 'xbar-r': {
      setShewhart(out, c, p.sigma / Math.sqrt(n), -Infinity, Infinity);
      if (n >= 2) {
        const k = chartConstants(n);
        out.cCentre = k.d2 * p.sigma; // R̄
        out.cUcl = (k.d2 + 3 * k.d3) * p.sigma; // D4·R̄ = D2·σ
        out.cLcl = Math.max(0, k.d2 - 3 * k.d3) * p.sigma; // D3·R̄ = D1·σ
      }
      return;
    }
    case 'xbar-s': {
      // Pooled s̄ with varying nᵢ (Montgomery §6.3): X̿ ± A3(nᵢ)·s̄, S limits B3(nᵢ)·s̄ and B4(nᵢ)·s̄,
      // i.e. sigma taken as s̄/c4(nᵢ) at each point. Otherwise the phase's sigma throughout.
      const sigma = p.method === 'pooled' && n >= 2 ? p.pooledS / c4(n) : p.sigma;
      setShewhart(out, c, sigma / Math.sqrt(n), -Infinity, Infinity);
      if (n >= 2) {
        const k = c4(n);
        const w = 3 * Math.sqrt(1 - k * k);
        out.cCentre = k * sigma; // s̄ = c4·σ
        out.cUcl = (k + w) * sigma; // B4·s̄ = B6·σ
        out.cLcl = Math.max(0, k - w) * sigma; // B3·s̄ = B5·σ
      }
      return;
    }
    case 'p':
      setShewhart(out, c, Math.sqrt((c * (1 - c)) / n), 0, 1);
      return;
    case 'np':
      setShewhart(out, n * c, Math.sqrt(n * c * (1 - c)), 0, n);
      return;
    case 'c':
      setShewhart(out, c, Math.sqrt(c), 0, Infinity);
      return;
    case 'u':
      setShewhart(out, c, Math.sqrt(c / n), 0, Infinity);
      return;
    case 'ewma':
    case 'cusum':
      setShewhart(out, c, p.sigma / Math.sqrt(n), -Infinity, Infinity);
      return;
  }
}

// centre ± 3·sigma, clipped to the range the statistic can take (LCL truncated at zero, common practice).
function setShewhart(out: LimitValues, centre: number, sigma: number, floor: number, ceiling: number): void {
  out.centre = centre;
  out.sigma = sigma;
  out.ucl = Math.min(ceiling, centre + 3 * sigma);
  out.lcl = Math.max(floor, centre - 3 * sigma);
}

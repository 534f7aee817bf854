/**
 * The Analysis object. Per-point limits follow from the phase parameters and the subgroup size,
 * so they are not stored per point: ChartPoint objects are built on the first read of `points`
 * (an enumerable getter, so JSON.stringify and structured clone see an ordinary array).
 * Building 100,000 objects costs far more than the analysis itself.
 */
import type { PhaseParams } from './estimate';
import { computeLimits, emptyLimits, type LimitValues } from './limits';
import type { SmoothedColumns } from './smoothers';
import type { SubgroupStats } from './subgroup-stats';
import type { Analysis, Capability, ChartKind, ChartPoint, PhaseResult, Signal } from './types';

export interface ResultParts {
  readonly chart: ChartKind;
  readonly length: number;
  readonly stats: SubgroupStats;
  readonly phases: readonly PhaseResult[];
  /** Parameters per phase (same order as `phases`); null where limits could not be computed. */
  readonly params: readonly (PhaseParams | null)[];
  readonly smoothed: SmoothedColumns | null;
  readonly ewmaL: number;
  readonly cusumH: number;
  readonly signals: readonly Signal[];
  readonly warnings: readonly string[];
  readonly capability?: Capability;
}

export function makeAnalysis(parts: ResultParts): Analysis {
  let points: ChartPoint[] | undefined;
  const result = { chart: parts.chart } as { -readonly [K in keyof Analysis]: Analysis[K] };
  Object.defineProperty(result, 'points', {
    enumerable: true,
    get: () => (points ??= toPoints(parts)),
  });
  result.phases = parts.phases;
  result.signals = parts.signals;
  result.warnings = parts.warnings;
  if (parts.capability) result.capability = parts.capability;
  return result;
}

const fin = (x: number | undefined): number | null => (x !== undefined && Number.isFinite(x) ? x : null);

function toPoints(r: ResultParts): ChartPoint[] {
  const { chart: kind, stats, length } = r;
  const out = new Array<ChartPoint>(length);
  const companion = kind === 'xmr' || kind === 'xbar-r' || kind === 'xbar-s';
  const hasReasons = stats.reason.size > 0;
  const lim = emptyLimits();
  r.phases.forEach((ph, p) => {
    const params = r.params[p] ?? null;
    let size = NaN;
    for (let i = ph.start; i < Math.min(ph.end, length); i++) {
      let point: ChartPoint;
      if (!params) {
        point = nullPoint(r, i, p, companion);
      } else {
        if (stats.size[i] !== size) {
          size = stats.size[i]!;
          computeLimits(kind, params, size, lim);
        }
        point = pointWithLimits(r, i, p, lim, companion);
      }
      const reason = hasReasons ? stats.reason.get(i) : undefined;
      out[i] = reason === undefined ? point : { ...point, exclusionReason: reason };
    }
  });
  return out;
}

function nullPoint(r: ResultParts, i: number, phase: number, companion: boolean): ChartPoint {
  const s = r.stats;
  const excluded = s.excluded[i] === 1;
  const value = s.value[i]!;
  return companion
    ? { index: i, value, phase, excluded, centre: null, ucl: null, lcl: null, sigma: null, companion: { value: fin(s.spread[i]), centre: null, ucl: null, lcl: null } }
    : { index: i, value, phase, excluded, centre: null, ucl: null, lcl: null, sigma: null };
}

function pointWithLimits(r: ResultParts, i: number, phase: number, lim: LimitValues, companion: boolean): ChartPoint {
  const s = r.stats;
  const excluded = s.excluded[i] === 1;
  const observed = s.value[i]!;
  if (r.chart === 'ewma') {
    const z = r.smoothed!.a[i]!;
    const sigma = r.smoothed!.b[i]!;
    return { index: i, value: z, phase, excluded, centre: lim.centre, ucl: lim.centre + r.ewmaL * sigma, lcl: lim.centre - r.ewmaL * sigma, sigma, observed };
  }
  if (r.chart === 'cusum') {
    return { index: i, value: observed, phase, excluded, centre: lim.centre, ucl: null, lcl: null, sigma: lim.sigma, cusum: { upper: r.smoothed!.a[i]!, lower: r.smoothed!.b[i]!, limit: r.cusumH * lim.sigma } };
  }
  if (!companion) return { index: i, value: observed, phase, excluded, centre: lim.centre, ucl: lim.ucl, lcl: lim.lcl, sigma: lim.sigma };
  return {
    index: i, value: observed, phase, excluded, centre: lim.centre, ucl: lim.ucl, lcl: lim.lcl, sigma: lim.sigma,
    companion: { value: fin(s.spread[i]), centre: fin(lim.cCentre), ucl: fin(lim.cUcl), lcl: fin(lim.cLcl) },
  };
}

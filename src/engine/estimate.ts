/**
 * Phase parameters from a baseline range of subgroup statistics: the centre line and the sigma
 * of individual values (variable charts) or the average rate (attribute charts).
 * Excluded subgroups are left out; a moving range is used only when both of its points are in.
 */
import { c4, chartConstants, MEDIAN_MR_FACTOR } from './constants';
import type { SubgroupStats } from './subgroup-stats';
import type { ChartKind, SigmaMethod } from './types';

export interface PhaseParams {
  /** Centre line: mean of individuals / grand mean / p̄ / c̄ / ū. */
  readonly centre: number;
  /** Process sigma of individual values; NaN for attribute charts. */
  readonly sigma: number;
  readonly method: SigmaMethod | 'given' | 'binomial' | 'poisson';
  /** Centre of the moving-range chart relative to sigma: d2(2) (mean MR) or 0.953873 (median MR). */
  readonly mrCentreFactor: number;
  /** Pooled s̄ = √[Σ(nᵢ−1)sᵢ²/Σ(nᵢ−1)] when method is 'pooled' (X̄-S limits use it per point), else NaN. */
  readonly pooledS: number;
}

export interface Estimate {
  readonly params: PhaseParams | null;
  readonly used: number;
  readonly warnings: string[];
}

export const isAttributeChart = (kind: ChartKind): boolean => kind === 'p' || kind === 'np' || kind === 'c' || kind === 'u';

/** Default sigma method for a chart and its baseline sizes. */
export function defaultSigmaMethod(kind: ChartKind, sizesVary: boolean, allSingle: boolean): SigmaMethod {
  if (kind === 'xmr' || ((kind === 'ewma' || kind === 'cusum') && allSingle)) return 'mr-mean';
  if (kind === 'xbar-s') return sizesVary ? 'pooled' : 's-bar';
  return 'r-bar';
}

export function estimatePhase(kind: ChartKind, stats: SubgroupStats, from: number, to: number, requested: SigmaMethod | undefined): Estimate {
  const warnings: string[] = [];
  const ex = stats.excluded;
  if (isAttributeChart(kind)) {
    let sumCount = 0;
    let sumSize = 0;
    let used = 0;
    for (let i = from; i < to; i++) {
      if (ex[i]) continue;
      sumCount += stats.count[i]!;
      sumSize += stats.size[i]!;
      used++;
    }
    if (used === 0) return { params: null, used, warnings: ['No subgroups in the baseline: limits cannot be computed.'] };
    const centre = sumCount / sumSize; // p̄ = ΣD/Σn, ū = Σc/Σa, c̄ = Σc/k
    if (centre === 0) warnings.push('No defects or defectives in the baseline: the centre line is 0 and limits cannot be computed.');
    if ((kind === 'p' || kind === 'np') && centre === 1) warnings.push('Every item in the baseline is defective: limits cannot be computed.');
    const ok = centre > 0 && !((kind === 'p' || kind === 'np') && centre >= 1);
    const method = kind === 'p' || kind === 'np' ? 'binomial' : 'poisson';
    return { params: ok ? { centre, sigma: NaN, method, mrCentreFactor: NaN, pooledS: NaN } : null, used, warnings };
  }

  // Variable charts. One value per subgroup and nothing excluded (individuals): one loop for
  // the mean and the mean moving range, summed in the same order as below.
  if (stats.singleIncluded && to > from) {
    const method = requested ?? defaultSigmaMethod(kind, false, true);
    if (method === 'mr-mean') {
      let sum = 0;
      let mrSum = 0;
      let k = 0;
      const batch = stats.batchSums(from, to);
      if (batch) {
        // summed while the values were added, in this order
        sum = batch.sum;
        mrSum = batch.mrSum;
        k = batch.mrCount;
      } else {
        const v = stats.value;
        const sp = stats.spread;
        sum = 0 + v[from]!; // 0 + x as the general loop below has it (−0 becomes 0)
        for (let i = from + 1; i < to; i++) {
          sum += v[i]!;
          const m = sp[i]!;
          if (m === m) {
            // not NaN (a phase start has no moving range)
            mrSum += m;
            k++;
          }
        }
      }
      const used = to - from;
      if (k === 0) return { params: null, used, warnings: ['At least 2 consecutive values are needed for a moving range: limits cannot be computed yet.'] };
      const sigma = mrSum / k / chartConstants(2).d2; // MR̄/d2(2)
      if (!(sigma > 0)) return { params: null, used, warnings: ['All baseline values are equal (no variation): sigma is 0 and limits cannot be computed.'] };
      return { params: { centre: sum / used, sigma, method, mrCentreFactor: chartConstants(2).d2, pooledS: NaN }, used, warnings };
    }
  }

  let used = 0;
  let sumN = 0;
  let sumNX = 0;
  let allSingle = true;
  let firstSize = -1;
  let sizesVary = false;
  for (let i = from; i < to; i++) {
    if (ex[i]) continue;
    const n = stats.size[i]!;
    used++;
    sumN += n;
    sumNX += n * stats.value[i]!;
    if (n !== 1) allSingle = false;
    if (firstSize < 0) firstSize = n;
    else if (n !== firstSize) sizesVary = true;
  }
  if (used === 0) return { params: null, used, warnings: ['No subgroups in the baseline: limits cannot be computed.'] };
  const centre = sumNX / sumN; // grand mean weighted by subgroup size (Montgomery, variable n)
  const method = requested ?? defaultSigmaMethod(kind, sizesVary, allSingle);
  const sigma = estimateSigma(method, stats, from, to, warnings, allSingle);
  if (sigma === null) return { params: null, used, warnings };
  const mrCentreFactor = method === 'mr-median' ? MEDIAN_MR_FACTOR : chartConstants(2).d2;
  const pooledS = method === 'pooled' ? pooledSd(stats, from, to) : NaN;
  return { params: { centre, sigma, method, mrCentreFactor, pooledS }, used, warnings };
}

function estimateSigma(method: SigmaMethod, stats: SubgroupStats, from: number, to: number, warnings: string[], allSingle: boolean): number | null {
  const ex = stats.excluded;
  const sp = stats.spread;
  const sz = stats.size;
  let sigma: number;
  if (method === 'mr-mean' || method === 'mr-median') {
    if (!allSingle) {
      warnings.push('The moving-range estimate needs one value per subgroup.');
      return null;
    }
    // A moving range counts only when both of its points are included.
    const mrs: number[] = [];
    let sum = 0;
    let k = 0;
    for (let i = from + 1; i < to; i++) {
      const m = sp[i]!;
      if (ex[i] || ex[i - 1] || m !== m) continue; // m !== m: NaN, no moving range
      sum += m;
      k++;
      if (method === 'mr-median') mrs.push(m);
    }
    if (k === 0) {
      warnings.push('At least 2 consecutive values are needed for a moving range: limits cannot be computed yet.');
      return null;
    }
    sigma = method === 'mr-mean' ? sum / k / chartConstants(2).d2 : median(mrs) / MEDIAN_MR_FACTOR; // MR̄/d2(2) or median MR/0.953873
  } else {
    let k = 0;
    let acc = 0;
    let dof = 0;
    for (let i = from; i < to; i++) {
      const n = sz[i]!;
      if (ex[i] || n < 2 || !Number.isFinite(sp[i]!)) continue;
      const s = sp[i]!;
      if (method === 'r-bar') acc += s / chartConstants(n).d2; // Rᵢ/d2(nᵢ)
      else if (method === 's-bar') acc += s / c4(n); // sᵢ/c4(nᵢ)
      else {
        acc += (n - 1) * s * s; // Σ(nᵢ−1)sᵢ²
        dof += n - 1;
      }
      k++;
    }
    if (k === 0) {
      warnings.push('Subgroups of at least 2 values are needed to estimate sigma from ranges or standard deviations: limits cannot be computed.');
      return null;
    }
    if (method === 'pooled') {
      sigma = Math.sqrt(acc / dof) / c4(dof + 1); // s̄ₚ/c4(Σ(nᵢ−1)+1)
    } else {
      sigma = acc / k;
    }
  }
  if (!(sigma > 0)) {
    warnings.push('All baseline values are equal (no variation): sigma is 0 and limits cannot be computed.');
    return null;
  }
  return sigma;
}

/** √[Σ(nᵢ−1)sᵢ²/Σ(nᵢ−1)] over the included subgroups of size ≥ 2 (s from the spread column). */
function pooledSd(stats: SubgroupStats, from: number, to: number): number {
  let acc = 0;
  let dof = 0;
  for (let i = from; i < to; i++) {
    const n = stats.size[i]!;
    const s = stats.spread[i]!;
    if (stats.excluded[i] || n < 2 || !Number.isFinite(s)) continue;
    acc += (n - 1) * s * s;
    dof += n - 1;
  }
  return Math.sqrt(acc / dof);
}

export function median(xs: number[]): number {
  const s = xs.slice().sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 === 1 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
}

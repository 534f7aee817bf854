/**
 * The engine's contract: a JSON-serialisable description in, a JSON-serialisable result out.
 * The engine is pure: no DOM, storage, clock or randomness; it imports nothing from the rest of src.
 *
 * Numbers in the result are always finite or null, never NaN or ±Infinity: where a quantity
 * cannot be computed (one point, constant data, a missing subgroup size) it is null and a
 * warning says why.
 */

export type ChartKind = 'xmr' | 'xbar-r' | 'xbar-s' | 'p' | 'np' | 'c' | 'u' | 'ewma' | 'cusum';

/** Zone and run rules (chosen per characteristic). */
export type RuleCode = 'we1' | 'we2' | 'we3' | 'we4' | 'n1' | 'n2' | 'n3' | 'n4' | 'n5' | 'n6' | 'n7' | 'n8';

/** What a signal names: a run rule, or the EWMA / CUSUM chart's own decision (those charts ignore run rules). */
export type SignalRule = RuleCode | 'ewma' | 'cusum';

/**
 * How sigma of individual values is estimated from a baseline.
 * 'mr-mean' MR̄/d2(2) and 'mr-median' median MR/0.953873 (individuals, EWMA/CUSUM with n = 1);
 * 'r-bar' mean of Rᵢ/d2(nᵢ) (= R̄/d2 for equal n); 's-bar' mean of sᵢ/c4(nᵢ) (= s̄/c4);
 * 'pooled' √[Σ(nᵢ−1)sᵢ²/Σ(nᵢ−1)] / c4(Σ(nᵢ−1)+1).
 */
export type SigmaMethod = 'mr-mean' | 'mr-median' | 'r-bar' | 's-bar' | 'pooled';

/** One subgroup. Variable charts read `values`; p/np read `count` of `size` inspected; c reads `count`; u reads `count` over `size` units. */
export interface SubgroupInput {
  readonly values?: readonly number[];
  readonly count?: number;
  readonly size?: number;
  /** Left out of limit calculation (still plotted and still tested against the limits). */
  readonly excluded?: boolean;
  /** Why the subgroup is left out; carried to the point. */
  readonly exclusionReason?: string;
}

/** A phase starts at subgroup index `start` and runs to the next phase's start. */
export interface PhaseInput {
  readonly start: number;
  /** Subgroups used to compute the limits: `baselineCount` of them from `baselineStart`. */
  readonly baselineCount?: number;
  /** First subgroup of the baseline (absolute index within the phase's range); default: `start`. */
  readonly baselineStart?: number;
  /**
   * Given limits instead of a baseline. Variable charts: centre and sigma of individual values
   * (process sigma; required). Attribute charts: centre is p̄, c̄ or ū (np: p̄); sigma is ignored.
   */
  readonly given?: { readonly centre: number; readonly sigma?: number };
  /** The documented change that started the phase (carried to the result). */
  readonly reason?: string;
}

export interface SpecInput {
  readonly lsl?: number;
  readonly usl?: number;
  readonly target?: number;
}

export interface AnalysisInput {
  readonly chart: ChartKind;
  readonly subgroups?: readonly SubgroupInput[];
  /**
   * One value per subgroup, instead of `subgroups` (XmR, and EWMA / CUSUM on individuals):
   * a plain or typed array, read without building an object per value. No exclusions in this form.
   */
  readonly individuals?: ArrayLike<number>;
  /** Default: one phase from 0 using every subgroup as its baseline. */
  readonly phases?: readonly PhaseInput[];
  /** Default: Western Electric 1–4. Ignored by EWMA and CUSUM. */
  readonly rules?: readonly RuleCode[];
  readonly spec?: SpecInput;
  /** Default: 'mr-mean' for n = 1, 'r-bar' for X̄-R, 's-bar' for X̄-S (or 'pooled' when sizes differ). */
  readonly sigmaMethod?: SigmaMethod;
  /** EWMA: λ (0 < λ ≤ 1) and L; `limits` 'exact' (time-varying, default) or 'asymptotic'. */
  readonly ewma?: { readonly lambda: number; readonly L: number; readonly limits?: 'exact' | 'asymptotic' };
  /** CUSUM: k and h in sigma units of the plotted mean. */
  readonly cusum?: { readonly k: number; readonly h: number };
  /** Capability confidence level, default 0.95. */
  readonly confidence?: number;
  /** Phase (index into the phases) studied by the capability analysis; default the last phase with data. */
  readonly capabilityPhase?: number;
}

/** Limits of one plotted point (per point because the sample size may vary). */
export interface PointLimits {
  /** null only when no limits can be computed for the phase (see warnings). */
  readonly centre: number | null;
  readonly ucl: number | null;
  /** Truncated at zero where the statistic cannot be negative. */
  readonly lcl: number | null;
  /** Sigma of the plotted statistic at this point (zone width). */
  readonly sigma: number | null;
}

export interface CompanionPoint {
  /** Moving range, range or s; null where it does not exist (the first point of a phase on an XmR chart, n = 1). */
  readonly value: number | null;
  readonly centre: number | null;
  readonly ucl: number | null;
  readonly lcl: number | null;
}

export interface ChartPoint extends PointLimits {
  readonly index: number;
  /** The plotted statistic: the individual value, the subgroup mean, the proportion, the EWMA; for CUSUM the observed mean. */
  readonly value: number;
  readonly phase: number;
  readonly excluded: boolean;
  readonly exclusionReason?: string;
  /** The companion chart (moving range, range or s); absent for attribute, EWMA and CUSUM charts. */
  readonly companion?: CompanionPoint;
  /** EWMA: the observed value or subgroup mean the EWMA was updated with. */
  readonly observed?: number;
  /** CUSUM: the upper and lower sums (both ≥ 0) and the decision interval H, in data units. */
  readonly cusum?: { readonly upper: number; readonly lower: number; readonly limit: number };
}

export interface PhaseResult {
  readonly index: number;
  readonly start: number;
  /** Exclusive end index. */
  readonly end: number;
  /** Subgroups actually used for the limits (after exclusions). */
  readonly baselineCount: number;
  readonly baselineStart: number;
  /** Fewer baseline subgroups than 20 (common practice: 20–25): limits are provisional. */
  readonly provisional: boolean;
  readonly centre: number | null;
  /** Estimate of the process sigma of individual values used for the limits (null for attribute charts). */
  readonly sigmaWithin: number | null;
  readonly sigmaMethod: SigmaMethod | 'given' | 'binomial' | 'poisson';
  readonly source: 'baseline' | 'given';
  readonly reason?: string;
}

export interface Signal {
  readonly rule: SignalRule;
  /** The point at which the rule fired (the newest point of the pattern). */
  readonly index: number;
  /** Every point that makes up the pattern, oldest first (CUSUM: the signalling point only; see shiftStart). */
  readonly points: readonly number[];
  /** Side of the centre line; for the trend rule (n3) 'above' means increasing, 'below' decreasing; absent for n4, n7, n8. */
  readonly side?: 'above' | 'below';
  /** Plain words: "9 points in a row below the centre line". */
  readonly explanation: string;
  /** Signal on the companion chart (range / moving range / s) rather than the main chart. */
  readonly companion?: boolean;
  /** CUSUM: index where the shift is estimated to have begun. */
  readonly shiftStart?: number;
  /** CUSUM: estimated process mean after the shift (μ0 ± (K + C/N)). */
  readonly shiftEstimate?: number;
}

export interface ConfidenceInterval {
  readonly lower: number;
  readonly upper: number;
}

export interface Capability {
  /** Observations used (individual values of the included subgroups of the studied phase). */
  readonly n: number;
  readonly phase: number;
  readonly mean: number;
  readonly sigmaWithin: number | null;
  readonly sigmaWithinMethod: SigmaMethod;
  /** Sample standard deviation of all observations (n − 1 divisor, no c4 correction). */
  readonly sigmaOverall: number | null;
  /** Indices are null when a spec side or a sigma is missing. */
  readonly cp: number | null;
  readonly cpk: number | null;
  readonly cpu: number | null;
  readonly cpl: number | null;
  readonly pp: number | null;
  readonly ppk: number | null;
  readonly cpm: number | null;
  readonly confidence: number;
  /** Chi-square interval (df = n − 1). */
  readonly cpInterval: ConfidenceInterval | null;
  readonly ppInterval: ConfidenceInterval | null;
  /** Bissell's normal approximation. */
  readonly cpkInterval: ConfidenceInterval | null;
  readonly ppkInterval: ConfidenceInterval | null;
  /** Expected nonconforming parts per million under the normal model. */
  readonly ppmWithin: { readonly below: number; readonly above: number; readonly total: number } | null;
  readonly ppmOverall: { readonly below: number; readonly above: number; readonly total: number } | null;
  /** Anderson–Darling normality test on all observations. */
  readonly normality: { readonly a2: number; readonly a2Adjusted: number; readonly pValue: number } | null;
  /** Plain-language cautions: signals in the period studied, non-normal data, few data. Never empty silently. */
  readonly cautions: readonly string[];
}

export interface Analysis {
  readonly chart: ChartKind;
  /** Built on first read (an enumerable getter: JSON.stringify and structured clone see a plain array). */
  readonly points: readonly ChartPoint[];
  readonly phases: readonly PhaseResult[];
  readonly signals: readonly Signal[];
  /** Problems that stop part of the analysis, in plain words (e.g. "XmR needs at least 2 values"). */
  readonly warnings: readonly string[];
  /** Present when a specification was given and the chart measures values. */
  readonly capability?: Capability;
}

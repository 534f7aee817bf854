/**
 * Incremental chart evaluation. Subgroups are appended at the end; once a phase's baseline is
 * complete its limits are frozen, so each further subgroup costs O(1) (limits of one point,
 * the run rules' fixed-size state). An append that falls inside a baseline recomputes the
 * limits and re-evaluates that phase from its start (cost bounded by the baseline's span).
 */
import { estimatePhase, isAttributeChart, type PhaseParams } from './estimate';
import { emptyLimits, computeLimits } from './limits';
import { planPhases, type PhasePlan } from './phase-plan';
import { explainCompanion } from './rule-text';
import { RuleEvaluator } from './rules';
import { EngineInputError, SubgroupStats } from './subgroup-stats';
import type { Analysis, AnalysisInput, ChartKind, ChartPoint, PhaseResult, RuleCode, Signal } from './types';

export type EvaluatorConfig = Omit<AnalysisInput, 'subgroups'>;

/** Rules used when none are chosen: Western Electric 1–4. */
export const DEFAULT_RULES: readonly RuleCode[] = ['we1', 'we2', 'we3', 'we4'];

/** Baselines with fewer included subgroups give provisional limits (common practice: 20–25). */
export const PROVISIONAL_BELOW = 20;

const CHARTS: readonly ChartKind[] = ['xmr', 'xbar-r', 'xbar-s', 'p', 'np', 'c', 'u', 'ewma', 'cusum'];
const COMPANION_NAME: Partial<Record<ChartKind, string>> = { xmr: 'moving range', 'xbar-r': 'range', 'xbar-s': 'standard deviation' };

interface PhaseState {
  readonly plan: PhasePlan;
  params: PhaseParams | null;
  used: number;
  warnings: string[];
}

export interface AppendResult {
  /** Points from this index on are new or were recomputed; so are signals at or after it. */
  readonly from: number;
}

export class Evaluator {
  readonly kind: ChartKind;
  private readonly config: EvaluatorConfig;
  private readonly plans: PhasePlan[];
  private readonly states: PhaseState[] = [];
  private readonly stats: SubgroupStats;
  private readonly rules: RuleEvaluator;
  private readonly companionRule: RuleCode | null;
  private readonly pts: ChartPoint[] = [];
  private readonly sigs: Signal[] = [];
  private readonly lim = emptyLimits();
  // EWMA / CUSUM running state (reset at each phase start).
  private ewmaZ = 0;
  private steps = 0;
  private upper = 0;
  private lower = 0;
  private upperRun = 0;
  private lowerRun = 0;

  constructor(config: EvaluatorConfig) {
    if (!CHARTS.includes(config.chart)) throw new EngineInputError(`unknown chart type ${String(config.chart)}`);
    this.kind = config.chart;
    this.config = config;
    if (config.chart === 'ewma') {
      const e = config.ewma;
      if (!e || !(e.lambda > 0 && e.lambda <= 1) || !(e.L > 0)) throw new EngineInputError('an EWMA chart needs λ (0 < λ ≤ 1) and L (> 0)');
    }
    if (config.chart === 'cusum') {
      const c = config.cusum;
      if (!c || !(c.k >= 0) || !(c.h > 0)) throw new EngineInputError('a CUSUM chart needs k (≥ 0) and h (> 0) in sigma units');
    }
    this.plans = planPhases(config.phases);
    this.stats = new SubgroupStats(config.chart);
    const rules = config.rules ?? DEFAULT_RULES;
    this.rules = new RuleEvaluator(rules);
    this.companionRule = rules.includes('we1') ? 'we1' : rules.includes('n1') ? 'n1' : null;
  }

  get length(): number {
    return this.stats.length;
  }

  append(subgroup: AnalysisInput['subgroups'][number]): AppendResult {
    return this.appendMany([subgroup]);
  }

  appendMany(subgroups: AnalysisInput['subgroups']): AppendResult {
    const first = this.stats.length;
    const touched = new Set<PhaseState>();
    for (const sg of subgroups) {
      const i = this.stats.length;
      const state = this.phaseFor(i);
      this.stats.push(sg, state.plan.start);
      const plan = state.plan;
      if (!plan.input.given && i >= plan.baselineStart && i < plan.baselineEnd) touched.add(state);
    }
    let from = first;
    for (const state of touched) {
      this.estimate(state);
      if (state.plan.start < from) from = state.plan.start;
    }
    this.evaluateFrom(from);
    return { from };
  }

  /** The current result. Arrays are copies unless `live` (then they change with later appends). */
  analysis(live = false): Analysis {
    const warnings: string[] = [];
    for (const s of this.states) for (const w of s.warnings) warnings.push(this.states.length > 1 ? `Phase ${s.plan.index + 1}: ${w}` : w);
    if (this.stats.length === 0) warnings.push('No subgroups yet.');
    return {
      chart: this.kind,
      points: live ? this.pts : this.pts.slice(),
      phases: this.states.map((s) => this.phaseResult(s)),
      signals: live ? this.sigs : this.sigs.slice(),
      warnings,
    };
  }

  /** Read-only access for capability and tests. */
  get subgroupStats(): SubgroupStats {
    return this.stats;
  }

  private phaseFor(i: number): PhaseState {
    let last = this.states[this.states.length - 1];
    const next = this.plans[this.states.length];
    if (!last || (next && i >= next.start)) {
      if (!next) throw new Error('phase plan exhausted'); // unreachable: the last plan runs to Infinity
      last = { plan: next, params: null, used: 0, warnings: [] };
      this.givenParams(last);
      this.states.push(last);
    }
    return last;
  }

  private givenParams(state: PhaseState): void {
    const g = state.plan.input.given;
    if (!g) return;
    if (isAttributeChart(this.kind)) {
      const ok = g.centre > 0 && ((this.kind !== 'p' && this.kind !== 'np') || g.centre < 1);
      if (ok) state.params = { centre: g.centre, sigma: NaN, method: 'given', mrCentreFactor: NaN, pooledS: NaN };
      else state.warnings = [`The given centre ${g.centre} is not a usable ${this.kind === 'p' || this.kind === 'np' ? 'proportion (0 < p̄ < 1)' : 'rate (> 0)'}: limits cannot be computed.`];
    } else if (g.sigma === undefined) {
      state.warnings = ['Given limits for a measured characteristic need a sigma: limits cannot be computed.'];
    } else {
      state.params = { centre: g.centre, sigma: g.sigma, method: 'given', mrCentreFactor: 1.1283791670955126, pooledS: NaN }; // MR centre d2(2)·σ
    }
  }

  private estimate(state: PhaseState): void {
    const plan = state.plan;
    const to = Math.min(plan.baselineEnd, this.stats.length);
    const e = estimatePhase(this.kind, this.stats, plan.baselineStart, to, this.config.sigmaMethod);
    state.params = e.params;
    state.used = e.used;
    state.warnings = e.warnings;
  }

  private evaluateFrom(from: number): void {
    const pts = this.pts;
    const sigs = this.sigs;
    if (pts.length > from) pts.length = from;
    while (sigs.length > 0 && sigs[sigs.length - 1]!.index >= from) sigs.pop();
    let p = this.states.length - 1;
    while (p > 0 && this.states[p]!.plan.start > from) p--;
    const n = this.stats.length;
    for (let i = from; i < n; i++) {
      let state = this.states[p]!;
      if (p + 1 < this.states.length && i >= this.states[p + 1]!.plan.start) state = this.states[++p]!;
      if (i === state.plan.start) this.resetRunState(state);
      this.evaluatePoint(i, state);
    }
  }

  private resetRunState(state: PhaseState): void {
    this.rules.reset();
    this.ewmaZ = state.params ? state.params.centre : 0;
    this.steps = 0;
    this.upper = this.lower = this.upperRun = this.lowerRun = 0;
  }

  private evaluatePoint(i: number, state: PhaseState): void {
    const s = this.stats;
    const value = s.value[i]!;
    const excluded = s.excluded[i]!;
    const reason = s.reason[i];
    const phase = state.plan.index;
    const params = state.params;
    const kind = this.kind;
    const hasCompanion = kind === 'xmr' || kind === 'xbar-r' || kind === 'xbar-s';
    const spread = s.spread[i]!;
    if (!params) {
      const point: ChartPoint = { index: i, value, phase, excluded, centre: null, ucl: null, lcl: null, sigma: null };
      this.pts.push(finish(point, hasCompanion ? { value: fin(spread), centre: null, ucl: null, lcl: null } : undefined, reason));
      return;
    }
    const lim = this.lim;
    computeLimits(kind, params, s.size[i]!, lim);
    if (kind === 'ewma') return this.ewmaPoint(i, value, phase, excluded, reason);
    if (kind === 'cusum') return this.cusumPoint(i, value, phase, excluded, reason);

    const point: ChartPoint = { index: i, value, phase, excluded, centre: lim.centre, ucl: lim.ucl, lcl: lim.lcl, sigma: lim.sigma };
    this.rules.push(i, value, (value - lim.centre) / lim.sigma, this.sigs);
    if (!hasCompanion) {
      this.pts.push(reason === undefined ? point : { ...point, exclusionReason: reason });
      return;
    }
    const companion = { value: fin(spread), centre: fin(lim.cCentre), ucl: fin(lim.cUcl), lcl: fin(lim.cLcl) };
    this.pts.push(finish(point, companion, reason));
    if (this.companionRule && Number.isFinite(spread) && Number.isFinite(lim.cUcl)) {
      const side = spread > lim.cUcl ? 'above' : lim.cLcl > 0 && spread < lim.cLcl ? 'below' : null;
      if (side) {
        const name = COMPANION_NAME[kind] ?? 'spread';
        this.sigs.push({ rule: this.companionRule, index: i, points: kind === 'xmr' ? [i - 1, i] : [i], side, explanation: explainCompanion(name, side), companion: true });
      }
    }
  }

  private ewmaPoint(i: number, observed: number, phase: number, excluded: boolean, reason: string | undefined): void {
    const { lambda, L, limits } = this.config.ewma!;
    const lim = this.lim;
    const z = lambda * observed + (1 - lambda) * this.ewmaZ; // zᵢ = λxᵢ + (1−λ)zᵢ₋₁, z₀ = μ0
    this.ewmaZ = z;
    this.steps++;
    // Var(zᵢ) = σ²·λ/(2−λ)·[1 − (1−λ)^{2i}]; the asymptotic form drops the bracket.
    const factor = limits === 'asymptotic' ? lambda / (2 - lambda) : (lambda / (2 - lambda)) * (1 - Math.pow(1 - lambda, 2 * this.steps));
    const sigma = lim.sigma * Math.sqrt(factor);
    const ucl = lim.centre + L * sigma;
    const lcl = lim.centre - L * sigma;
    const point: ChartPoint = { index: i, value: z, phase, excluded, centre: lim.centre, ucl, lcl, sigma, observed };
    this.pts.push(reason === undefined ? point : { ...point, exclusionReason: reason });
    if (z > ucl || z < lcl) {
      const side = z > ucl ? 'above' : 'below';
      this.sigs.push({ rule: 'ewma', index: i, points: [i], side, explanation: `EWMA ${side} its ${side === 'above' ? 'upper' : 'lower'} control limit` });
    }
  }

  private cusumPoint(i: number, x: number, phase: number, excluded: boolean, reason: string | undefined): void {
    const { k, h } = this.config.cusum!;
    const lim = this.lim;
    const mu = lim.centre;
    const K = k * lim.sigma;
    const H = h * lim.sigma;
    this.upper = Math.max(0, x - (mu + K) + this.upper); // C⁺ᵢ = max(0, xᵢ − (μ0+K) + C⁺ᵢ₋₁)
    this.lower = Math.max(0, mu - K - x + this.lower); // C⁻ᵢ = max(0, (μ0−K) − xᵢ + C⁻ᵢ₋₁)
    this.upperRun = this.upper > 0 ? this.upperRun + 1 : 0;
    this.lowerRun = this.lower > 0 ? this.lowerRun + 1 : 0;
    const point: ChartPoint = { index: i, value: x, phase, excluded, centre: mu, ucl: null, lcl: null, sigma: lim.sigma, cusum: { upper: this.upper, lower: this.lower, limit: H } };
    this.pts.push(reason === undefined ? point : { ...point, exclusionReason: reason });
    if (this.upper > H) {
      const start = i - this.upperRun + 1;
      const estimate = mu + K + this.upper / this.upperRun; // μ0 + K + C⁺/N⁺
      this.sigs.push({ rule: 'cusum', index: i, points: [i], side: 'above', shiftStart: start, shiftEstimate: estimate, explanation: `Upper CUSUM beyond its decision limit: the mean appears to have risen to about ${round(estimate)} since point ${start + 1}` });
    }
    if (this.lower > H) {
      const start = i - this.lowerRun + 1;
      const estimate = mu - K - this.lower / this.lowerRun; // μ0 − K − C⁻/N⁻
      this.sigs.push({ rule: 'cusum', index: i, points: [i], side: 'below', shiftStart: start, shiftEstimate: estimate, explanation: `Lower CUSUM beyond its decision limit: the mean appears to have fallen to about ${round(estimate)} since point ${start + 1}` });
    }
  }

  private phaseResult(s: PhaseState): PhaseResult {
    const plan = s.plan;
    const given = plan.input.given !== undefined;
    const p = s.params;
    const end = Math.min(plan.end, this.stats.length);
    const base = {
      index: plan.index, start: plan.start, end, baselineCount: given ? 0 : s.used, baselineStart: plan.baselineStart,
      provisional: !given && s.used < PROVISIONAL_BELOW,
      centre: p ? fin(p.centre) : null, sigmaWithin: p ? fin(p.sigma) : null,
      sigmaMethod: p ? p.method : given ? 'given' : isAttributeChart(this.kind) ? (this.kind === 'p' || this.kind === 'np' ? 'binomial' : 'poisson') : 'mr-mean',
      source: given ? 'given' : 'baseline',
    } as const;
    return plan.input.reason === undefined ? base : { ...base, reason: plan.input.reason };
  }
}

function fin(x: number): number | null {
  return Number.isFinite(x) ? x : null;
}

function finish(point: ChartPoint, companion: ChartPoint['companion'], reason: string | undefined): ChartPoint {
  if (companion === undefined && reason === undefined) return point;
  if (reason === undefined) return { ...point, companion };
  return companion === undefined ? { ...point, exclusionReason: reason } : { ...point, companion, exclusionReason: reason };
}

// Shown in explanations only: 4 significant digits are what a person reads.
function round(x: number): string {
  return String(Number(x.toPrecision(4)));
}

/**
 * Incremental chart evaluation. Subgroups are appended at the end; once a phase's baseline is
 * complete its limits are frozen, so each further subgroup costs O(1): the limits of one point
 * (cached while the subgroup size is unchanged) and the run rules' fixed-size state. An append
 * that falls inside a baseline recomputes the limits and re-evaluates that phase from its start
 * (cost bounded by the span of the baseline). Rule state restarts at each phase.
 */
import { defaultSigmaMethod, estimatePhase, isAttributeChart, type PhaseParams } from './estimate';
import { computeLimits, emptyLimits } from './limits';
import { CONTEXT, detectBatch } from './bit-rules';
import { planPhases, type PhasePlan } from './phase-plan';
import { makeAnalysis } from './result';
import { explainCompanion } from './rule-text';
import { RuleEvaluator } from './rules';
import { CusumSmoother, EwmaSmoother, SmoothedColumns, type Smoother } from './smoothers';
import { EngineInputError, SubgroupStats } from './subgroup-stats';
import type { Analysis, AnalysisInput, Capability, ChartKind, PhaseResult, RuleCode, Signal, SubgroupInput } from './types';

export type EvaluatorConfig = Omit<AnalysisInput, 'subgroups' | 'individuals'>;

/** Rules used when none are chosen: Western Electric 1–4. */
export const DEFAULT_RULES: readonly RuleCode[] = ['we1', 'we2', 'we3', 'we4'];

// Runs of points at least this long go to the word-parallel detector.
const BATCH_MIN = 64;

/** Baselines with fewer included subgroups give provisional limits (common practice: 20–25). */
export const PROVISIONAL_BELOW = 20;

const CHARTS: readonly ChartKind[] = ['xmr', 'xbar-r', 'xbar-s', 'p', 'np', 'c', 'u', 'ewma', 'cusum'];
const COMPANION_NAME: Partial<Record<ChartKind, string>> = { xmr: 'moving range', 'xbar-r': 'subgroup range', 'xbar-s': 'subgroup standard deviation' };

interface PhaseState {
  readonly plan: PhasePlan;
  params: PhaseParams | null;
  used: number;
  warnings: string[];
}

export class Evaluator {
  readonly kind: ChartKind;
  private readonly config: EvaluatorConfig;
  private readonly plans: PhasePlan[];
  private readonly states: PhaseState[] = [];
  private readonly stats: SubgroupStats;
  private readonly rules: RuleEvaluator;
  private readonly companionRule: RuleCode | null;
  private readonly hasCompanion: boolean;
  private readonly smoother: Smoother | null;
  private readonly smoothed: SmoothedColumns | null;
  private readonly sigs: Signal[] = [];
  private evaluated = 0;
  private readonly lim = emptyLimits();
  private limParams: PhaseParams | null = null; // `lim` was computed for these params and this size
  private limSize = NaN;

  constructor(config: EvaluatorConfig) {
    if (!CHARTS.includes(config.chart)) throw new EngineInputError(`unknown chart type ${String(config.chart)}`);
    this.kind = config.chart;
    this.config = config;
    this.smoother = null;
    if (config.chart === 'ewma') {
      const e = config.ewma;
      if (!e || !(e.lambda > 0 && e.lambda <= 1) || !(e.L > 0)) throw new EngineInputError('an EWMA chart needs λ (0 < λ ≤ 1) and L (> 0)');
      this.smoother = new EwmaSmoother(e.lambda, e.L, e.limits === 'asymptotic');
    }
    if (config.chart === 'cusum') {
      const c = config.cusum;
      if (!c || !(c.k >= 0) || !(c.h > 0)) throw new EngineInputError('a CUSUM chart needs k (≥ 0) and h (> 0) in sigma units');
      this.smoother = new CusumSmoother(c.k, c.h);
    }
    this.smoothed = this.smoother ? new SmoothedColumns() : null;
    this.plans = planPhases(config.phases);
    this.stats = new SubgroupStats(config.chart);
    const rules = config.rules ?? DEFAULT_RULES;
    for (const r of rules) if (!RULES.has(r)) throw new EngineInputError(`unknown rule ${String(r)}`);
    this.rules = new RuleEvaluator(rules);
    this.companionRule = rules.includes('we1') ? 'we1' : rules.includes('n1') ? 'n1' : null;
    this.hasCompanion = config.chart === 'xmr' || config.chart === 'xbar-r' || config.chart === 'xbar-s';
  }

  get length(): number {
    return this.stats.length;
  }

  /** Signals so far (cheaper than building an analysis to look). */
  get signalCount(): number {
    return this.sigs.length;
  }

  /** Read-only access for capability and tests. */
  get subgroupStats(): SubgroupStats {
    return this.stats;
  }

  /**
   * Adds one subgroup at the end. Returns the index from which points are new or recomputed
   * (signals at or after it are new too): the new point's index, or the phase start when the
   * subgroup fell inside the baseline and the limits changed.
   */
  append(subgroup: SubgroupInput): number {
    const i = this.stats.length;
    const state = this.phaseFor(i);
    const plan = state.plan;
    this.stats.push(subgroup, plan.start);
    this.smoothed?.reserve(i + 1);
    if (!plan.input.given && i >= plan.baselineStart && i < plan.baselineEnd) {
      this.estimate(state);
      this.evaluateFrom(plan.start);
      return plan.start;
    }
    this.evaluateFrom(i);
    return i;
  }

  /** Adds many subgroups, re-estimating each touched baseline once (a batch costs O(n)). Returns as append(). */
  appendMany(subgroups: readonly SubgroupInput[]): number {
    const first = this.stats.length;
    return this.appendSegments(subgroups.length, (stats, j, phaseStart, end) => {
      for (let k = j; k < end - first; k++) stats.push(subgroups[k]!, phaseStart);
    });
  }

  /** Adds one value per subgroup from a plain or typed array (individuals, EWMA, CUSUM). Returns as append(). */
  appendValues(values: ArrayLike<number>): number {
    const first = this.stats.length;
    return this.appendSegments(values.length, (stats, j, phaseStart, end) => stats.pushValues(values, j, end - first, phaseStart), values instanceof Float64Array);
  }

  /**
   * The current result. A snapshot unless `live`: a live result shares the evaluator's signal
   * list and columns, so read it before the next append (analyze() does).
   */
  analysis(live = false, capability?: Capability): Analysis {
    const warnings: string[] = [];
    for (const s of this.states) for (const w of s.warnings) warnings.push(this.states.length > 1 ? `Phase ${s.plan.index + 1}: ${w}` : w);
    if (this.stats.length === 0) warnings.push('No subgroups yet.');
    const smoothed = this.smoothed && !live ? this.smoothed.copy(this.evaluated) : this.smoothed;
    return makeAnalysis({
      chart: this.kind,
      length: this.evaluated,
      stats: this.stats,
      phases: this.states.map((s) => this.phaseResult(s)),
      params: this.states.map((s) => s.params),
      smoothed,
      ewmaL: this.config.ewma?.L ?? NaN,
      cusumH: this.config.cusum?.h ?? NaN,
      signals: live ? this.sigs : this.sigs.slice(),
      warnings,
      ...(capability ? { capability } : {}),
    });
  }

  // Pushes `count` items phase by phase (pushSegment adds items j.. up to absolute index `end`),
  // re-estimates each baseline the new items fall in, evaluates once.
  private appendSegments(count: number, pushSegment: (stats: SubgroupStats, j: number, phaseStart: number, end: number) => void, typedValues = false): number {
    const first = this.stats.length;
    const total = first + count;
    this.stats.reserve(total, typedValues); // a Float64Array of values: the column is made by the copy (SubgroupStats.pushValues)
    this.smoothed?.reserve(total);
    let from = first;
    while (this.stats.length < total) {
      const i = this.stats.length;
      const state = this.phaseFor(i);
      const plan = state.plan;
      const end = Math.min(plan.end, total);
      pushSegment(this.stats, i - first, plan.start, end);
      if (!plan.input.given && plan.baselineStart < end && plan.baselineEnd > i) {
        this.estimate(state);
        if (plan.start < from) from = plan.start;
      }
    }
    this.evaluateFrom(from);
    return from;
  }

  private evaluateFrom(from: number): void {
    const sigs = this.sigs;
    while (sigs.length > 0 && sigs[sigs.length - 1]!.index >= from) sigs.pop();
    let p = this.states.length - 1;
    while (p > 0 && this.states[p]!.plan.start > from) p--;
    const n = this.stats.length;
    let i = from;
    while (i < n) {
      const state = this.states[p]!;
      const end = p + 1 < this.states.length ? Math.min(n, this.states[p + 1]!.plan.start) : n;
      if (i === state.plan.start) {
        this.rules.reset();
        if (state.params) this.smoother?.reset(state.params.centre);
      }
      if (state.params) this.evaluateSegment(i, end, state.params);
      i = end;
      p++;
    }
    this.evaluated = n;
  }

  // Points [from, to) of one phase with limits. The hot loop: no allocation unless a rule fires.
  private evaluateSegment(from: number, to: number, params: PhaseParams): void {
    const kind = this.kind;
    const lim = this.lim;
    const rules = this.rules;
    const sigs = this.sigs;
    const smoother = this.smoother;
    const companion = this.hasCompanion && this.companionRule !== null;
    const { value: values, size: sizes } = this.stats; // `spread` is read only where needed (it may be filled in on read)
    if (to - from >= BATCH_MIN && !smoother && this.stats.sameSize(from, to)) {
      // Same limits for the whole run of points: detect the rules word-parallel (bit-rules.ts),
      // the companion chart in the same pass.
      const size = sizes[from]!;
      if (params !== this.limParams || size !== this.limSize) {
        computeLimits(kind, params, size, lim);
        this.limParams = params;
        this.limSize = size;
      }
      if (lim.sigma > 0 && lim.sigma < Infinity && Number.isFinite(lim.centre)) {
        const start = this.phaseStartOf(from);
        const check = companion ? { spread: kind === 'xmr' ? null : this.stats.spread, ucl: lim.cUcl, lcl: lim.cLcl, rule: this.companionRule!, name: COMPANION_NAME[kind] ?? 'spread', pair: kind === 'xmr' } : undefined;
        detectBatch(values, Math.max(start, from - CONTEXT), from, to, lim.centre, lim.sigma, rules.set, sigs, check);
        // Leave the point-by-point evaluator in the state it would have after `to`: replaying the
        // last CONTEXT points from a reset is enough, as every counter only matters up to 15.
        rules.reset();
        rules.pushRun(values, Math.max(start, to - CONTEXT), to, lim.centre, lim.sigma, []);
        return;
      }
    }
    for (let i = from; i < to; i++) {
      const size = sizes[i]!;
      if (params !== this.limParams || size !== this.limSize) {
        computeLimits(kind, params, size, lim);
        this.limParams = params;
        this.limSize = size;
      }
      const value = values[i]!;
      if (smoother) {
        smoother.step(i, value, lim, this.smoothed!, sigs);
        continue;
      }
      rules.push(i, value, (value - lim.centre) / lim.sigma, sigs);
      if (companion) {
        const spread = this.stats.spread[i]!;
        if (spread > lim.cUcl || (lim.cLcl > 0 && spread < lim.cLcl)) this.companionSignal(i, spread > lim.cUcl ? 'above' : 'below');
      }
    }
  }

  private phaseStartOf(i: number): number {
    let p = this.states.length - 1;
    while (p > 0 && this.states[p]!.plan.start > i) p--;
    return this.states[p]!.plan.start;
  }

  private companionSignal(i: number, side: 'above' | 'below'): void {
    const name = COMPANION_NAME[this.kind] ?? 'spread';
    this.sigs.push({ rule: this.companionRule!, index: i, points: this.kind === 'xmr' ? [i - 1, i] : [i], side, explanation: explainCompanion(name, side), companion: true });
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
  private phaseResult(s: PhaseState): PhaseResult {
    const plan = s.plan;
    const given = plan.input.given !== undefined;
    const p = s.params;
    const end = Math.min(plan.end, this.stats.length);
    const base = {
      index: plan.index, start: plan.start, end, baselineCount: given ? 0 : s.used, baselineStart: plan.baselineStart,
      provisional: !given && s.used < PROVISIONAL_BELOW,
      centre: p ? fin(p.centre) : null, sigmaWithin: p ? fin(p.sigma) : null,
      sigmaMethod: p ? p.method : given ? 'given' : isAttributeChart(this.kind) ? (this.kind === 'p' || this.kind === 'np' ? 'binomial' : 'poisson') : (this.config.sigmaMethod ?? defaultSigmaMethod(this.kind, false, this.kind === 'xmr')),
      source: given ? 'given' : 'baseline',
    } as const;
    return plan.input.reason === undefined ? base : { ...base, reason: plan.input.reason };
  }
}

const RULES = new Set<string>(['we1', 'we2', 'we3', 'we4', 'n1', 'n2', 'n3', 'n4', 'n5', 'n6', 'n7', 'n8']);

function fin(x: number): number | null {
  return Number.isFinite(x) ? x : null;
}

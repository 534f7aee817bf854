/**
 * Capability of the studied phase (the last one) against the specification.
 * Within sigma: the chart's own estimator over every included subgroup of the phase
 * (MR̄/d2, R̄/d2, s̄/c4 or pooled). Overall sigma: sample standard deviation of all observations
 * (n − 1 divisor, no c4 correction). Cpm uses the overall sigma; its target defaults to the
 * middle of the specification. Intervals use n = number of observations.
 */
import { andersonDarling } from './anderson-darling';
import { bissellInterval, capabilityIndices, chiSquareInterval, cpm, expectedPpm } from './capability-indices';
import { estimatePhase } from './estimate';
import { EngineInputError, type SubgroupStats } from './subgroup-stats';
import type { Capability, ChartKind, PhaseResult, SigmaMethod, Signal, SpecInput } from './types';

export interface CapabilityInput {
  readonly kind: ChartKind;
  readonly stats: SubgroupStats;
  readonly phase: PhaseResult;
  readonly signals: readonly Signal[];
  readonly spec: SpecInput;
  readonly sigmaMethod: SigmaMethod | undefined;
  readonly confidence: number;
}

export function studyCapability(c: CapabilityInput): Capability {
  const { lsl, usl } = c.spec;
  if (lsl !== undefined && usl !== undefined && !(usl > lsl)) throw new EngineInputError(`the upper specification limit (${usl}) must be above the lower (${lsl})`);
  if (!(c.confidence > 0 && c.confidence < 1)) throw new EngineInputError('the confidence level must be between 0 and 1');
  const { start, end } = c.phase;
  const obs: number[] = [];
  for (let i = start; i < end; i++) {
    if (c.stats.excluded[i]) continue;
    const raw = c.stats.raw.get(i);
    if (raw) for (const v of raw) obs.push(v);
    else obs.push(c.stats.value[i]!);
  }
  const n = obs.length;
  const cautions: string[] = [];
  let mean = 0;
  for (const v of obs) mean += v;
  mean = n > 0 ? mean / n : 0;
  let ss = 0;
  for (const v of obs) ss += (v - mean) * (v - mean);
  const overall = n >= 2 && ss > 0 ? Math.sqrt(ss / (n - 1)) : null;

  const est = estimatePhase(c.kind, c.stats, start, end, c.sigmaMethod);
  const within = est.params ? est.params.sigma : null;
  const method = (est.params?.method ?? 'mr-mean') as SigmaMethod;
  for (const w of est.warnings) cautions.push(`Within sigma: ${w}`);
  if (overall === null) cautions.push('Overall sigma needs at least 2 observations that are not all equal.');

  const w = capabilityIndices(mean, within, lsl, usl);
  const o = capabilityIndices(mean, overall, lsl, usl);
  const target = c.spec.target ?? (lsl !== undefined && usl !== undefined ? (lsl + usl) / 2 : undefined);
  const cpmValue = lsl !== undefined && usl !== undefined && target !== undefined ? cpm(mean, overall, lsl, usl, target) : null;

  const phaseSignals = c.signals.filter((s) => s.index >= start && s.index < end).length;
  if (phaseSignals > 0) {
    cautions.push(`The period studied has ${phaseSignals} signal${phaseSignals === 1 ? '' : 's'}: the process is not shown to be stable, so these figures may not predict what it will make.`);
  }
  const normality = andersonDarling(obs);
  if (normality === null) cautions.push('Too few values (fewer than 8) or no spread: normality not tested.');
  else if (normality.pValue < 0.05) cautions.push(`The values do not look normal (Anderson–Darling p = ${normality.pValue.toPrecision(2)}): the expected ppm rest on a normal model.`);
  if (n < 30 && n > 0) cautions.push(`Only ${n} values: the indices are imprecise (see the confidence intervals).`);

  const conf = c.confidence;
  return {
    n, phase: c.phase.index, mean, sigmaWithin: within, sigmaWithinMethod: method, sigmaOverall: overall,
    cp: w.potential, cpk: w.actual, cpu: w.upper, cpl: w.lower, pp: o.potential, ppk: o.actual, cpm: cpmValue,
    confidence: conf,
    cpInterval: w.potential === null ? null : chiSquareInterval(w.potential, n, conf),
    ppInterval: o.potential === null ? null : chiSquareInterval(o.potential, n, conf),
    cpkInterval: w.actual === null ? null : bissellInterval(w.actual, n, conf),
    ppkInterval: o.actual === null ? null : bissellInterval(o.actual, n, conf),
    ppmWithin: expectedPpm(mean, within, lsl, usl),
    ppmOverall: expectedPpm(mean, overall, lsl, usl),
    normality,
    cautions,
  };
}

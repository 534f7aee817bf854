/** The engine's facade: one JSON-serialisable description in, one JSON-serialisable result out. */
import { studyCapability } from './capability';
import { isAttributeChart } from './estimate';
import { Evaluator, type EvaluatorConfig } from './evaluator';
import { EngineInputError } from './subgroup-stats';
import type { Analysis, AnalysisInput } from './types';

/**
 * Limits, run-rule signals and (with a specification) capability for one characteristic.
 * Throws EngineInputError on malformed input (a subgroup without values, a negative count, an
 * EWMA without λ); degenerate but valid data gives null limits and a warning instead.
 */
export function analyze(input: AnalysisInput): Analysis {
  const ev = new Evaluator(input);
  if (input.individuals !== undefined) {
    if (input.subgroups !== undefined) throw new EngineInputError('give either subgroups or individuals, not both');
    ev.appendValues(input.individuals);
  } else {
    ev.appendMany(input.subgroups ?? []);
  }
  return withCapability(ev, input);
}

/** The evaluator's current result plus capability when the input has a specification. */
export function withCapability(ev: Evaluator, input: EvaluatorConfig): Analysis {
  const a = ev.analysis(true);
  const spec = input.spec;
  if (!spec || (spec.lsl === undefined && spec.usl === undefined)) return a;
  if (isAttributeChart(input.chart)) {
    (a.warnings as string[]).push('Capability indices need measured values: not computed for an attribute chart.');
    return a;
  }
  const chosen = input.capabilityPhase;
  if (chosen !== undefined && !(Number.isInteger(chosen) && chosen >= 0)) throw new EngineInputError(`capabilityPhase must be a phase index, got ${chosen}`);
  const phase = a.phases[chosen ?? a.phases.length - 1];
  if (!phase) {
    if (chosen !== undefined) (a.warnings as string[]).push(`Phase ${chosen + 1} has no data yet: capability not computed.`);
    return a;
  }
  const capability = studyCapability({ kind: input.chart, stats: ev.subgroupStats, phase, signals: a.signals, spec, sigmaMethod: input.sigmaMethod, confidence: input.confidence ?? 0.95 });
  return ev.analysis(true, capability);
}

/** The engine's facade: one JSON-serialisable description in, one JSON-serialisable result out. */
import { Evaluator } from './evaluator';
import type { Analysis, AnalysisInput } from './types';

/**
 * Limits, run-rule signals and (with a specification) capability for one characteristic.
 * Throws EngineInputError on malformed input (a subgroup without values, a negative count, an
 * EWMA without λ); degenerate but valid data gives null limits and a warning instead.
 */
export function analyze(input: AnalysisInput): Analysis {
  const ev = new Evaluator(input);
  ev.appendMany(input.subgroups);
  return ev.analysis(true);
}

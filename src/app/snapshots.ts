import type { Analysis, Signal } from '../engine/types';
import type { SignalSnapshot } from '../schema';
import type { ChartSeries } from './analysis-input';

/** What fired, frozen into the response: rule, words, limits and phase at that point, the samples of the pattern. */
export function snapshotSignals(signals: readonly Signal[], analysis: Analysis, series: ChartSeries): SignalSnapshot[] {
  return signals.map((s) => {
    const point = analysis.points[s.index]!;
    const limits = s.companion && point.companion ? point.companion : point;
    const phaseId = series.phaseIds[point.phase];
    return {
      rule: s.rule,
      explanation: s.explanation,
      ...(phaseId ? { phaseId } : {}),
      centre: limits.centre,
      ucl: limits.ucl,
      lcl: limits.lcl,
      sampleIds: s.points.map((i) => series.sampleIds[i]!).filter(Boolean),
    };
  });
}

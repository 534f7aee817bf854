import { analyze } from '../engine';
import type { Analysis, AnalysisInput } from '../engine/types';
import type { Acknowledgement, Characteristic, Phase, Response, Sample } from '../schema';
import { buildChartSeries } from './analysis-input';
import type { CharacteristicView } from './app-state';
import { dueStatus } from './due-state';
import { groupSignals } from './signal-state';

/** Everything one characteristic's screens show, from its current samples, phases and answers. Pure. */
export function buildCharacteristicView(
  characteristic: Characteristic,
  phases: readonly Phase[],
  currentSamples: readonly Sample[],
  responses: readonly Response[],
  acks: readonly Acknowledgement[],
  now: number,
): CharacteristicView {
  const series = buildChartSeries(characteristic, phases, currentSamples);
  // The live chart needs limits and signals, not capability (a study of its own): leave the spec out.
  const { spec: _spec, ...live } = series.input;
  const analysis = analyzeOrExplain(live);
  const imported = new Set(series.samples.filter((s) => s.imported !== undefined).map((s) => s.id));
  const groups = groupSignals(analysis, series.sampleIds, responses, acks, imported);
  const lastTakenAt = series.samples[series.samples.length - 1]?.takenAt;
  return {
    characteristic,
    series,
    analysis,
    groups,
    responses,
    acks,
    due: dueStatus(characteristic, lastTakenAt, now),
    ...(lastTakenAt ? { lastTakenAt } : {}),
  };
}

/**
 * The engine refuses input it cannot chart (a sample without values, more defectives than inspected,
 * perhaps pulled from another tablet). One such record must not take the screens down: the chart is
 * left empty and a warning says why.
 */
function analyzeOrExplain(input: AnalysisInput): Analysis {
  try {
    return analyze(input);
  } catch (e) {
    const why = e instanceof Error ? e.message : String(e);
    return { chart: input.chart, points: [], phases: [], signals: [], warnings: [`The chart cannot be drawn: ${why}`] };
  }
}

import { analyze } from '../engine';
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
  const analysis = analyze(series.input);
  const groups = groupSignals(analysis, series.sampleIds, responses, acks);
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

import type { Signal } from './types';

/**
 * A rule keeps firing while its pattern lasts: a run of 8 above the centre line fires Western
 * Electric rule 4 at the 8th point and again at the 9th, 10th…; a CUSUM stays beyond its decision
 * interval for several points. For people these are one event. An episode is a maximal stretch
 * of consecutive points at which the same rule fires on the same side of the same chart.
 * Returns, for each signal (same order as given), the index of the point where its episode began.
 */
export function episodeStarts(signals: readonly Signal[]): number[] {
  const key = (s: Signal) => `${s.rule}|${s.side ?? ''}|${s.companion === true ? 'c' : 'm'}`;
  const startAt = new Map<string, number>(); // key@index → episode start
  const order = signals.map((_, i) => i).sort((a, b) => signals[a]!.index - signals[b]!.index);
  const out = new Array<number>(signals.length);
  for (const i of order) {
    const s = signals[i]!;
    const k = key(s);
    const start = startAt.get(`${k}@${s.index - 1}`) ?? s.index;
    startAt.set(`${k}@${s.index}`, start);
    out[i] = start;
  }
  return out;
}

/** True for a signal that only continues an episode begun at an earlier point. */
export function continuesEarlierEpisode(signals: readonly Signal[]): boolean[] {
  return episodeStarts(signals).map((start, i) => start !== signals[i]!.index);
}

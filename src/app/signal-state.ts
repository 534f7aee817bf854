import { continuesEarlierEpisode, episodeStarts } from '../engine';
import type { Analysis, Signal } from '../engine/types';
import type { Acknowledgement, Response } from '../schema';

/**
 * unanswered → answered → closed (signed off). 'historical': it fired at an imported sample (history
 * brought in from paper or an earlier system) and nobody answered it here: shown on the chart and in
 * the history, never counted as open and never prompted for; it can still be answered.
 */
export type SignalState = 'unanswered' | 'answered' | 'closed' | 'historical';

/** The signals that fired at one sample, with what has been done about them. */
export interface SignalGroup {
  readonly sampleId: string;
  readonly index: number;
  /** The last point at which the pattern was still firing (index when it fired once). */
  readonly lastIndex: number;
  /** The signals that began at this point (continuations at later points are not repeated). */
  readonly signals: readonly Signal[];
  readonly response?: Response;
  readonly ack?: Acknowledgement;
  readonly state: SignalState;
}

/**
 * Groups the engine's signals by the sample at which they fired and joins the responses and
 * acknowledgements. A signal stays open until it is answered and a supervisor acknowledges it,
 * unless it began at one of the `imported` samples (then it is 'historical' until answered).
 */
export function groupSignals(
  analysis: Analysis,
  sampleIds: readonly string[],
  responses: readonly Response[],
  acks: readonly Acknowledgement[],
  imported: ReadonlySet<string> = new Set(),
): SignalGroup[] {
  // A pattern that goes on firing point after point is one event: group it under the point where it began.
  const starts = episodeStarts(analysis.signals);
  const bySample = new Map<string, Signal[]>();
  const lastBySample = new Map<string, number>();
  analysis.signals.forEach((s, i) => {
    const start = starts[i]!;
    const id = sampleIds[start];
    if (!id) return;
    if (start === s.index) {
      const list = bySample.get(id) ?? [];
      list.push(s);
      bySample.set(id, list);
    }
    lastBySample.set(id, Math.max(lastBySample.get(id) ?? start, s.index));
  });
  const responseBySample = new Map<string, Response>();
  for (const r of responses) {
    const prev = responseBySample.get(r.sampleId);
    if (!prev || prev.respondedAt < r.respondedAt) responseBySample.set(r.sampleId, r);
  }
  const ackByResponse = new Map(acks.map((a) => [a.responseId, a]));
  const groups: SignalGroup[] = [];
  for (const [sampleId, signals] of bySample) {
    const response = responseBySample.get(sampleId);
    const ack = response ? ackByResponse.get(response.id) : undefined;
    const state: SignalState = !response ? (imported.has(sampleId) ? 'historical' : 'unanswered') : ack ? 'closed' : 'answered';
    const index = signals[0]!.index;
    groups.push({ sampleId, index, lastIndex: lastBySample.get(sampleId) ?? index, signals, state, ...(response ? { response } : {}), ...(ack ? { ack } : {}) });
  }
  return groups.sort((a, b) => b.index - a.index);
}

/** Signals that fired at the newest point only: what a save should prompt for. */
export function signalsAtNewest(analysis: Analysis): Signal[] {
  const last = analysis.points.length - 1;
  const continuing = continuesEarlierEpisode(analysis.signals);
  return analysis.signals.filter((s, i) => s.index === last && !continuing[i]);
}

/**
 * Signals that fired at one point: what saving the sample at `index` should prompt for. That sample
 * need not be the newest (another tablet whose clock runs ahead may have sent a later one).
 */
export function signalsAt(analysis: Analysis, index: number): Signal[] {
  return index < 0 ? [] : analysis.signals.filter((s) => s.index === index);
}

import type { Analysis, Signal } from '../engine/types';
import type { Acknowledgement, Response } from '../schema';

export type SignalState = 'unanswered' | 'answered' | 'closed';

/** The signals that fired at one sample, with what has been done about them. */
export interface SignalGroup {
  readonly sampleId: string;
  readonly index: number;
  readonly signals: readonly Signal[];
  readonly response?: Response;
  readonly ack?: Acknowledgement;
  readonly state: SignalState;
}

/**
 * Groups the engine's signals by the sample at which they fired and joins the responses and
 * acknowledgements. A signal stays open until it is answered and a supervisor acknowledges it.
 */
export function groupSignals(
  analysis: Analysis,
  sampleIds: readonly string[],
  responses: readonly Response[],
  acks: readonly Acknowledgement[],
): SignalGroup[] {
  const bySample = new Map<string, Signal[]>();
  for (const s of analysis.signals) {
    const id = sampleIds[s.index];
    if (!id) continue;
    const list = bySample.get(id) ?? [];
    list.push(s);
    bySample.set(id, list);
  }
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
    const state: SignalState = !response ? 'unanswered' : ack ? 'closed' : 'answered';
    groups.push({ sampleId, index: signals[0]!.index, signals, state, ...(response ? { response } : {}), ...(ack ? { ack } : {}) });
  }
  return groups.sort((a, b) => b.index - a.index);
}

/** Signals that fired at the newest point only: what a save should prompt for. */
export function signalsAtNewest(analysis: Analysis): Signal[] {
  const last = analysis.points.length - 1;
  return analysis.signals.filter((s) => s.index === last);
}

/**
 * Signals that fired at one point: what saving the sample at `index` should prompt for. That sample
 * need not be the newest (another tablet whose clock runs ahead may have sent a later one).
 */
export function signalsAt(analysis: Analysis, index: number): Signal[] {
  return index < 0 ? [] : analysis.signals.filter((s) => s.index === index);
}

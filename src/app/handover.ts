import type { CharacteristicView } from './app-state';

/** One characteristic's shift in numbers. */
export interface HandoverRow {
  readonly characteristicId: string;
  readonly name: string;
  readonly stationId: string;
  /** Samples taken in the period. */
  readonly samples: number;
  /** Samples the sampling interval called for in the period (whole intervals). */
  readonly expected: number;
  readonly late: boolean;
  /** Signals that began in the period, by state now. */
  readonly unanswered: number;
  readonly awaitingSignOff: number;
  readonly signedOff: number;
  /** What was said about each answered signal of the period, newest first. */
  readonly notes: readonly { readonly at: string; readonly text: string }[];
}

export interface Handover {
  readonly from: number;
  readonly to: number;
  readonly rows: readonly HandoverRow[];
  readonly totals: { readonly samples: number; readonly unanswered: number; readonly awaitingSignOff: number; readonly late: number };
}

/**
 * The shift handover summary over [from, to): per characteristic, samples taken against those due,
 * signals that began in the period and where they stand, and what the answers said. Pure.
 */
export function summarizeShift(views: readonly CharacteristicView[], from: number, to: number): Handover {
  const rows = views.map((v): HandoverRow => {
    const inPeriod = (iso: string) => {
      const t = Date.parse(iso);
      return t >= from && t < to;
    };
    const samples = v.series.samples.filter((s) => inPeriod(s.takenAt)).length;
    const groups = v.groups.filter((g) => {
      const s = v.series.samples[g.index];
      return s !== undefined && inPeriod(s.takenAt);
    });
    return {
      characteristicId: v.characteristic.id,
      name: v.characteristic.name,
      stationId: v.characteristic.stationId,
      samples,
      expected: Math.floor((to - from) / (v.characteristic.intervalMinutes * 60_000)),
      late: v.due.kind === 'late',
      unanswered: groups.filter((g) => g.state === 'unanswered').length,
      awaitingSignOff: groups.filter((g) => g.state === 'answered').length,
      signedOff: groups.filter((g) => g.state === 'closed').length,
      notes: groups.flatMap((g) => (g.response ? [{ at: g.response.respondedAt, text: `${g.response.whatHappened} — ${g.response.causeCategory}; action: ${g.response.action}` }] : [])),
    };
  });
  const sum = (f: (r: HandoverRow) => number) => rows.reduce((n, r) => n + f(r), 0);
  return {
    from,
    to,
    rows,
    totals: { samples: sum((r) => r.samples), unanswered: sum((r) => r.unanswered), awaitingSignOff: sum((r) => r.awaitingSignOff), late: sum((r) => (r.late ? 1 : 0)) },
  };
}

import type { Characteristic } from '../schema';

export type DueKind = 'not-started' | 'waiting' | 'due' | 'late';

export interface DueStatus {
  readonly kind: DueKind;
  /** When the next sample is due (ms since epoch); null before the first sample. */
  readonly dueAt: number | null;
  /** Minutes until due (positive) or since due (negative). */
  readonly minutes: number;
}

/** A sample is "due" for the first 10% of the interval (at least 5 min) after its due time, then "late". */
export function dueStatus(ch: Characteristic, lastTakenAt: string | undefined, now: number): DueStatus {
  if (!lastTakenAt) return { kind: 'not-started', dueAt: null, minutes: 0 };
  const intervalMs = ch.intervalMinutes * 60_000;
  const dueAt = Date.parse(lastTakenAt) + intervalMs;
  const minutes = Math.round((dueAt - now) / 60_000);
  const grace = Math.max(5, ch.intervalMinutes * 0.1);
  if (minutes > 0) return { kind: 'waiting', dueAt, minutes };
  if (-minutes <= grace) return { kind: 'due', dueAt, minutes };
  return { kind: 'late', dueAt, minutes };
}

/** "1 h 05 min", "12 min", "2 d 3 h": a span of minutes for people. */
export function formatSpan(totalMinutes: number): string {
  const m = Math.abs(Math.round(totalMinutes));
  if (m < 60) return `${m} min`;
  const h = Math.floor(m / 60);
  if (h < 48) return `${h} h ${String(m % 60).padStart(2, '0')} min`;
  return `${Math.floor(h / 24)} d ${h % 24} h`;
}

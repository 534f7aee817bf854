import type { Analysis, PhaseResult } from '../engine/types';
import type { Phase } from '../schema';
import type { ChartSeries } from './analysis-input';

/** One phase of a characteristic as the limits history lists it. */
export interface LimitsHistoryRow {
  /** 1 for the first phase. */
  readonly number: number;
  readonly phaseId?: string;
  /** When the phase was set to start (set-up), and when its first point was taken. */
  readonly startsAt?: string;
  readonly firstPointAt?: string;
  readonly reason: string;
  readonly source: 'baseline' | 'given';
  /** Subgroups the limits were computed from (after exclusions); 0 for given limits. */
  readonly baselineCount: number;
  /** Baseline of fewer than 20 subgroups (common practice: 20–25): the limits are provisional. */
  readonly provisional: boolean;
  readonly centre: number | null;
  readonly ucl: number | null;
  readonly lcl: number | null;
  /** True when the limits change from point to point in the phase (varying n, exact EWMA limits); the row shows the latest. */
  readonly limitsVary: boolean;
  /** Process sigma of individual values (null for attribute charts) and how it was estimated. */
  readonly sigma: number | null;
  readonly sigmaMethod: PhaseResult['sigmaMethod'];
  readonly points: number;
  /** Points of the phase at which at least one rule fired. */
  readonly signalPoints: number;
  /** Change from the previous phase (null where either side is unknown); absent for the first. */
  readonly change?: { readonly centre: number | null; readonly ucl: number | null; readonly lcl: number | null; readonly sigmaRatio: number | null };
}

/** How each sigma estimate is written in the history. */
export const SIGMA_METHOD_TEXT: Readonly<Record<PhaseResult['sigmaMethod'], string>> = {
  'mr-mean': 'MR̄ / d2',
  'mr-median': 'median MR / 0.954',
  'r-bar': 'R̄ / d2',
  's-bar': 's̄ / c4',
  pooled: 'pooled s / c4',
  given: 'given',
  binomial: 'from p̄ (binomial)',
  poisson: 'from the mean count (Poisson)',
};

const diff = (a: number | null, b: number | null): number | null => (a === null || b === null ? null : a - b);

/**
 * The limits of each phase of one characteristic, computed from its analysis (pure). The limits of a
 * phase are read at its latest point; a phase with no points yet shows what it will use once it has some.
 */
export function limitsHistory(analysis: Analysis, series: Pick<ChartSeries, 'phaseIds' | 'samples'>, phases: readonly Phase[]): LimitsHistoryRow[] {
  const byId = new Map(phases.map((p) => [p.id, p]));
  const rows: LimitsHistoryRow[] = [];
  for (const ph of analysis.phases) {
    const setupPhase = byId.get(series.phaseIds[ph.index] ?? '');
    const end = Math.min(ph.end, analysis.points.length);
    const pts = analysis.points.slice(ph.start, end);
    const last = pts[pts.length - 1];
    const first = pts[0];
    const limitsVary = pts.some((p) => p.ucl !== first?.ucl || p.lcl !== first?.lcl || p.centre !== first?.centre);
    const flagged = new Set(analysis.signals.filter((s) => s.index >= ph.start && s.index < end).map((s) => s.index));
    const firstPointAt = series.samples[ph.start]?.takenAt;
    const row: LimitsHistoryRow = {
      number: setupPhase?.number ?? ph.index + 1,
      ...(setupPhase ? { phaseId: setupPhase.id, startsAt: setupPhase.startsAt } : {}),
      ...(firstPointAt && ph.start < end ? { firstPointAt } : {}),
      reason: setupPhase?.reason ?? ph.reason ?? (ph.index === 0 ? 'Limits as first set up' : ''),
      source: ph.source,
      baselineCount: ph.source === 'given' ? 0 : ph.baselineCount,
      provisional: ph.source === 'baseline' && ph.provisional,
      centre: last?.centre ?? ph.centre,
      ucl: last?.ucl ?? null,
      lcl: last?.lcl ?? null,
      limitsVary,
      sigma: ph.sigmaWithin,
      sigmaMethod: ph.sigmaMethod,
      points: pts.length,
      signalPoints: flagged.size,
    };
    const prev = rows[rows.length - 1];
    rows.push(prev ? {
      ...row,
      change: {
        centre: diff(row.centre, prev.centre), ucl: diff(row.ucl, prev.ucl), lcl: diff(row.lcl, prev.lcl),
        sigmaRatio: row.sigma !== null && prev.sigma !== null && prev.sigma > 0 ? row.sigma / prev.sigma : null,
      },
    } : row);
  }
  return rows;
}

/** The withdrawn phases of a characteristic, by number: the limits history still lists them, marked withdrawn. */
export function withdrawnPhases(phases: readonly Phase[], characteristicId: string): Phase[] {
  return phases.filter((p) => p.characteristicId === characteristicId && p.withdrawn).sort((a, b) => a.number - b.number);
}

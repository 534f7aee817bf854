import type { Characteristic, Person, Phase, RuleId } from '../schema';
import { DEFAULT_CUSUM, DEFAULT_EWMA } from './analysis-input';
import type { CharacteristicView, SetupView } from './app-state';
import { limitsHistory, withdrawnPhases, type LimitsHistoryRow } from './limits-history';
import { phaseSpans } from './phase-change';
import type { SignalGroup } from './signal-state';

/** The stretch of history a printed report covers. */
export type ReportPeriod = 'all' | 'last-7-days' | 'last-30-days' | 'current-phase';

export const REPORT_PERIODS: readonly { readonly id: ReportPeriod; readonly label: string }[] = [
  { id: 'all', label: 'Whole history' },
  { id: 'last-30-days', label: 'Last 30 days' },
  { id: 'last-7-days', label: 'Last 7 days' },
  { id: 'current-phase', label: 'Current phase' },
];

/** Points `from` (inclusive) to `to` (exclusive) of the chart; `from === to` when the period holds none. */
export interface ReportRange {
  readonly from: number;
  readonly to: number;
}

const DAY = 24 * 3_600_000;

/**
 * The points of the chart a period covers (pure). Days are counted back from `now`, by the time each
 * sample was taken; the current phase runs from the first point of the last phase to the newest point.
 */
export function reportRange(view: CharacteristicView, period: ReportPeriod, now: number): ReportRange {
  const n = view.analysis.points.length;
  if (period === 'all') return { from: 0, to: n };
  if (period === 'current-phase') {
    const last = view.analysis.phases[view.analysis.phases.length - 1];
    return { from: Math.min(last?.start ?? 0, n), to: n };
  }
  const since = now - (period === 'last-7-days' ? 7 : 30) * DAY;
  const first = view.series.samples.findIndex((s, i) => i < n && Date.parse(s.takenAt) >= since);
  return { from: first < 0 ? n : first, to: n };
}

/** "LSL 22.0 · target 25.0 · USL 28.0"; a one-sided specification says which side it bounds. */
export function specificationText(spec: Characteristic['spec'], decimals: number): string {
  const f = (v: number) => v.toFixed(decimals);
  const { lsl, usl, target } = spec;
  const t = target !== undefined ? ` · target ${f(target)}` : '';
  if (lsl !== undefined && usl !== undefined) return `LSL ${f(lsl)}${t} · USL ${f(usl)}`;
  if (usl !== undefined) return `USL ${f(usl)}${t} · one-sided: upper limit only, no lower limit`;
  if (lsl !== undefined) return `LSL ${f(lsl)}${t} · one-sided: lower limit only, no upper limit`;
  return target !== undefined ? `No specification limits${t}` : 'No specification';
}

/** "Western Electric rules 1, 2 · Nelson tests 5, 6"; for EWMA and CUSUM the chart's own decision first. */
export function rulesText(ch: Pick<Characteristic, 'chartType' | 'rules' | 'ewma' | 'cusum'>): string {
  const parts: string[] = [];
  if (ch.chartType === 'ewma') {
    const e = ch.ewma ?? DEFAULT_EWMA;
    parts.push(`EWMA beyond its limits (λ ${e.lambda}, L ${e.L})`);
  }
  if (ch.chartType === 'cusum') {
    const c = ch.cusum ?? DEFAULT_CUSUM;
    parts.push(`CUSUM beyond its decision interval (k ${c.k}σ, h ${c.h}σ)`);
  }
  const numbers = (prefix: string) => ch.rules.filter((r: RuleId) => r.startsWith(prefix)).map((r) => Number(r.slice(prefix.length))).sort((a, b) => a - b);
  const we = numbers('we');
  const nelson = numbers('n');
  if (we.length) parts.push(`Western Electric rule${we.length === 1 ? '' : 's'} ${we.join(', ')}`);
  if (nelson.length) parts.push(`Nelson test${nelson.length === 1 ? '' : 's'} ${nelson.join(', ')}`);
  return parts.length ? parts.join(' · ') : 'No run rules chosen';
}

/** What the head of a printed report says. Times are ISO instants; the screen formats them. */
export interface ReportHeader {
  readonly site?: string;
  readonly line?: string;
  readonly station?: string;
  readonly characteristic: string;
  readonly unit: string;
  readonly specification: string;
  readonly rules: string;
  readonly periodLabel: string;
  /** Times of the first and last sample in the period (absent when it holds none). */
  readonly firstSampleAt?: string;
  readonly lastSampleAt?: string;
  readonly points: number;
  readonly printedAt: string;
  readonly printedBy: string;
  readonly safetyCritical: boolean;
}

/** The report's header from the set-up, the period and who prints it when (pure). */
export function reportHeader(
  view: CharacteristicView,
  setup: Pick<SetupView, 'sites' | 'lines' | 'stations'>,
  range: ReportRange,
  period: ReportPeriod,
  printedBy: Pick<Person, 'name' | 'role'> | undefined,
  now: number,
): ReportHeader {
  const ch = view.characteristic;
  const station = setup.stations.find((s) => s.id === ch.stationId);
  const line = station && setup.lines.find((l) => l.id === station.lineId);
  const site = line && setup.sites.find((s) => s.id === line.siteId);
  const first = range.to > range.from ? view.series.samples[range.from] : undefined;
  const last = range.to > range.from ? view.series.samples[range.to - 1] : undefined;
  return {
    ...(site ? { site: site.name } : {}),
    ...(line ? { line: line.name } : {}),
    ...(station ? { station: station.name } : {}),
    characteristic: ch.name,
    unit: ch.unit,
    specification: specificationText(ch.spec, ch.decimals),
    rules: rulesText(ch),
    periodLabel: REPORT_PERIODS.find((p) => p.id === period)?.label ?? period,
    ...(first ? { firstSampleAt: first.takenAt } : {}),
    ...(last ? { lastSampleAt: last.takenAt } : {}),
    points: Math.max(0, range.to - range.from),
    printedAt: new Date(now).toISOString(),
    printedBy: printedBy ? `${printedBy.name} (${printedBy.role})` : 'not signed in',
    safetyCritical: ch.safetyCritical,
  };
}

/**
 * The signals a period holds, oldest first, as the app groups them (one event per pattern, with its
 * answer and sign-off). A pattern that began before the period and went on firing inside it is kept.
 */
export function signalsInRange(groups: readonly SignalGroup[], range: ReportRange): SignalGroup[] {
  return groups.filter((g) => g.index < range.to && g.lastIndex >= range.from).sort((a, b) => a.index - b.index);
}

/** Counts of a period's signals by state, for the report's summary line. */
export function signalCounts(groups: readonly SignalGroup[]): { readonly total: number; readonly open: number; readonly awaitingSignOff: number; readonly closed: number; readonly historical: number } {
  return {
    total: groups.length,
    open: groups.filter((g) => g.state === 'unanswered').length,
    awaitingSignOff: groups.filter((g) => g.state === 'answered').length,
    closed: groups.filter((g) => g.state === 'closed').length,
    historical: groups.filter((g) => g.state === 'historical').length,
  };
}

/** The limits history (limitsHistory) cut to the phases that have points in the period, or that start in it. */
export function limitsInRange(view: CharacteristicView, phases: SetupView['phases'], range: ReportRange): LimitsHistoryRow[] {
  const rows = limitsHistory(view.analysis, view.series, phases);
  // limitsHistory gives one row per phase of the analysis, in the same order.
  return rows.filter((_, i) => {
    const ph = view.analysis.phases[i];
    if (!ph) return false;
    return phaseInRange(ph.start, Math.min(ph.end, view.analysis.points.length), range);
  });
}

/** Whether a phase spanning points [start, end) belongs in the period: it has points in it, or (empty) starts in it. */
function phaseInRange(start: number, end: number, range: ReportRange): boolean {
  return start < end ? start < range.to && end > range.from : start >= range.from && start <= range.to;
}

function unwithdrawn(p: Phase): Phase {
  const { withdrawn: _w, ...rest } = p;
  return rest;
}

/**
 * One phase as the report lists it. In force: its limits-history row and, when set up, the phase with
 * its corrections. Withdrawn: the phase (with its corrections and the withdrawal note) and the points
 * [from, to) it would hold had it not been withdrawn (up to the next phase, withdrawn or not), now judged
 * against phase `judgedBy`.
 */
export type ReportPhase =
  | { readonly kind: 'in-force'; readonly number: number; readonly row: LimitsHistoryRow; readonly phase?: Phase }
  | { readonly kind: 'withdrawn'; readonly number: number; readonly phase: Phase; readonly from: number; readonly to: number; readonly judgedBy?: number };

/**
 * The phases of the period, by number: those in force (limitsInRange) and the withdrawn ones whose
 * points, had they not been withdrawn, lie in the period (or, with none, that start in it). Pure.
 */
export function phasesInRange(view: CharacteristicView, phases: SetupView['phases'], range: ReportRange): ReportPhase[] {
  const byId = new Map(phases.map((p) => [p.id, p]));
  const inForce: ReportPhase[] = limitsInRange(view, phases, range).map((row) => {
    const phase = row.phaseId ? byId.get(row.phaseId) : undefined;
    return { kind: 'in-force', number: row.number, row, ...(phase ? { phase } : {}) };
  });
  const samples = view.series.samples;
  const n = view.analysis.points.length;
  const withdrawn: ReportPhase[] = [];
  for (const phase of withdrawnPhases(phases, view.characteristic.id)) {
    // Where it stood: this phase put back in force, and the withdrawn ones after it too, so that its points end
    // where the next phase (in force or not) begins and two withdrawn phases never claim the same points.
    const restored = phases.map((p) => (p.withdrawn && p.characteristicId === phase.characteristicId && p.number >= phase.number ? unwithdrawn(p) : p));
    const span = phaseSpans(view.characteristic, restored, samples).find((s) => s.phase.id === phase.id);
    const at = samples.findIndex((s) => Date.parse(s.takenAt) >= Date.parse(phase.startsAt));
    const from = Math.min(span?.start ?? (at < 0 ? samples.length : at), n);
    const to = Math.min(span?.end ?? from, n);
    if (!phaseInRange(from, to, range)) continue;
    const holder = view.analysis.phases.find((ph) => ph.start <= from && from < ph.end);
    const judgedBy = from < to && holder ? byId.get(view.series.phaseIds[holder.index] ?? '')?.number ?? holder.index + 1 : undefined;
    withdrawn.push({ kind: 'withdrawn', number: phase.number, phase, from, to, ...(judgedBy !== undefined ? { judgedBy } : {}) });
  }
  return [...inForce, ...withdrawn].sort((a, b) => a.number - b.number);
}

/**
 * Whether the capability study (which always takes the last phase whole) reaches outside the period:
 * the report then says which points it studied.
 */
export function capabilityScope(view: CharacteristicView, range: ReportRange): { readonly phase: number; readonly from: number; readonly to: number; readonly outside: boolean } | undefined {
  const ph = view.analysis.phases[view.analysis.phases.length - 1];
  if (!ph) return undefined;
  const to = Math.min(ph.end, view.analysis.points.length);
  return { phase: ph.index + 1, from: ph.start, to, outside: ph.start < range.from || to > range.to };
}

import { Phase, isVariableChart, type Characteristic } from '../schema';
import type { FormResult } from './characteristic-form';
import { fieldErrorsFrom, readNumber } from './form-issues';

/** Starting a new phase after a documented process change, as the engineer fills it in. */
export interface PhaseForm {
  readonly reason: string;
  /** 'now': from the next sample on; 'point': from a point already on the chart. */
  readonly startMode: 'now' | 'point';
  /** The sample at which the phase starts, when startMode is 'point'. */
  readonly startSampleId: string;
  /** 'baseline': limits from the first k subgroups of the phase; 'given': centre and sigma from an earlier study or a standard. */
  readonly limitsMode: 'baseline' | 'given';
  readonly baselineCount: string;
  readonly centre: string;
  readonly sigma: string;
}

export type PhaseField = 'reason' | 'startSampleId' | 'baselineCount' | 'centre' | 'sigma';

export function newPhaseForm(ch: Characteristic): PhaseForm {
  return { reason: '', startMode: 'now', startSampleId: '', limitsMode: 'baseline', baselineCount: String(ch.baselineSize), centre: '', sigma: '' };
}

/** What the form needs to know about the chart as it stands. */
export interface PhaseContext {
  readonly characteristic: Characteristic;
  /** This characteristic's phases as set up (any order). */
  readonly phases: readonly Phase[];
  /** The samples on the chart, oldest first (id and time taken). */
  readonly samples: readonly { readonly id: string; readonly takenAt: string }[];
  /** Index of the first point of the current (last) phase on the chart. */
  readonly currentPhaseStart: number;
  readonly now: number;
}

/** A phase's id: readable, and the same on every tablet for the same characteristic and number. */
export function phaseIdFor(characteristicId: string, number: number): string {
  const suffix = `:phase-${number}`;
  return characteristicId.slice(0, 64 - suffix.length) + suffix;
}

/**
 * The points a new phase may start at: after the first point of the current phase (a phase with
 * no points of its own would be replaced by the new one), newest first.
 */
export function startChoices(ctx: Pick<PhaseContext, 'samples' | 'currentPhaseStart'>): { id: string; takenAt: string; index: number }[] {
  return ctx.samples.map((s, index) => ({ id: s.id, takenAt: s.takenAt, index })).filter((s) => s.index > ctx.currentPhaseStart).reverse();
}

/**
 * The set-up entries for the new phase. A characteristic whose first limits were never written down
 * as a phase gets that phase 1 as well (from its first point), so the history has both sides of the change.
 */
export function phaseEntriesFromForm(form: PhaseForm, ctx: PhaseContext): FormResult<Phase[], PhaseField> {
  const errors: Partial<Record<PhaseField, string>> = {};
  const ch = ctx.characteristic;
  const own = ctx.phases.filter((p) => p.characteristicId === ch.id);
  const number = own.reduce((m, p) => Math.max(m, p.number), 0) + 1;
  let startsAt = new Date(ctx.now).toISOString();
  if (form.startMode === 'point') {
    const choice = startChoices(ctx).find((c) => c.id === form.startSampleId);
    if (!choice) errors.startSampleId = form.startSampleId ? 'A new phase must start after the first point of the current phase.' : 'Choose the point where the new phase starts.';
    else startsAt = new Date(Date.parse(choice.takenAt)).toISOString();
  }
  // A withdrawn phase keeps its number (ids stay unique) but no longer bounds where a new one may start.
  const latest = own.filter((p) => !p.withdrawn).reduce<Phase | undefined>((m, p) => (!m || p.number > m.number ? p : m), undefined);
  if (latest && latest.number > 1 && Date.parse(startsAt) <= Date.parse(latest.startsAt)) errors.startSampleId ??= 'A new phase must start after the current phase started.';

  let phase: Record<string, unknown> = { id: phaseIdFor(ch.id, number === 1 ? 2 : number), characteristicId: ch.id, number: number === 1 ? 2 : number, startsAt, reason: form.reason };
  phase = { ...phase, ...limitsFromForm(form, ch, errors) };
  const parsed = Phase.safeParse(phase);
  if (!parsed.success) Object.assign(errors, { ...fieldErrorsFrom<PhaseField>(parsed.error.issues, fieldOfPath), ...errors });
  if (Object.keys(errors).length || !parsed.success) return { ok: false, errors };

  const entries: Phase[] = [];
  if (own.length === 0) {
    const first = ctx.samples[0]?.takenAt ?? startsAt;
    entries.push({ id: phaseIdFor(ch.id, 1), characteristicId: ch.id, number: 1, startsAt: new Date(Date.parse(first)).toISOString(), reason: 'Limits as first set up' });
  }
  entries.push(parsed.data);
  return { ok: true, value: entries };
}

/**
 * The limits part of a phase as the form gives it: `{ baselineCount }` or `{ given }` (empty when a
 * field is wrong; its message is put in `errors`). Shared by the new-phase and the change-phase forms.
 */
export function limitsFromForm(
  form: Pick<PhaseForm, 'limitsMode' | 'baselineCount' | 'centre' | 'sigma'>, ch: Characteristic, errors: Partial<Record<PhaseField, string>>,
): { baselineCount?: number; given?: { centre: number; sigma: number } } {
  if (form.limitsMode === 'baseline') {
    const k = readNumber(form.baselineCount, true);
    if (!k.ok) errors.baselineCount = k.message;
    return k.ok && k.value !== undefined ? { baselineCount: k.value } : {};
  }
  const centre = readNumber(form.centre, true);
  if (!centre.ok) errors.centre = centre.message;
  if (isVariableChart(ch.chartType)) {
    const sigma = readNumber(form.sigma, true);
    if (!sigma.ok) errors.sigma = sigma.message;
    return centre.ok && sigma.ok && centre.value !== undefined && sigma.value !== undefined ? { given: { centre: centre.value, sigma: sigma.value } } : {};
  }
  if (!centre.ok || centre.value === undefined) return {};
  const sigma = attributeSigma(ch.chartType, centre.value);
  if (sigma === undefined) {
    errors.centre = ch.chartType === 'p' || ch.chartType === 'np' ? 'The proportion p̄ must lie between 0 and 1.' : 'The average count must be more than 0.';
    return {};
  }
  return { given: { centre: centre.value, sigma } };
}

export function fieldOfPhasePath(path: readonly PropertyKey[]): PhaseField | undefined {
  return fieldOfPath(path);
}

/**
 * The sigma stored with given attribute limits. The engine takes only the centre for attribute charts
 * (their sigma follows from it), but the schema wants a positive sigma: store the per-item value
 * computed from the definition, √(p̄(1−p̄)) for p and np, √c̄ or √ū for c and u.
 */
function attributeSigma(chart: Characteristic['chartType'], centre: number): number | undefined {
  if (chart === 'p' || chart === 'np') return centre > 0 && centre < 1 ? Math.sqrt(centre * (1 - centre)) : undefined;
  return centre > 0 ? Math.sqrt(centre) : undefined;
}

function fieldOfPath(path: readonly PropertyKey[]): PhaseField | undefined {
  const [head, sub] = path;
  if (head === 'reason') return 'reason';
  if (head === 'baselineCount') return 'baselineCount';
  if (head === 'given') return sub === 'sigma' ? 'sigma' : 'centre';
  if (head === 'startsAt') return 'startSampleId';
  return undefined;
}

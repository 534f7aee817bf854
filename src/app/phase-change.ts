import { Phase, isVariableChart, type Characteristic, type Role, type Sample } from '../schema';
import { buildChartSeries } from './analysis-input';
import type { FormResult } from './characteristic-form';
import { fieldErrorsFrom } from './form-issues';
import { fieldOfPhasePath, limitsFromForm, type PhaseField, type PhaseForm } from './phase-form';

/**
 * Correcting a phase already set up: a new version of the same phase record (same id) that carries
 * who changed it, when and why; or its withdrawal, with a required note. Nothing is overwritten
 * without trace: the server keeps every version, and a withdrawn phase stays in the limits history.
 */

/** Only quality engineers and admins change phases (the server checks it again). */
export const canChangePhases = (role: Role | undefined): boolean => role === 'engineer' || role === 'admin';

/** Phase 1 covers everything before the first change and cannot be moved or withdrawn; a withdrawn phase stays as it is. */
export const isChangeablePhase = (p: Phase): boolean => p.number > 1 && !p.withdrawn;

/** A phase as it stands on the chart: its points are [start, end) (0-based indexes). */
export interface PhaseSpan {
  readonly phase: Phase;
  readonly start: number;
  readonly end: number;
}

/** The phases that hold on the chart (withdrawn and superseded empty ones left out), with their points. Pure. */
export function phaseSpans(ch: Characteristic, phases: readonly Phase[], samples: readonly Sample[]): PhaseSpan[] {
  const series = buildChartSeries(ch, phases, samples);
  const byId = new Map(phases.map((p) => [p.id, p]));
  const spans: PhaseSpan[] = [];
  const inputs = series.input.phases ?? [];
  inputs.forEach((input, i) => {
    const phase = byId.get(series.phaseIds[i] ?? '');
    const next = inputs[i + 1];
    if (phase) spans.push({ phase, start: input.start, end: next ? next.start : samples.length });
  });
  return spans;
}

/** Changing a phase, as the engineer fills it in. `startSampleId` '' keeps the start as it is. */
export interface PhaseChangeForm extends Pick<PhaseForm, 'reason' | 'limitsMode' | 'baselineCount' | 'centre' | 'sigma'> {
  readonly startSampleId: string;
  /** Why the phase is being corrected (required). */
  readonly note: string;
}

export type PhaseChangeField = PhaseField | 'note';

export interface PhaseChangeContext {
  readonly characteristic: Characteristic;
  /** The characteristic's phases as set up, withdrawn ones included. */
  readonly phases: readonly Phase[];
  /** The samples on the chart, oldest first (corrections applied). */
  readonly samples: readonly Sample[];
  readonly now: number;
  /** The person making the change. */
  readonly by: string;
}

export function phaseChangeForm(phase: Phase, ch: Characteristic): PhaseChangeForm {
  return {
    reason: phase.reason, startSampleId: '', note: '',
    limitsMode: phase.given ? 'given' : 'baseline',
    baselineCount: String(phase.baselineCount ?? ch.baselineSize),
    centre: phase.given ? String(phase.given.centre) : '',
    sigma: phase.given ? String(phase.given.sigma) : '',
  };
}

/**
 * The points a phase may be moved to start at: after the first point of the phase before it and
 * before the first point of the phase after it, leaving out where it starts now. Oldest first.
 */
export function moveChoices(phase: Phase, ctx: Pick<PhaseChangeContext, 'characteristic' | 'phases' | 'samples'>): { id: string; takenAt: string; index: number }[] {
  const spans = phaseSpans(ctx.characteristic, ctx.phases, ctx.samples);
  const at = spans.findIndex((s) => s.phase.id === phase.id);
  const prev = spans[at - 1];
  const own = spans[at];
  if (at < 1 || !prev || !own) return [];
  const prevFirst = Date.parse(ctx.samples[prev.start]?.takenAt ?? prev.phase.startsAt);
  const floor = Math.max(prevFirst, Date.parse(prev.phase.startsAt));
  const out: { id: string; takenAt: string; index: number }[] = [];
  for (let i = prev.start + 1; i < own.end; i++) {
    const s = ctx.samples[i];
    if (s && i !== own.start && Date.parse(s.takenAt) > floor) out.push({ id: s.id, takenAt: s.takenAt, index: i });
  }
  return out;
}

const sameLimits = (a: Phase, b: Phase, ch: Characteristic): boolean =>
  (a.given && b.given ? a.given.centre === b.given.centre && a.given.sigma === b.given.sigma
    : !a.given && !b.given && (a.baselineCount ?? ch.baselineSize) === (b.baselineCount ?? ch.baselineSize));

/** The new version of `phase` the form describes, or the problems per field. Pure. */
export function phaseChangeFromForm(form: PhaseChangeForm, phase: Phase, ctx: PhaseChangeContext): FormResult<Phase, PhaseChangeField> {
  const errors: Partial<Record<PhaseChangeField, string>> = {};
  const ch = ctx.characteristic;
  if (!isChangeablePhase(phase)) return { ok: false, errors: { note: phase.withdrawn ? 'This phase was withdrawn; it cannot be changed.' : 'Phase 1 cannot be changed here.' } };
  let startsAt = phase.startsAt;
  if (form.startSampleId) {
    const choice = moveChoices(phase, ctx).find((c) => c.id === form.startSampleId);
    if (!choice) errors.startSampleId = 'The phase can only move to a point after the previous phase began and before the next one begins.';
    else startsAt = new Date(Date.parse(choice.takenAt)).toISOString();
  }
  const limits = limitsFromForm(form, ch, errors);
  const { baselineCount: _k, given: _g, ...kept } = phase;
  const note = form.note.trim();
  const was = { startsAt: phase.startsAt, reason: phase.reason, ...(phase.given ? { given: phase.given } : {}), ...(phase.baselineCount !== undefined ? { baselineCount: phase.baselineCount } : {}) };
  const correction = { at: new Date(ctx.now).toISOString(), by: ctx.by, note, was };
  const draft = { ...kept, ...limits, startsAt, reason: form.reason, corrections: [...(phase.corrections ?? []), correction] };
  const parsed = Phase.safeParse(draft);
  if (!parsed.success) {
    const byField = fieldErrorsFrom<PhaseChangeField>(parsed.error.issues, (path) => (path[0] === 'corrections' ? 'note' : fieldOfPhasePath(path)));
    Object.assign(errors, { ...byField, ...errors });
  }
  if (!note) errors.note = 'Say why the phase is being changed.';
  if (Object.keys(errors).length || !parsed.success) return { ok: false, errors };
  const next = parsed.data;
  if (next.reason === phase.reason && next.startsAt === phase.startsAt && sameLimits(next, phase, ch)) {
    return { ok: false, errors: { note: 'Nothing is changed yet: change the reason, the start or the limits first.' } };
  }
  return { ok: true, value: next };
}

/** The withdrawn version of `phase`, or why it cannot be. Pure. */
export function phaseWithdrawal(phase: Phase, note: string, ctx: Pick<PhaseChangeContext, 'now' | 'by'>): FormResult<Phase, 'note'> {
  if (!isChangeablePhase(phase)) return { ok: false, errors: { note: phase.withdrawn ? 'This phase is already withdrawn.' : 'Phase 1 cannot be withdrawn.' } };
  const text = note.trim();
  if (!text) return { ok: false, errors: { note: 'Say why the phase is withdrawn.' } };
  const parsed = Phase.safeParse({ ...phase, withdrawn: { at: new Date(ctx.now).toISOString(), by: ctx.by, note: text } });
  if (!parsed.success) return { ok: false, errors: { note: 'At most 400 characters.' } };
  return { ok: true, value: parsed.data };
}

// ---- What will change on the chart, in plain words (the confirmation before saving). ----

/** "point 600" or "points 600–712" (1-based, as the chart numbers them). */
export function pointRange(start: number, endExclusive: number): string {
  return endExclusive - start <= 1 ? `point ${start + 1}` : `points ${start + 1}–${endExclusive}`;
}

const num = (v: number): string => String(Number(v.toPrecision(6)));

function limitsText(p: Phase, ch: Characteristic): string {
  if (p.given) return isVariableChart(ch.chartType)
    ? `the given centre ${num(p.given.centre)} and sigma ${num(p.given.sigma)}` : `the given centre ${num(p.given.centre)}`;
  const k = p.baselineCount ?? ch.baselineSize;
  return `its first ${k} subgroup${k === 1 ? '' : 's'}`;
}

/** What starting `entries` (from phaseEntriesFromForm) will do to the chart. Pure. */
export function newPhaseConfirmation(entries: readonly Phase[], ctx: Pick<PhaseChangeContext, 'characteristic' | 'phases' | 'samples'>): string {
  const ch = ctx.characteristic;
  const added = entries[entries.length - 1];
  if (!added) return '';
  const ids = new Set(entries.map((e) => e.id));
  const after = phaseSpans(ch, [...ctx.phases.filter((p) => !ids.has(p.id)), ...entries], ctx.samples);
  const at = after.findIndex((s) => s.phase.id === added.id);
  const own = after[at];
  const prev = after[at - 1];
  const keep = prev && own && own.start > prev.start ? ` ${pointRange(prev.start, own.start).replace(/^p/, 'P')} keep phase ${prev.phase.number}'s limits.` : '';
  if (!own || own.start >= ctx.samples.length) {
    return added.given
      ? `Phase ${added.number} starts with the next sample: from then on points are judged against ${limitsText(added, ch)}.${keep}`
      : `Phase ${added.number} starts with the next sample: its limits will be computed from ${limitsText(added, ch)} (recomputed as they arrive until then).${keep}`;
  }
  const from = own.start + 1;
  if (added.given) return `Points from point ${from} on will be judged against ${limitsText(added, ch)} (phase ${added.number}).${keep}`;
  const k = added.baselineCount ?? ch.baselineSize;
  return `Limits from point ${from} on will be recomputed from the next ${k} subgroups (phase ${added.number}).${keep}`;
}

/** What saving `after` in place of `before` (a change or a withdrawal) will do to the chart, one sentence per effect. Pure. */
export function phaseChangeConfirmation(before: Phase, after: Phase, ctx: Pick<PhaseChangeContext, 'characteristic' | 'phases' | 'samples'>): string[] {
  const ch = ctx.characteristic;
  const spansBefore = phaseSpans(ch, ctx.phases, ctx.samples);
  const at = spansBefore.findIndex((s) => s.phase.id === before.id);
  const own = spansBefore[at];
  const prev = spansBefore[at - 1];
  const n = before.number;
  if (after.withdrawn) {
    if (!own || !prev || own.start >= own.end) return [`Phase ${n} will be withdrawn. It has no points, so the chart stays as it is.`];
    return [`Phase ${n} will be withdrawn: ${pointRange(own.start, own.end)} will be judged against phase ${prev.phase.number}'s limits.`];
  }
  const out: string[] = [];
  const spansAfter = phaseSpans(ch, ctx.phases.map((p) => (p.id === after.id ? after : p)), ctx.samples);
  const moved = spansAfter.find((s) => s.phase.id === after.id);
  if (own && moved && prev && moved.start !== own.start) {
    if (moved.start > own.start) out.push(`Phase ${n} will start at point ${moved.start + 1} instead of point ${own.start + 1}: ${pointRange(own.start, moved.start)} will be judged against phase ${prev.phase.number}'s limits.`);
    else out.push(`Phase ${n} will start at point ${moved.start + 1} instead of point ${own.start + 1}: ${pointRange(moved.start, own.start)} move from phase ${prev.phase.number} into phase ${n}.`);
  }
  if (!sameLimits(before, after, ch)) {
    const verb = after.given ? 'judged against' : 'recomputed from';
    out.push(`Phase ${n}'s limits will be ${verb} ${limitsText(after, ch)} instead of ${limitsText(before, ch)}.`);
  }
  if (after.reason !== before.reason) out.push(out.length ? `The reason will read “${after.reason}”.` : `Only the reason changes, to “${after.reason}”: the chart stays as it is.`);
  return out;
}

/**
 * The corrections of a phase in words, oldest first: when, who (by `nameOf`), why, and what each one
 * replaced ("reason was “…”; started at point 41; limits were from its first 15 subgroups"). Pure.
 */
export function correctionLines(phase: Phase, ch: Characteristic, nameOf: (personId: string) => string, formatTime: (iso: string) => string): string[] {
  const list = phase.corrections ?? [];
  return list.map((c, i) => {
    const after = list[i + 1]?.was ?? phase;
    const was: Phase = { ...phase, ...c.was, given: c.was.given, baselineCount: c.was.baselineCount };
    const parts: string[] = [];
    if (c.was.reason !== after.reason) parts.push(`reason was “${c.was.reason}”`);
    if (Date.parse(c.was.startsAt) !== Date.parse(after.startsAt)) parts.push(`started ${formatTime(c.was.startsAt)}`);
    if (!sameLimits(was, { ...phase, given: after.given, baselineCount: after.baselineCount }, ch)) parts.push(`limits were from ${limitsText(was, ch)}`);
    return `Corrected ${formatTime(c.at)} by ${nameOf(c.by)}: ${c.note}${parts.length ? ` (${parts.join('; ')})` : ''}`;
  });
}

/** A withdrawn phase's note in words: "Withdrawn <when> by <who>: <why>" (undefined for a phase in force). Pure. */
export function withdrawalLine(phase: Phase, nameOf: (personId: string) => string, formatTime: (iso: string) => string): string | undefined {
  const w = phase.withdrawn;
  return w ? `Withdrawn ${formatTime(w.at)} by ${nameOf(w.by)}: ${w.note}` : undefined;
}

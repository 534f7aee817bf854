import { describe, expect, it } from 'vitest';
import { buildChartSeries } from '../../src/app/analysis-input';
import { limitsHistory } from '../../src/app/limits-history';
import { analyze } from '../../src/engine';
import {
  canChangePhases, correctionLines, isChangeablePhase, moveChoices, newPhaseConfirmation, phaseChangeConfirmation, phaseChangeForm, phaseChangeFromForm,
  phaseSpans, phaseWithdrawal, pointRange, type PhaseChangeContext,
} from '../../src/app/phase-change';
import { newPhaseForm, phaseEntriesFromForm } from '../../src/app/phase-form';
import { Phase } from '../../src/schema';
import { T0, iso, makeCharacteristic, makePhase, sampleAt } from './helpers';

const HOUR = 3_600_000;
const ch = makeCharacteristic({ baselineSize: 20 });
// 60 samples one hour apart: phase 2 from point 21 (index 20), phase 3 from point 41 (index 40).
const samples = Array.from({ length: 60 }, (_, i) => sampleAt(i * 60, { id: `s${String(i).padStart(2, '0')}`, values: [i < 40 ? 10 + (i % 3) * 0.05 : 11 + (i % 3) * 0.05] }));
const p1 = makePhase({ id: 'ch-bore:phase-1', number: 1, startsAt: iso(T0), reason: 'Limits as first set up' });
const p2 = makePhase({ id: 'ch-bore:phase-2', number: 2, startsAt: iso(T0 + 20 * HOUR), reason: 'New insert grade' });
const p3 = makePhase({ id: 'ch-bore:phase-3', number: 3, startsAt: iso(T0 + 40 * HOUR), reason: 'Coolant changd', baselineCount: 15 });
const phases = [p1, p2, p3];
const NOW = T0 + 70 * HOUR;
const ctx = (over: Partial<PhaseChangeContext> = {}): PhaseChangeContext => ({ characteristic: ch, phases, samples, now: NOW, by: 'p-eng', ...over });

describe('a withdrawn phase and the engine input', () => {
  it('leaves a withdrawn phase out: its points fall to the phase before, as if it never started', () => {
    const withdrawn = { ...p3, withdrawn: { at: iso(NOW), by: 'p-eng', note: 'Started on the wrong characteristic' } };
    const series = buildChartSeries(ch, [p1, p2, withdrawn], samples);
    expect(series.phaseIds).toEqual(['ch-bore:phase-1', 'ch-bore:phase-2']);
    expect(series.input.phases).toEqual([{ start: 0, baselineCount: 20 }, { start: 20, baselineCount: 20 }]);
    // The same engine input as never having started phase 3.
    expect(series.input).toEqual(buildChartSeries(ch, [p1, p2], samples).input);
  });

  it('withdrawing the only later phase returns the chart to one phase', () => {
    const series = buildChartSeries(ch, [p1, { ...p2, withdrawn: { at: iso(NOW), by: 'p-eng', note: 'Mistake' } }], samples);
    const analysis = analyze(series.input);
    expect(analysis.phases).toHaveLength(1);
    expect(limitsHistory(analysis, series, [p1]).map((r) => r.number)).toEqual([1]);
  });

  it('a new phase after a withdrawn one takes the next number, and may start where the withdrawn one did', () => {
    const withdrawn = { ...p3, withdrawn: { at: iso(NOW), by: 'p-eng', note: 'Mistake' } };
    const form = { ...newPhaseForm(ch), reason: 'Coolant changed', startMode: 'point' as const, startSampleId: 's40' };
    const r = phaseEntriesFromForm(form, { characteristic: ch, phases: [p1, p2, withdrawn], samples, currentPhaseStart: 20, now: NOW });
    expect(r.ok && r.value.map((p) => [p.id, p.number, p.startsAt])).toEqual([['ch-bore:phase-4', 4, samples[40]!.takenAt]]);
  });

  it('phaseSpans gives each phase in force its points', () => {
    expect(phaseSpans(ch, phases, samples).map((s) => [s.phase.number, s.start, s.end])).toEqual([[1, 0, 20], [2, 20, 40], [3, 40, 60]]);
  });
});

describe('changing a phase', () => {
  it('is for engineers and admins, and for phases after the first that are not withdrawn', () => {
    expect(['operator', 'supervisor', 'engineer', 'admin'].map((r) => canChangePhases(r as never))).toEqual([false, false, true, true]);
    expect([p1, p2, { ...p2, withdrawn: { at: iso(NOW), by: 'x', note: 'y' } }].map(isChangeablePhase)).toEqual([false, true, false]);
  });

  it('corrects the reason as a new version of the same record, carrying who, when and why', () => {
    const r = phaseChangeFromForm({ ...phaseChangeForm(p3, ch), reason: 'Coolant changed', note: 'Typo in the reason' }, p3, ctx());
    const first = { at: iso(NOW), by: 'p-eng', note: 'Typo in the reason', was: { startsAt: p3.startsAt, reason: 'Coolant changd', baselineCount: 15 } };
    expect(r.ok && r.value).toEqual({ ...p3, reason: 'Coolant changed', corrections: [first] });
    expect(r.ok && Phase.safeParse(r.value).success).toBe(true);
    if (!r.ok) return;
    // A second correction keeps the first: the whole trail travels with the phase.
    const r2 = phaseChangeFromForm({ ...phaseChangeForm(r.value, ch), startSampleId: 's42', baselineCount: '20', note: 'Coolant was changed two hours later' }, r.value, ctx({ now: NOW + HOUR }));
    expect(r2.ok && r2.value.corrections).toEqual([first, { at: iso(NOW + HOUR), by: 'p-eng', note: 'Coolant was changed two hours later', was: { startsAt: p3.startsAt, reason: 'Coolant changed', baselineCount: 15 } }]);
    const names = (id: string) => (id === 'p-eng' ? 'Esme' : id);
    expect(r2.ok && correctionLines(r2.value, ch, names, (t) => t.slice(11, 16))).toEqual([
      'Corrected 06:00 by Esme: Typo in the reason (reason was “Coolant changd”)',
      'Corrected 07:00 by Esme: Coolant was changed two hours later (started 00:00; limits were from its first 15 subgroups)',
    ]);
  });

  it('needs a note, and a real change', () => {
    const noNote = phaseChangeFromForm({ ...phaseChangeForm(p3, ch), reason: 'Coolant changed' }, p3, ctx());
    expect(noNote.ok ? null : noNote.errors.note).toMatch(/why/);
    const same = phaseChangeFromForm({ ...phaseChangeForm(p3, ch), note: 'checking' }, p3, ctx());
    expect(same.ok ? null : same.errors.note).toMatch(/Nothing is changed/);
  });

  it('moves the start only between the phases around it, and switches to given limits', () => {
    const choices = moveChoices(p3, ctx()).map((c) => c.index);
    expect(choices[0]).toBe(21);
    expect(choices).not.toContain(40);
    expect(choices[choices.length - 1]).toBe(59);
    const r = phaseChangeFromForm({ ...phaseChangeForm(p3, ch), startSampleId: 's45', limitsMode: 'given', centre: '11.05', sigma: '0.04', note: 'Change was at 13:00' }, p3, ctx());
    expect(r.ok && r.value).toMatchObject({ startsAt: samples[45]!.takenAt, given: { centre: 11.05, sigma: 0.04 } });
    expect(r.ok && 'baselineCount' in r.value).toBe(false);
    const bad = phaseChangeFromForm({ ...phaseChangeForm(p3, ch), startSampleId: 's10', note: 'x' }, p3, ctx());
    expect(bad.ok ? null : bad.errors.startSampleId).toMatch(/after the previous phase/);
  });

  it('withdraws with a required note; phase 1 and a withdrawn phase cannot be', () => {
    expect(phaseWithdrawal(p3, '  ', ctx()).ok).toBe(false);
    const w = phaseWithdrawal(p3, 'Started by mistake', ctx());
    expect(w.ok && w.value).toEqual({ ...p3, withdrawn: { at: iso(NOW), by: 'p-eng', note: 'Started by mistake' } });
    expect(phaseWithdrawal(p1, 'x', ctx()).ok).toBe(false);
    expect(w.ok && phaseWithdrawal(w.value, 'again', ctx()).ok).toBe(false);
  });
});

describe('the confirmation text', () => {
  it('names the points of a withdrawn phase and the limits they will be judged against', () => {
    const w = phaseWithdrawal(p3, 'Started by mistake', ctx());
    expect(w.ok && phaseChangeConfirmation(p3, w.value, ctx())).toEqual(["Phase 3 will be withdrawn: points 41–60 will be judged against phase 2's limits."]);
    // A middle phase: its points go to phase 1, phase 3 stays.
    const w2 = phaseWithdrawal(p2, 'x', ctx());
    expect(w2.ok && phaseChangeConfirmation(p2, w2.value, ctx())).toEqual(["Phase 2 will be withdrawn: points 21–40 will be judged against phase 1's limits."]);
    const future = makePhase({ id: 'ch-bore:phase-4', number: 4, startsAt: iso(NOW) });
    const w4 = phaseWithdrawal(future, 'x', ctx());
    expect(w4.ok && phaseChangeConfirmation(future, w4.value, ctx({ phases: [...phases, future] }))).toEqual(['Phase 4 will be withdrawn. It has no points, so the chart stays as it is.']);
  });

  it('says how a moved start and new limits change the chart, and that a reason alone does not', () => {
    const later = { ...p3, startsAt: samples[45]!.takenAt, baselineCount: 20 };
    expect(phaseChangeConfirmation(p3, later, ctx())).toEqual([
      "Phase 3 will start at point 46 instead of point 41: points 41–45 will be judged against phase 2's limits.",
      "Phase 3's limits will be recomputed from its first 20 subgroups instead of its first 15 subgroups.",
    ]);
    const earlier = { ...p3, startsAt: samples[38]!.takenAt };
    expect(phaseChangeConfirmation(p3, earlier, ctx())).toEqual(['Phase 3 will start at point 39 instead of point 41: points 39–40 move from phase 2 into phase 3.']);
    expect(phaseChangeConfirmation(p3, { ...p3, reason: 'Coolant changed' }, ctx())).toEqual(['Only the reason changes, to “Coolant changed”: the chart stays as it is.']);
  });

  it('says from which point a new phase recomputes its limits', () => {
    const p4 = makePhase({ id: 'ch-bore:phase-4', number: 4, startsAt: samples[50]!.takenAt, baselineCount: 20 });
    expect(newPhaseConfirmation([p4], ctx())).toBe("Limits from point 51 on will be recomputed from the next 20 subgroups (phase 4). Points 41–50 keep phase 3's limits.");
    const given = { ...p4, baselineCount: undefined, given: { centre: 11, sigma: 0.05 } };
    expect(newPhaseConfirmation([given], ctx())).toBe("Points from point 51 on will be judged against the given centre 11 and sigma 0.05 (phase 4). Points 41–50 keep phase 3's limits.");
    const now = { ...p4, startsAt: iso(NOW) };
    expect(newPhaseConfirmation([now], ctx())).toMatch(/^Phase 4 starts with the next sample: its limits will be computed from its first 20 subgroups/);
    expect(pointRange(4, 5)).toBe('point 5');
  });
});

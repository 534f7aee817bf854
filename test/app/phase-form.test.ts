import { describe, expect, it } from 'vitest';
import { newPhaseForm, phaseEntriesFromForm, startChoices, type PhaseContext } from '../../src/app/phase-form';
import { T0, iso, makeCharacteristic, makePhase } from './helpers';

const ch = makeCharacteristic({ baselineSize: 20 });
const samples = Array.from({ length: 30 }, (_, i) => ({ id: `s${i}`, takenAt: iso(T0 + i * 3_600_000) }));
const NOW = T0 + 40 * 3_600_000;
const ctx = (over: Partial<PhaseContext> = {}): PhaseContext => ({ characteristic: ch, phases: [], samples, currentPhaseStart: 0, now: NOW, ...over });

describe('phaseEntriesFromForm()', () => {
  it('requires a reason', () => {
    const r = phaseEntriesFromForm(newPhaseForm(ch), ctx());
    expect(r.ok ? null : r.errors.reason).toBe('Required.');
  });

  it('writes phase 1 too when the characteristic has none yet, so both sides of the change are recorded', () => {
    const r = phaseEntriesFromForm({ ...newPhaseForm(ch), reason: 'New insert grade' }, ctx());
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.value.map((p) => [p.number, p.startsAt])).toEqual([[1, iso(T0)], [2, iso(NOW)]]);
    expect(r.value[1]).toMatchObject({ id: 'ch-bore:phase-2', reason: 'New insert grade', baselineCount: 20 });
  });

  it('starts at a chosen point, numbers after the last phase, and takes an edited baseline size', () => {
    const phases = [makePhase({ number: 1, startsAt: iso(T0) }), makePhase({ number: 2, startsAt: iso(T0 + 10 * 3_600_000) })];
    const form = { ...newPhaseForm(ch), reason: 'Coolant changed', startMode: 'point' as const, startSampleId: 's25', baselineCount: '12' };
    const r = phaseEntriesFromForm(form, ctx({ phases, currentPhaseStart: 10 }));
    expect(r.ok && r.value).toEqual([{ id: 'ch-bore:phase-3', characteristicId: 'ch-bore', number: 3, startsAt: iso(T0 + 25 * 3_600_000), reason: 'Coolant changed', baselineCount: 12 }]);
  });

  it('refuses a start at or before the current phase began', () => {
    const form = { ...newPhaseForm(ch), reason: 'x', startMode: 'point' as const, startSampleId: 's5' };
    const r = phaseEntriesFromForm(form, ctx({ currentPhaseStart: 10 }));
    expect(r.ok ? null : r.errors.startSampleId).toMatch(/after the first point of the current phase/);
    expect(startChoices({ samples, currentPhaseStart: 27 }).map((c) => c.id)).toEqual(['s29', 's28']);
  });

  it('takes given limits: centre and sigma for variable charts, a positive sigma required', () => {
    const base = { ...newPhaseForm(ch), reason: 'Limits from the capability study', limitsMode: 'given' as const };
    const ok = phaseEntriesFromForm({ ...base, centre: '10,02', sigma: '0.05' }, ctx());
    expect(ok.ok && ok.value[1]!.given).toEqual({ centre: 10.02, sigma: 0.05 });
    const bad = phaseEntriesFromForm({ ...base, centre: '10', sigma: '0' }, ctx());
    expect(bad.ok ? null : bad.errors.sigma).toBe('Must be more than 0.');
  });

  it('takes only the centre for attribute charts, storing the sigma that follows from it', () => {
    const p = makeCharacteristic({ chartType: 'p', subgroupSize: 50 });
    const r = phaseEntriesFromForm({ ...newPhaseForm(p), reason: 'New supplier', limitsMode: 'given', centre: '0.04' }, ctx({ characteristic: p }));
    // computed from the definition: sigma of one item = √(p̄(1−p̄))
    expect(r.ok && r.value[1]!.given).toEqual({ centre: 0.04, sigma: Math.sqrt(0.04 * 0.96) });
    const bad = phaseEntriesFromForm({ ...newPhaseForm(p), reason: 'x', limitsMode: 'given', centre: '1.2' }, ctx({ characteristic: p }));
    expect(bad.ok ? null : bad.errors.centre).toMatch(/between 0 and 1/);
  });
});

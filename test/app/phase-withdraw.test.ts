/** Correcting and withdrawing a phase against the real sync server: a second tablet follows after its sync. */
import { describe, expect, it } from 'vitest';
import { phaseChangeForm, phaseChangeFromForm, phaseWithdrawal } from '../../src/app/phase-change';
import { newPhaseForm, phaseEntriesFromForm } from '../../src/app/phase-form';
import type { SetupRecord } from '../../src/schema';
import { CHARACTERISTICS } from '../server/fixtures';
import { enrolled, seedBaseline, useServerPerTest, type Tablet } from './tablet-harness';

const server = useServerPerTest();
const ch = CHARACTERISTICS[0]!;
const asRecord = (p: { id: string }): SetupRecord => ({ kind: 'phase', id: p.id, body: p } as SetupRecord);

async function phasesOn(t: Tablet): Promise<number[]> {
  t.app.actions.open({ name: 'characteristic', characteristicId: 'ch-len' });
  await t.settle();
  return t.app.getState().views['ch-len']!.analysis.phases.map((p) => p.start);
}

describe('correcting and withdrawing a phase', () => {
  it('an engineer withdraws a phase; a second tablet sees the chart return to one phase after its sync', async () => {
    const eng = await enrolled();
    await seedBaseline(eng);
    expect(await eng.app.actions.signIn('ada', '3456')).toBe(true); // admin: may do what an engineer may
    const other = await enrolled();
    expect(await other.app.actions.signIn('odile', '1234')).toBe(true);

    // Phase 2 from point 16, seen on both tablets.
    expect(await phasesOn(eng)).toEqual([0]);
    const view = eng.app.getState().views['ch-len']!;
    const form = { ...newPhaseForm(ch), reason: 'Fixture replcd', startMode: 'point' as const, startSampleId: view.series.samples[15]!.id, baselineCount: '4' };
    const started = phaseEntriesFromForm(form, { characteristic: ch, phases: eng.app.getState().setup.phases, samples: view.series.samples, currentPhaseStart: 0, now: eng.clock.t });
    if (!started.ok) throw new Error(JSON.stringify(started.errors));
    expect(await eng.app.actions.saveSetup(started.value.map(asRecord), 'The new phase')).toBe(true);
    expect(await phasesOn(eng)).toEqual([0, 15]);
    await other.app.actions.syncNow();
    expect(await phasesOn(other)).toEqual([0, 15]);

    // The reason corrected: a new version of the same record, the chart unchanged.
    const ctx = () => ({ characteristic: ch, phases: eng.app.getState().setup.phases, samples: eng.app.getState().views['ch-len']!.series.samples, now: eng.clock.t, by: 'p-adm' });
    const phase2 = () => eng.app.getState().setup.phases.find((p) => p.id === 'ch-len:phase-2')!;
    const corrected = phaseChangeFromForm({ ...phaseChangeForm(phase2(), ch), reason: 'Fixture replaced', note: 'Typo' }, phase2(), ctx());
    if (!corrected.ok) throw new Error(JSON.stringify(corrected.errors));
    expect(await eng.app.actions.saveSetup([asRecord(corrected.value)], 'The correction')).toBe(true);
    expect(await phasesOn(eng)).toEqual([0, 15]);
    expect(phase2()).toMatchObject({ reason: 'Fixture replaced', corrections: [{ by: 'p-adm', note: 'Typo', was: { reason: 'Fixture replcd', baselineCount: 4 } }] });

    // Withdrawn: one phase again, on this tablet at once and on the other after its sync.
    const withdrawn = phaseWithdrawal(phase2(), 'Started on the wrong characteristic', ctx());
    if (!withdrawn.ok) throw new Error(JSON.stringify(withdrawn.errors));
    expect(await eng.app.actions.saveSetup([asRecord(withdrawn.value)], 'The withdrawal')).toBe(true);
    expect(await phasesOn(eng)).toEqual([0]);
    await other.app.actions.syncNow();
    await other.settle();
    expect(await phasesOn(other)).toEqual([0]);
    // The withdrawn phase is still held, with its note, for the limits history.
    expect(other.app.getState().setup.phases.find((p) => p.id === 'ch-len:phase-2')).toMatchObject({ reason: 'Fixture replaced', withdrawn: { note: 'Started on the wrong characteristic' } });
    expect((await server().store.getSetup('phase', 'ch-len:phase-2'))?.body.withdrawn?.by).toBe('p-adm');

    // The operator on the second tablet cannot withdraw (refused before anything is sent).
    const back = { ...withdrawn.value, withdrawn: undefined };
    expect(await other.app.actions.saveSetup([asRecord(back)], 'The change')).toBe(false);
    expect(other.app.getState().error).toMatch(/only a quality engineer or an admin/);
  });
});

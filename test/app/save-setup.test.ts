/** saveSetup(): set-up changes from a tablet reach the real sync server and come back through the pull. */
import { describe, expect, it } from 'vitest';
import { characteristicFromForm, newCharacteristicForm } from '../../src/app/characteristic-form';
import { newPhaseForm, phaseEntriesFromForm } from '../../src/app/phase-form';
import type { SetupRecord } from '../../src/schema';
import { CHARACTERISTICS } from '../server/fixtures';
import { enrolled, HOUR, seedBaseline, signedIn, useServerPerTest } from './tablet-harness';

const server = useServerPerTest();

function newCharacteristic(): SetupRecord {
  const r = characteristicFromForm({ ...newCharacteristicForm('ch-width', 'st-1'), name: 'Width', unit: 'mm', reactionPlan: ['Re-measure'] });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return { kind: 'characteristic', id: r.value.id, body: r.value };
}

describe('saveSetup()', () => {
  it('sends an engineer-level change with the session, and the tablet shows it after the pull', async () => {
    const t = await signedIn('ada', '3456'); // admin: may do what an engineer may
    expect(await t.app.actions.saveSetup([newCharacteristic()], 'The new characteristic “Width”')).toBe(true);
    await t.settle();
    expect((await server().store.getSetup('characteristic', 'ch-width'))?.body.name).toBe('Width');
    expect(t.app.getState().setup.characteristics.map((c) => c.id)).toContain('ch-width');
    expect(t.app.getState().toast).toBe('The new characteristic “Width” saved on the site server');
    expect(t.app.getState().error).toBeUndefined();
  });

  it('refuses an operator on the tablet, before anything is sent', async () => {
    const t = await signedIn('odile', '1234');
    expect(await t.app.actions.saveSetup([newCharacteristic()], 'The new characteristic')).toBe(false);
    expect(t.app.getState().error).toMatch(/only a quality engineer or an admin/);
    expect(await server().store.getSetup('characteristic', 'ch-width')).toBeUndefined();
  });

  it('says plainly that set-up needs a connection when the server cannot be reached', async () => {
    const t = await signedIn('ada', '3456');
    t.net.online = false;
    expect(await t.app.actions.saveSetup([newCharacteristic()], 'The new characteristic')).toBe(false);
    expect(t.app.getState().error).toMatch(/NOT saved: set-up changes need a connection .* the form keeps what you typed/);
    t.net.online = true;
    expect(await server().store.getSetup('characteristic', 'ch-width')).toBeUndefined();
  });

  it('asks for an online sign-in when the person signed in offline (no server session)', async () => {
    const t = await signedIn('ada', '3456');
    t.app.actions.signOut();
    t.net.online = false;
    expect(await t.app.actions.signIn('ada', '3456')).toBe(true); // against the offline verifier
    t.net.online = true;
    expect(await t.app.actions.saveSetup([newCharacteristic()], 'The new characteristic')).toBe(false);
    expect(t.app.getState().error).toMatch(/sign-in made while connected/);
  });

  it('refuses an invalid entry with the schema’s words and sends nothing', async () => {
    const t = await signedIn('ada', '3456');
    const bad = { kind: 'line', id: 'ln-x', body: { id: 'ln-x', siteId: 'site-t', name: '' } } as SetupRecord;
    expect(await t.app.actions.saveSetup([bad], 'The new line')).toBe(false);
    expect(t.app.getState().error).toMatch(/The new line was NOT saved: .*name/s);
  });

  it('starts a new phase with its own baseline size: the chart has two phases after the pull', async () => {
    const t = await enrolled();
    await seedBaseline(t); // before signing in, as the records reach IndexedDB behind the app's back
    expect(await t.app.actions.signIn('ada', '3456')).toBe(true);
    t.app.actions.open({ name: 'characteristic', characteristicId: 'ch-len' });
    await t.settle();
    const view = t.app.getState().views['ch-len']!;
    expect(view.analysis.phases).toHaveLength(1);
    const ch = CHARACTERISTICS[0]!;
    const form = { ...newPhaseForm(ch), reason: 'Fixture replaced', startMode: 'point' as const, startSampleId: view.series.samples[15]!.id, baselineCount: '4' };
    const r = phaseEntriesFromForm(form, { characteristic: ch, phases: t.app.getState().setup.phases, samples: view.series.samples, currentPhaseStart: 0, now: t.clock.t });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(await t.app.actions.saveSetup(r.value.map((p): SetupRecord => ({ kind: 'phase', id: p.id, body: p })), 'The new phase')).toBe(true);
    await t.settle();
    const after = t.app.getState().views['ch-len']!;
    expect(after.analysis.phases.map((p) => [p.start, p.source, p.baselineCount])).toEqual([[0, 'baseline', 15], [15, 'baseline', 4]]);
    expect((await server().store.getSetup('phase', 'ch-len:phase-2'))?.body).toMatchObject({ number: 2, reason: 'Fixture replaced', baselineCount: 4 });
    expect(t.clock.t - Date.parse(view.series.samples[15]!.takenAt)).toBeLessThan(21 * HOUR);
  });
});

/**
 * The app controller end to end: createPlumblineApp on a fake IndexedDB, with the real api client and
 * sync engine talking to the real sync server (see tablet-harness.ts).
 */
import { describe, expect, it } from 'vitest';
import type { PlumblineApp } from '../../src/app/create-app';
import {
  getAcksForCharacteristic,
  getCurrentSamplesForCharacteristic,
  getDeviceIdentity,
  getDeviceRecord,
  getOutboxRow,
  getResponsesForCharacteristic,
  getSignedInPerson,
} from '../../src/store';
import { verifyOffline } from '../../src/sync/offline-verifier';
import { api, enrolDevice, signIn as serverSignIn, SITE } from '../server/fixtures';
import { BASELINE } from './helpers';
import { enrolled, fromAnotherTablet, HOUR, seedBaseline, signedIn, tablet, useServerPerTest, withSignal } from './tablet-harness';

const server = useServerPerTest();

describe('start and enrolment', () => {
  it('a tablet with no identity starts in the enrol stage', async () => {
    const t = await tablet();
    await t.app.start();
    expect(t.app.getState()).toMatchObject({ stage: 'enrol', signedIn: [] });
    expect(t.app.getState().device).toBeUndefined();
  });

  it('enrolling stores the identity, pulls the set-up and moves to sign-in', async () => {
    const t = await enrolled();
    const s = t.app.getState();
    expect(s.stage).toBe('sign-in');
    expect(s.error).toBeUndefined();
    expect(s.device).toMatchObject({ deviceName: 'Press 4 tablet', siteId: SITE });
    expect(await getDeviceIdentity(t.db)).toMatchObject({ deviceId: s.device!.deviceId, siteId: SITE, deviceName: 'Press 4 tablet' });
    expect(s.setup.characteristics.map((c) => c.id).sort()).toEqual(['ch-def', 'ch-len']);
    expect(s.stationId).toBe('st-1');
  });

  it('a wrong code keeps the enrol stage and says why', async () => {
    const t = await tablet();
    await t.app.start();
    expect(await t.app.actions.enrol('NOT-A-CODE', 'Press 4 tablet')).toBe(false);
    expect(t.app.getState().stage).toBe('enrol');
    expect(t.app.getState().error).toBeTruthy();
    expect(await getDeviceIdentity(t.db)).toBeUndefined();
  });

  it('enrolling without a network says the network is needed once', async () => {
    const t = await tablet();
    await t.app.start();
    t.net.online = false;
    expect(await t.app.actions.enrol('ANY', 'Press 4 tablet')).toBe(false);
    expect(t.app.getState().error).toMatch(/cannot be reached.*needs the network once/);
  });

  it('after a restart an enrolled tablet goes straight to sign-in, and a remembered person straight to the board', async () => {
    const first = await signedIn();
    await first.settle();
    first.app.stop();
    const again = await tablet({ db: first.db });
    await again.app.start();
    expect(again.app.getState()).toMatchObject({ stage: 'sign-in', signedIn: [expect.objectContaining({ id: 'p-op' })] });
    const resumed = await tablet({ db: first.db, session: first.session });
    await resumed.app.start();
    expect(resumed.app.getState()).toMatchObject({ stage: 'ready', person: { id: 'p-op', role: 'operator' } });
  });
});

describe('sign-in', () => {
  it('online: the person is signed in and the offline verifier is cached on the tablet', async () => {
    const t = await signedIn();
    const s = t.app.getState();
    expect(s).toMatchObject({ stage: 'ready', person: { id: 'p-op', login: 'odile', role: 'operator' }, screen: { name: 'board' } });
    expect(s.signedIn.map((p) => p.id)).toEqual(['p-op']);
    expect(Object.keys(s.views).sort()).toEqual(['ch-def', 'ch-len']);
    const cached = await getSignedInPerson(t.db, 'odile');
    expect(cached).toMatchObject({ personId: 'p-op', role: 'operator' });
    expect(await verifyOffline('1234', cached!.offlineVerifier)).toBe(true);
    expect(t.session.map.get('plumbline.person')).toBe('p-op');
  });

  it('online with a wrong PIN: refused with a clear error', async () => {
    const t = await enrolled();
    expect(await t.app.actions.signIn('odile', '9999')).toBe(false);
    expect(t.app.getState()).toMatchObject({ stage: 'sign-in', error: 'Login or PIN is not right.' });
    expect(await getSignedInPerson(t.db, 'odile')).toBeUndefined();
  });

  it('offline: the right PIN works against the cached verifier, a wrong one fails clearly', async () => {
    const t = await signedIn();
    await t.settle();
    t.app.actions.signOut();
    expect(t.app.getState().stage).toBe('sign-in');
    t.net.online = false;

    expect(await t.app.actions.signIn('odile', '0000')).toBe(false);
    expect(t.app.getState()).toMatchObject({ stage: 'sign-in', error: 'Login or PIN is not right.' });

    expect(await t.app.actions.signIn('odile', '1234')).toBe(true);
    expect(t.app.getState()).toMatchObject({ stage: 'ready', person: { id: 'p-op' } });
    expect(t.app.getState().error).toBeUndefined();
  });

  it('offline: someone who never signed in on this tablet is told why they cannot', async () => {
    const t = await enrolled();
    t.net.online = false;
    expect(await t.app.actions.signIn('sven', '2345')).toBe(false);
    expect(t.app.getState().error).toBe('The server cannot be reached, and this person has not signed in on this tablet before.');
  });
});

describe('record', () => {
  it('saves an XmR sample and its outbox row, and the sync engine sends it', async () => {
    const t = await signedIn();
    t.clock.t += 5 * 60_000;
    expect(await t.app.actions.record('ch-len', { values: [10.02], lot: 'L-17', comment: 'after tool change' })).toBe(true);
    const [saved] = await getCurrentSamplesForCharacteristic(t.db, 'ch-len');
    expect(saved).toMatchObject({
      kind: 'sample', characteristicId: 'ch-len', values: [10.02], lot: 'L-17', comment: 'after tool change',
      recordedBy: 'p-op', deviceId: t.app.getState().device!.deviceId, takenAt: new Date(t.clock.t).toISOString(),
    });
    expect((await getOutboxRow(t.db, saved!.id))?.kind).toBe('sample');
    const s = t.app.getState();
    expect(s.error).toBeUndefined();
    expect(s.prompt).toBeUndefined();
    expect(s.toast).toBe('Saved on this tablet');
    expect(s.views['ch-len']!.series.sampleIds).toEqual([saved!.id]);
    await t.settle();
    expect((await getOutboxRow(t.db, saved!.id))?.state).toBe('acked');
  });

  it('a value beyond the limits after a full baseline opens the prompt with the rule', async () => {
    const { t, prompt } = await withSignal();
    const s = t.app.getState();
    const view = s.views['ch-len']!;
    const newest = view.series.sampleIds[view.series.sampleIds.length - 1]!;
    expect(prompt.characteristicId).toBe('ch-len');
    expect(prompt.sampleId).toBe(newest);
    expect(prompt.signals.length).toBeGreaterThan(0);
    expect(prompt.signals.every((x) => x.index === 20)).toBe(true);
    expect(prompt.signals.find((x) => !x.companion)).toMatchObject({ rule: 'we1', side: 'above' });
    expect(s.toast).toBe('Saved on this tablet — a run rule fired');
    expect(view.groups[0]).toMatchObject({ sampleId: newest, state: 'unanswered' });
  });

  it('an in-control value after the baseline does not prompt', async () => {
    const t = await enrolled();
    await seedBaseline(t);
    expect(await t.app.actions.signIn('odile', '1234')).toBe(true);
    expect(await t.app.actions.record('ch-len', { values: [10.01] })).toBe(true);
    expect(t.app.getState().prompt).toBeUndefined();
  });

  it('prompts only for the sample just saved, even when another tablet’s later-dated sample is the newest point', async () => {
    const t = await enrolled();
    await seedBaseline(t);
    expect(await t.app.actions.signIn('odile', '1234')).toBe(true);
    // A tablet whose clock runs 10 minutes ahead sent a length far above the limits: it fires WE1 and is the newest point.
    await fromAnotherTablet(t, { characteristicId: 'ch-len', takenAt: new Date(t.clock.t + 10 * 60_000).toISOString(), values: [11] });
    expect(await t.app.actions.record('ch-len', { values: [10.01] })).toBe(true);
    const s = t.app.getState();
    expect(s.views['ch-len']!.series.sampleIds).toHaveLength(22);
    expect(s.prompt).toBeUndefined(); // our 10.01 is in control
    expect(s.toast).toBe('Saved on this tablet');
    // A value of ours that does fire is prompted for, with its own signals.
    expect(await t.app.actions.record('ch-len', { values: [9] })).toBe(true);
    const prompt = t.app.getState().prompt!;
    const at = t.app.getState().views['ch-len']!.series.sampleIds.indexOf(prompt.sampleId);
    expect(at).toBe(21);
    expect(prompt.signals.every((x) => x.index === at)).toBe(true);
    expect(prompt.signals.find((x) => !x.companion)).toMatchObject({ rule: 'we1', side: 'below' });
  });

  it('an attribute sample keeps its count and quantity inspected', async () => {
    const t = await signedIn();
    expect(await t.app.actions.record('ch-def', { count: 3, inspected: 120 })).toBe(true);
    const [saved] = await getCurrentSamplesForCharacteristic(t.db, 'ch-def');
    expect(saved).toMatchObject({ count: 3, inspected: 120 });
    expect(saved!.values).toBeUndefined();
    expect(t.app.getState().views['ch-def']!.series.input.subgroups).toEqual([{ count: 3, size: 120, excluded: false }]);
  });

  it('invalid input: state.error says the sample was not saved, record returns false and does not throw', async () => {
    const t = await signedIn();
    await expect(t.app.actions.record('ch-len', { values: [Number.NaN] })).resolves.toBe(false);
    expect(t.app.getState().error).toMatch(/^The sample was NOT saved: /);
    expect(await getCurrentSamplesForCharacteristic(t.db, 'ch-len')).toEqual([]);
    // The next good save clears the error.
    expect(await t.app.actions.record('ch-len', { values: [10] })).toBe(true);
    expect(t.app.getState().error).toBeUndefined();
  });

  it('does nothing before anyone has signed in', async () => {
    const t = await enrolled();
    expect(await t.app.actions.record('ch-len', { values: [10] })).toBe(false);
    expect(await getCurrentSamplesForCharacteristic(t.db, 'ch-len')).toEqual([]);
  });
});

describe('answer, postpone, acknowledge', () => {
  it('answer() saves a response whose snapshot freezes the rule, the limits and the samples', async () => {
    const { t, prompt } = await withSignal();
    const view = t.app.getState().views['ch-len']!;
    const point = view.analysis.points[20]!;
    t.clock.t += 2 * 60_000;
    const ok = await t.app.actions.answer(prompt, { whatHappened: 'Bar stock changed', causeCategory: 'Material', cause: 'New supplier', action: 'Stop and call the setter.' });
    expect(ok).toBe(true);
    const [response] = await getResponsesForCharacteristic(t.db, 'ch-len');
    expect(response).toMatchObject({
      kind: 'response', characteristicId: 'ch-len', sampleId: prompt.sampleId, respondedBy: 'p-op',
      whatHappened: 'Bar stock changed', causeCategory: 'Material', cause: 'New supplier', action: 'Stop and call the setter.',
      respondedAt: new Date(t.clock.t).toISOString(),
    });
    const main = response!.signals.find((x) => x.sampleIds.length === 1)!;
    expect(main).toMatchObject({ rule: 'we1', centre: point.centre, ucl: point.ucl, lcl: point.lcl, sampleIds: [prompt.sampleId] });
    const mr = response!.signals.find((x) => x.sampleIds.length === 2);
    if (mr) expect(mr).toMatchObject({ centre: point.companion!.centre, ucl: point.companion!.ucl, sampleIds: [view.series.sampleIds[19], prompt.sampleId] });
    expect((await getOutboxRow(t.db, response!.id))?.kind).toBe('response');
    const s = t.app.getState();
    expect(s.prompt).toBeUndefined();
    expect(s.toast).toBe('Answer saved on this tablet');
    expect(s.views['ch-len']!.groups[0]).toMatchObject({ sampleId: prompt.sampleId, state: 'answered' });
  });

  it('answer() snapshots the right samples even when an earlier sample arrived after the prompt opened', async () => {
    const { t, prompt } = await withSignal();
    // Another tablet's sample, taken before all of ours, comes down with a sync: every index shifts by one.
    await t.settle();
    await fromAnotherTablet(t, { characteristicId: 'ch-len', takenAt: new Date(t.clock.t - 30 * HOUR).toISOString(), values: [10] });
    const view = t.app.getState().views['ch-len']!;
    expect(view.series.sampleIds.indexOf(prompt.sampleId)).toBe(21);
    expect(await t.app.actions.answer(prompt, { whatHappened: 'Chip on the insert', causeCategory: 'Machine', action: 'Stop and call the setter.' })).toBe(true);
    const [response] = await getResponsesForCharacteristic(t.db, 'ch-len');
    const main = response!.signals.find((x) => x.sampleIds.length === 1)!;
    expect(main.sampleIds).toEqual([prompt.sampleId]);
    expect(main.ucl).toBe(view.analysis.points[21]!.ucl);
    for (const snap of response!.signals) expect(snap.sampleIds[snap.sampleIds.length - 1]).toBe(prompt.sampleId);
  });

  it('postpone() closes the prompt but the signal stays unanswered; it can be reopened', async () => {
    const { t, prompt } = await withSignal();
    t.app.actions.postpone();
    let s = t.app.getState();
    expect(s.prompt).toBeUndefined();
    expect(s.toast).toMatch(/stays open/);
    t.app.actions.open({ name: 'board' });
    await t.settle();
    s = t.app.getState();
    expect(s.views['ch-len']!.groups.find((g) => g.sampleId === prompt.sampleId)?.state).toBe('unanswered');
    expect(await getResponsesForCharacteristic(t.db, 'ch-len')).toEqual([]);
    t.app.actions.reopenPrompt('ch-len', prompt.sampleId);
    expect(t.app.getState().prompt).toMatchObject({ characteristicId: 'ch-len', sampleId: prompt.sampleId });
  });

  it('acknowledge() is refused for an operator and allowed for a supervisor', async () => {
    const { t, prompt } = await withSignal();
    expect(await t.app.actions.answer(prompt, { whatHappened: 'Chip on the insert', causeCategory: 'Machine', action: 'Stop and call the setter.' })).toBe(true);
    const [response] = await getResponsesForCharacteristic(t.db, 'ch-len');

    expect(await t.app.actions.acknowledge('ch-len', response!.id)).toBe(false);
    expect(t.app.getState().error).toBe('Only a supervisor, engineer or admin can sign off a signal.');
    expect(await getAcksForCharacteristic(t.db, 'ch-len')).toEqual([]);

    t.app.actions.addPerson();
    expect(await t.app.actions.signIn('sven', '2345')).toBe(true);
    expect(t.app.getState().person?.role).toBe('supervisor');
    expect(t.app.getState().signedIn.map((p) => p.id).sort()).toEqual(['p-op', 'p-sup']);
    expect(await t.app.actions.acknowledge('ch-len', response!.id, 'Setter confirmed')).toBe(true);
    const [ack] = await getAcksForCharacteristic(t.db, 'ch-len');
    expect(ack).toMatchObject({ kind: 'ack', responseId: response!.id, by: 'p-sup', note: 'Setter confirmed' });
    expect(t.app.getState().views['ch-len']!.groups[0]).toMatchObject({ state: 'closed', ack: { id: ack!.id } });
    await t.settle();
    expect((await getOutboxRow(t.db, ack!.id))?.state).toBe('acked');
  });
});

describe('records the engine cannot chart', () => {
  it('record() refuses an entry that does not fit the chart, before anything is saved', async () => {
    const t = await signedIn();
    const cases: [string, Parameters<PlumblineApp['actions']['record']>[1], RegExp][] = [
      ['ch-len', {}, /Length is measured/],
      ['ch-len', { count: 2 }, /Length is measured/],
      ['ch-def', { values: [1] }, /Defectives is counted/],
      ['ch-def', { count: 3 }, /quantity inspected/],
      ['ch-def', { count: 150, inspected: 100 }, /More nonconforming items \(150\) than items inspected \(100\)/],
    ];
    for (const [id, entry, message] of cases) {
      await expect(t.app.actions.record(id, entry)).resolves.toBe(false);
      expect(t.app.getState().error).toMatch(/^The sample was NOT saved: /);
      expect(t.app.getState().error).toMatch(message);
    }
    expect(await getCurrentSamplesForCharacteristic(t.db, 'ch-len')).toEqual([]);
    expect(await getCurrentSamplesForCharacteristic(t.db, 'ch-def')).toEqual([]);
  });

  it('a stored sample the engine refuses (e.g. from another tablet) empties that chart with a warning; the rest keeps working', async () => {
    const t = await signedIn();
    await t.settle();
    // Valid for the schema, and the server takes it, but not an individuals chart's: two values in one subgroup.
    await fromAnotherTablet(t, { characteristicId: 'ch-len', takenAt: new Date(t.clock.t - HOUR).toISOString(), values: [10, 11] });
    expect(await t.app.actions.record('ch-def', { count: 2, inspected: 50 })).toBe(true);
    await t.settle();
    const s = t.app.getState();
    expect(s.views['ch-def']!.analysis.points).toHaveLength(1);
    expect(s.views['ch-len']!.analysis.points).toEqual([]);
    expect(s.views['ch-len']!.analysis.warnings.join(' ')).toMatch(/cannot be drawn/);
  });
});

describe('offline first', () => {
  it('offline, a sample is saved on the tablet and counted as waiting; back online it is sent', async () => {
    const t = await signedIn();
    await t.settle();
    t.net.online = false;
    expect(await t.app.actions.record('ch-len', { values: [10.03] })).toBe(true);
    await t.settle();
    const [saved] = await getCurrentSamplesForCharacteristic(t.db, 'ch-len');
    expect((await getOutboxRow(t.db, saved!.id))?.state).toBe('pending');
    expect(t.app.getState().sync).toMatchObject({ state: 'offline', pending: 1 });
    expect(t.app.getState().views['ch-len']!.series.sampleIds).toEqual([saved!.id]);

    t.net.online = true;
    t.clock.t += 10 * 60_000; // past any backoff
    await t.app.actions.syncNow();
    await t.settle();
    expect((await getOutboxRow(t.db, saved!.id))?.state).toBe('acked');
    expect(t.app.getState().sync).toMatchObject({ state: 'idle', pending: 0 });
  });
});

describe('people and navigation', () => {
  it('signing out forgets the person and closes an open prompt; the tablet still knows who signed in here', async () => {
    const { t } = await withSignal();
    t.app.actions.signOut();
    const s = t.app.getState();
    expect(s.stage).toBe('sign-in');
    expect(s.person).toBeUndefined();
    expect(s.prompt).toBeUndefined();
    expect(t.session.map.has('plumbline.person')).toBe(false);
    expect(s.signedIn.map((p) => p.id)).toEqual(['p-op']);
  });

  it('open() moves between screens and clears an error; selectStation() remembers the station', async () => {
    const t = await signedIn();
    await t.app.actions.record('ch-len', { values: [Number.NaN] });
    expect(t.app.getState().error).toBeDefined();
    t.app.actions.open({ name: 'characteristic', characteristicId: 'ch-len' });
    expect(t.app.getState()).toMatchObject({ screen: { name: 'characteristic', characteristicId: 'ch-len' } });
    expect(t.app.getState().error).toBeUndefined();
    t.app.actions.selectStation('st-1');
    expect(t.app.getState()).toMatchObject({ stationId: 'st-1', screen: { name: 'board' } });
    await t.settle();
  });

  it('an inactive person cannot sign in, and is told why once the PIN is right', async () => {
    const t = await enrolled();
    expect(await t.app.actions.signIn('gone', '4567')).toBe(false);
    expect(t.app.getState()).toMatchObject({ stage: 'sign-in', error: "Gone Test's access to this site has been withdrawn by an administrator; ask the site admin if this is a mistake." });
    expect(await t.app.actions.signIn('gone', '9999')).toBe(false);
    expect(t.app.getState().error).toBe('Login or PIN is not right.');
  });

  it('a tablet an administrator has withdrawn is told so, not that the PIN is wrong', async () => {
    const t = await enrolled();
    const adminTablet = await enrolDevice(server(), 'Office tablet');
    const session = await serverSignIn(server(), adminTablet.deviceToken, 'ada', '3456');
    const res = await api(server(), 'POST', `/api/v1/admin/devices/${t.app.getState().device!.deviceId}/revoke`, { session });
    expect(res.statusCode).toBe(204);
    expect(await t.app.actions.signIn('odile', '1234')).toBe(false);
    expect(t.app.getState().error).toMatch(/withdrawn by an administrator/);
  });

  it('offline, a person the site has since deactivated cannot sign in with the cached verifier', async () => {
    const t = await signedIn();
    await t.settle();
    t.app.actions.signOut();
    // The site deactivates Odile; the tablet learns it with its next sync, then loses the network.
    await server().store.appendSetup(
      [{ siteId: SITE, record: { kind: 'person', id: 'p-op', body: { id: 'p-op', name: 'Odile Test', login: 'odile', role: 'operator', active: false } } }],
      server().now().toISOString(),
    );
    await t.app.actions.syncNow();
    await t.settle();
    expect(t.app.getState().setup.people.find((p) => p.id === 'p-op')?.active).toBe(false);
    t.net.online = false;
    expect(await t.app.actions.signIn('odile', '1234')).toBe(false);
    expect(t.app.getState().stage).toBe('sign-in');
    expect(t.app.getState().error).toMatch(/no longer active/);
  });

  it('offline sign-in ignores the case of the login', async () => {
    const t = await signedIn();
    await t.settle();
    t.app.actions.signOut();
    t.net.online = false;
    expect(await t.app.actions.signIn('ODILE', '1234')).toBe(true);
    expect(t.app.getState().person?.id).toBe('p-op');
  });
});

describe('corrections and exclusions', () => {
  it('correct() adds a sample that supersedes the original, in its place; the original stays on the tablet', async () => {
    const t = await signedIn();
    for (const v of [10, 10.2, 10.1]) {
      t.clock.t += HOUR;
      expect(await t.app.actions.record('ch-len', { values: [v] })).toBe(true);
    }
    const before = t.app.getState().views['ch-len']!.series;
    const original = before.samples[1]!;
    expect(await t.app.actions.correct('ch-len', original.id, { values: [10.02] }, '  Misread the gauge ')).toBe(true);
    const after = t.app.getState().views['ch-len']!.series;
    expect(after.samples.map((x) => x.values)).toEqual([[10], [10.02], [10.1]]);
    const fix = after.samples[1]!;
    expect(fix).toMatchObject({ supersedes: original.id, reason: 'Misread the gauge', takenAt: original.takenAt, recordedBy: 'p-op' });
    expect(await getDeviceRecord(t.db, original.id)).toMatchObject({ values: [10.2] });
    expect((await getOutboxRow(t.db, fix.id))?.kind).toBe('sample');
    expect(t.app.getState().toast).toBe('The correction is saved on this tablet; the original stays in the record');
    await t.settle();
    expect((await getOutboxRow(t.db, fix.id))?.state).toBe('acked');
  });

  it('a correction needs a reason', async () => {
    const t = await signedIn();
    expect(await t.app.actions.record('ch-len', { values: [10] })).toBe(true);
    const id = t.app.getState().views['ch-len']!.series.sampleIds[0]!;
    expect(await t.app.actions.correct('ch-len', id, { values: [10.1] }, '   ')).toBe(false);
    expect(t.app.getState().error).toBe('A correction needs a reason.');
    expect(await getCurrentSamplesForCharacteristic(t.db, 'ch-len')).toHaveLength(1);
  });

  it('a correction that does not fit the chart is refused like a new entry', async () => {
    const t = await signedIn();
    expect(await t.app.actions.record('ch-def', { count: 3, inspected: 100 })).toBe(true);
    const id = t.app.getState().views['ch-def']!.series.sampleIds[0]!;
    expect(await t.app.actions.correct('ch-def', id, { count: 130 }, 'Recounted')).toBe(false);
    expect(t.app.getState().error).toBe('The correction was NOT saved: More nonconforming items (130) than items inspected (100).');
    expect(await t.app.actions.correct('ch-def', id, { count: 4 }, 'Recounted')).toBe(true);
    expect(t.app.getState().views['ch-def']!.series.samples[0]).toMatchObject({ count: 4, inspected: 100, supersedes: id });
  });

  it('setExcluded() is for engineers and admins; an excluded point leaves the limits but stays on the chart', async () => {
    const t = await enrolled();
    await seedBaseline(t);
    expect(await t.app.actions.signIn('odile', '1234')).toBe(true);
    const first = t.app.getState().views['ch-len']!.series.sampleIds[1]!;
    expect(await t.app.actions.setExcluded('ch-len', first, true, 'Setting-up part')).toBe(false);
    expect(t.app.getState().error).toMatch(/Only a quality engineer/);

    t.app.actions.addPerson();
    expect(await t.app.actions.signIn('ada', '3456')).toBe(true);
    expect(await t.app.actions.setExcluded('ch-len', first, true, '')).toBe(false);
    expect(t.app.getState().error).toBe('Leaving a point out of the limits needs a reason.');
    const centreBefore = t.app.getState().views['ch-len']!.analysis.phases[0]!.centre!;
    expect(await t.app.actions.setExcluded('ch-len', first, true, 'Setting-up part')).toBe(true);
    const view = t.app.getState().views['ch-len']!;
    expect(view.analysis.points).toHaveLength(20);
    expect(view.analysis.points[1]!.excluded).toBe(true);
    expect(view.series.samples[1]).toMatchObject({ supersedes: first, excluded: true, reason: 'Setting-up part', values: [10.1] });
    // The mean of the 19 included values (computed here), not of all 20.
    const included = BASELINE.filter((_, i) => i !== 1);
    expect(view.analysis.phases[0]!.centre).toBeCloseTo(included.reduce((a, b) => a + b, 0) / included.length, 10);
    expect(view.analysis.phases[0]!.centre).not.toBeCloseTo(centreBefore, 6);
    await t.settle();
    expect((await getOutboxRow(t.db, view.series.sampleIds[1]!))?.state).toBe('acked'); // the server takes it from an admin
  });
});


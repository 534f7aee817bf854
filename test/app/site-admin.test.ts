/**
 * The site admin's people and tablets, end to end through the app layer: the real admin api client and
 * sync engine against the real sync server (tablet-harness.ts). Ada is the fixture site's only admin.
 */
import { describe, expect, it } from 'vitest';
import { NO_SESSION, OFFLINE } from '../../src/app/admin-controller';
import { countOutbox, getSignedInPerson } from '../../src/store';
import { enrolled, signedIn, tablet, useServerPerTest } from './tablet-harness';

const server = useServerPerTest();

async function adminTablet() {
  const t = await signedIn('ada', '3456');
  t.app.actions.open({ name: 'admin', tab: 'people' });
  await t.settle();
  return t;
}

const personInput = { name: 'Nadia Test', login: 'nadia', role: 'operator' as const, pin: '4826', pinAgain: '4826' };

describe('people', () => {
  it('an admin sees everyone at the site with role and state, and the tablets', async () => {
    const t = await adminTablet();
    const view = t.app.getState().admin!;
    expect(view.problem).toBeUndefined();
    expect(view.people?.map((p) => `${p.login}:${p.role}:${p.active}`)).toEqual(['ada:admin:true', 'gone:operator:false', 'odile:operator:true', 'sven:supervisor:true']);
    expect(view.devices?.map((d) => d.name)).toEqual(['Press 4 tablet']);
  });

  it('only an admin reaches the screen', async () => {
    const t = await signedIn('sven', '2345');
    t.app.actions.open({ name: 'admin', tab: 'people' });
    expect(t.app.getState().screen).toEqual({ name: 'board' });
    expect(t.app.getState().error).toBe('Only a site admin can manage people and tablets.');
  });

  it('adds a person after checking the form: PIN twice, PIN rule, login in use; the person then signs in on another tablet', async () => {
    const t = await adminTablet();
    const a = t.app.actions;
    expect(await a.adminAddPerson({ ...personInput, pinAgain: '4862' })).toEqual({ ok: false, errors: { pinAgain: 'The two PINs are not the same.' } });
    expect(await a.adminAddPerson({ ...personInput, pin: '2222', pinAgain: '2222' })).toMatchObject({ ok: false, errors: { pin: expect.stringMatching(/too easy to guess/) } });
    expect(await a.adminAddPerson({ ...personInput, login: 'Odile' })).toEqual({ ok: false, errors: { login: 'This login is already used by Odile Test.' } });
    expect(await a.adminAddPerson({ ...personInput, role: '' })).toEqual({ ok: false, errors: { role: 'Choose a role.' } });
    expect(await a.adminAddPerson(personInput)).toEqual({ ok: true });
    const view = t.app.getState().admin!;
    expect(view.people?.find((p) => p.login === 'nadia')).toMatchObject({ name: 'Nadia Test', role: 'operator', active: true });
    expect(view.notice).toMatch(/^Nadia Test can now sign in/);
    const line = await enrolled();
    expect(await line.app.actions.signIn('nadia', '4826')).toBe(true);
    expect(line.app.getState().person?.role).toBe('operator');
  });

  it('withdrawing access: the next sign-in is refused, and after its next sync a tablet forgets the person (no offline sign-in either)', async () => {
    const line = await signedIn('odile', '1234');
    await line.settle();
    expect(await getSignedInPerson(line.db, 'odile')).toBeDefined();
    const t = await adminTablet();
    expect(await t.app.actions.adminChangePerson('p-op', { active: false })).toBe(true);
    expect(t.app.getState().admin?.people?.find((p) => p.id === 'p-op')?.active).toBe(false);

    // The line tablet syncs: Odile, signed in there, is signed out and her cached verifier is gone.
    await line.app.actions.syncNow();
    await line.settle();
    expect(line.app.getState()).toMatchObject({ stage: 'sign-in', person: undefined });
    expect(line.app.getState().error).toBe("Odile Test's access to this site has been withdrawn by an administrator, so they have been signed out.");
    expect(await getSignedInPerson(line.db, 'odile')).toBeUndefined();
    expect(line.app.getState().signedIn.map((p) => p.id)).not.toContain('p-op');
    // Offline, with the right PIN: refused, and told why.
    line.net.online = false;
    expect(await line.app.actions.signIn('odile', '1234')).toBe(false);
    expect(line.app.getState().error).toMatch(/^This person is no longer active on this site/);
    // Online: the server refuses too.
    line.net.online = true;
    expect(await line.app.actions.signIn('odile', '1234')).toBe(false);
    expect(line.app.getState().error).toMatch(/access to this site has been withdrawn/);

    // Access given back: online sign-in works again.
    expect(await t.app.actions.adminChangePerson('p-op', { active: true })).toBe(true);
    expect(await line.app.actions.signIn('odile', '1234')).toBe(true);
  });

  it('a role change reaches an offline sign-in after the next sync', async () => {
    const line = await signedIn('odile', '1234');
    await line.settle();
    line.app.actions.signOut();
    const t = await adminTablet();
    expect(await t.app.actions.adminChangePerson('p-op', { role: 'supervisor' })).toBe(true);
    await line.app.actions.syncNow();
    await line.settle();
    line.net.online = false;
    expect(await line.app.actions.signIn('odile', '1234')).toBe(true);
    expect(line.app.getState().person?.role).toBe('supervisor');
  });

  it('the only admin cannot withdraw or demote themself: refused before asking the server, with the reason', async () => {
    const t = await adminTablet();
    expect(await t.app.actions.adminChangePerson('p-adm', { active: false })).toBe(false);
    expect(t.app.getState().admin?.problem).toMatch(/^You cannot withdraw the access of Ada Test: they are the site's only active admin/);
    expect(await t.app.actions.adminChangePerson('p-adm', { role: 'engineer' })).toBe(false);
    expect((await server().store.getSetup('person', 'p-adm'))?.body).toMatchObject({ role: 'admin', active: true });
  });

  it('an admin who hands over and steps down becomes what the server says, and leaves the admin screen', async () => {
    const t = await adminTablet();
    expect(await t.app.actions.adminChangePerson('p-sup', { role: 'admin' })).toBe(true);
    expect(await t.app.actions.adminChangePerson('p-adm', { role: 'engineer' })).toBe(true);
    expect(t.app.getState().person?.role).toBe('engineer');
    expect(t.app.getState().screen).toEqual({ name: 'board' });
  });

  it('an admin who withdraws their own access (with another admin at the site) is signed out at once', async () => {
    const t = await adminTablet();
    expect(await t.app.actions.adminChangePerson('p-sup', { role: 'admin' })).toBe(true);
    expect(await t.app.actions.adminChangePerson('p-adm', { active: false })).toBe(true);
    expect(t.app.getState()).toMatchObject({ stage: 'sign-in', person: undefined, admin: undefined });
    expect(t.app.getState().error).toBe('You have withdrawn your own access to this site, so you have been signed out.');
  });

  it('resets a PIN: the new one signs in online, the old one no longer does', async () => {
    const t = await adminTablet();
    expect(await t.app.actions.adminResetPin('p-op', '5281', '5218')).toEqual({ ok: false, errors: { pinAgain: 'The two PINs are not the same.' } });
    expect(await t.app.actions.adminResetPin('p-op', '5281', '5281')).toEqual({ ok: true });
    const line = await enrolled();
    expect(await line.app.actions.signIn('odile', '1234')).toBe(false);
    expect(await line.app.actions.signIn('odile', '5281')).toBe(true);
  });

  it('a PIN reset reaches tablets at their next sync: the old PIN no longer works offline there', async () => {
    const line = await signedIn('odile', '1234');
    await line.settle();
    line.app.actions.signOut();
    const t = await adminTablet();
    expect(await t.app.actions.adminResetPin('p-op', '5281', '5281')).toEqual({ ok: true });
    await line.app.actions.syncNow();
    await line.settle();
    line.net.online = false;
    expect(await line.app.actions.signIn('odile', '1234')).toBe(false);
    expect(line.app.getState().error).toBe("Odile Test's PIN has been changed by the site admin. Sign in once while the tablet is online, with the new PIN.");
    line.net.online = true;
    expect(await line.app.actions.signIn('odile', '5281')).toBe(true);
    line.app.actions.signOut();
    line.net.online = false;
    expect(await line.app.actions.signIn('odile', '5281')).toBe(true); // the new verifier is cached now
  });

  it('before the sync, a tablet still takes the old PIN offline (it cannot know yet)', async () => {
    const line = await signedIn('odile', '1234');
    await line.settle();
    line.app.actions.signOut();
    const t = await adminTablet();
    expect(await t.app.actions.adminResetPin('p-op', '5281', '5281')).toEqual({ ok: true });
    line.net.online = false;
    expect(await line.app.actions.signIn('odile', '1234')).toBe(true);
  });

  it('online only: without a network, and after an offline sign-in, the screen says so plainly and changes nothing', async () => {
    const t = await adminTablet();
    t.net.online = false;
    await t.app.actions.adminReload();
    expect(t.app.getState().admin?.problem).toBe(OFFLINE);
    expect(await t.app.actions.adminAddPerson(personInput)).toEqual({ ok: false, errors: { form: OFFLINE } });
    expect(await server().store.getSetup('person', 'p-nadia')).toBeUndefined();
    // Signed out and in again while offline: the server has no session for this sign-in.
    t.app.actions.signOut();
    expect(await t.app.actions.signIn('ada', '3456')).toBe(true);
    t.net.online = true;
    t.app.actions.open({ name: 'admin', tab: 'people' });
    await t.settle();
    expect(t.app.getState().admin?.problem).toBe(NO_SESSION);
  });
});

describe('tablets', () => {
  it('issues a one-time enrolment code with its expiry; a new tablet enrols with it once', async () => {
    const t = await adminTablet();
    expect(await t.app.actions.adminIssueCode()).toBe(true);
    const code = t.app.getState().admin!.code!;
    expect(Date.parse(code.expiresAt) - server().now().getTime()).toBe(15 * 60_000);
    const fresh = await tablet();
    await fresh.app.start();
    expect(await fresh.app.actions.enrol(code.code, 'Lathe tablet')).toBe(true);
    const again = await tablet();
    await again.app.start();
    expect(await again.app.actions.enrol(code.code, 'Third tablet')).toBe(false);
    await t.app.actions.adminReload();
    expect(t.app.getState().admin?.devices?.map((d) => d.name)).toContain('Lathe tablet');
    // A longer lifetime when asked for.
    expect(await t.app.actions.adminIssueCode(60)).toBe(true);
    expect(Date.parse(t.app.getState().admin!.code!.expiresAt) - server().now().getTime()).toBe(60 * 60_000);
  });

  it('a withdrawn tablet says so and keeps its unsent records, in the outbox and on the chart, also after a restart', async () => {
    const line = await signedIn('odile', '1234');
    await line.settle();
    line.net.online = false;
    expect(await line.app.actions.record('ch-len', { values: [10.02] })).toBe(true);
    await line.settle();
    line.net.online = true;

    const t = await adminTablet();
    const lineId = line.app.getState().device!.deviceId;
    expect(await t.app.actions.adminRevokeTablet(lineId)).toBe(true);
    expect(t.app.getState().admin?.devices?.find((d) => d.id === lineId)?.revokedAt).toBe(server().now().toISOString());

    await line.app.actions.syncNow();
    await line.settle();
    expect(line.app.getState().sync).toMatchObject({ withdrawn: true, pending: 1, state: 'error' });
    expect((await countOutbox(line.db)).pending).toBe(1);
    line.app.actions.open({ name: 'characteristic', characteristicId: 'ch-len' });
    await line.settle();
    expect(line.app.getState().views['ch-len']?.series.samples.map((s) => s.values?.[0])).toContain(10.02);

    // After a restart the person can still sign in (cached verifier) to see what the tablet holds.
    line.app.actions.signOut();
    const restarted = await tablet({ db: line.db });
    await restarted.app.start();
    await restarted.settle();
    expect(restarted.app.getState().sync.withdrawn).toBe(true);
    expect(await restarted.app.actions.signIn('odile', '1234')).toBe(true);
    expect((await countOutbox(restarted.db)).pending).toBe(1);
  });

  it('a withdrawn tablet the admin reinstates syncs again at its next sync, without a restart: its kept record reaches the server once and the notice goes', async () => {
    const line = await signedIn('odile', '1234');
    await line.settle();
    line.net.online = false;
    expect(await line.app.actions.record('ch-len', { values: [10.03] })).toBe(true);
    await line.settle();
    line.net.online = true;
    line.app.actions.open({ name: 'characteristic', characteristicId: 'ch-len' });
    await line.settle();
    const kept = line.app.getState().views['ch-len']!.series.samples.find((s) => s.values?.[0] === 10.03)!;

    const t = await adminTablet();
    const lineId = line.app.getState().device!.deviceId;
    expect(await t.app.actions.adminRevokeTablet(lineId)).toBe(true);
    for (let run = 0; run < 3; run++) {
      line.clock.t += 1_000;
      await line.app.actions.syncNow();
      await line.settle();
    }
    expect(line.app.getState().sync).toMatchObject({ withdrawn: true, pending: 1 });

    expect(await t.app.actions.adminReinstateTablet(lineId)).toBe(true);
    const view = t.app.getState().admin!;
    expect(view.devices?.find((d) => d.id === lineId)?.revokedAt).toBeNull();
    expect(view.notice).toMatch(/is in use again: records it has not sent go to the server at its next sync/);
    expect(view.problem).toBeUndefined();

    await line.app.actions.syncNow();
    await line.settle();
    expect(line.app.getState().sync.withdrawn).toBeUndefined();
    expect(line.app.getState().sync).toMatchObject({ state: 'idle', pending: 0 });
    expect(await countOutbox(line.db)).toMatchObject({ pending: 0, rejected: 0, conflict: 0 });
    const onServer = await server().sql(`SELECT device_id FROM log WHERE entity_id = ?`, kept.id);
    expect(onServer).toEqual([{ device_id: lineId }]);
    // A further sync sends nothing again.
    await line.app.actions.syncNow();
    await line.settle();
    expect(await server().sql(`SELECT device_id FROM log WHERE entity_id = ?`, kept.id)).toHaveLength(1);
    // The admin's own tablet receives it like any other record.
    await t.app.actions.syncNow();
    await t.settle();
    t.app.actions.open({ name: 'characteristic', characteristicId: 'ch-len' });
    await t.settle();
    expect(t.app.getState().views['ch-len']?.series.samples.filter((s) => s.id === kept.id)).toHaveLength(1);
  });

  it('reinstating a tablet in use changes nothing: it stays in use', async () => {
    const t = await adminTablet();
    const ownId = t.app.getState().device!.deviceId;
    expect(await t.app.actions.adminReinstateTablet(ownId)).toBe(true);
    expect(t.app.getState().admin?.devices?.find((d) => d.id === ownId)?.revokedAt).toBeNull();
  });
});

/**
 * Contract test: the real client (api-client, store, sync engine) against the real sync server
 * (src/server on a temporary SQLite file, through fastify's inject). Uses the server team's fixtures
 * (test/server/fixtures.ts) for the site, people and PINs.
 */
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import {
  countOutbox,
  getOutboxRow,
  getSetup,
  listOutboxProblems,
  saveDeviceRecord,
  setDeviceIdentity,
  type AppDb,
} from '../../src/store';
import { createApiClient, type ApiClient } from '../../src/sync/api-client';
import { verifyOffline } from '../../src/sync/offline-verifier';
import { createSyncEngine } from '../../src/sync/sync-engine';
import { issueEnrolmentCode } from '../../src/server/routes/admin-enrolment-codes';
import { SITE, startTestServer, type TestServer } from '../server/fixtures';
import { closeAll, freshDb, makeSample } from '../store/helpers';

const BASE = 'http://tablet.test/api/v1';

/** fetch over fastify.inject; `dropNextPushAnswers` loses answers after the server has committed. */
function injectFetch(server: TestServer, faults: { dropNextPushAnswers: number }): typeof fetch {
  return (async (input: string, init?: RequestInit) => {
    const url = new URL(input);
    const res = await server.app.inject({
      method: (init?.method ?? 'GET') as 'GET' | 'POST',
      url: url.pathname + url.search,
      headers: init?.headers as Record<string, string>,
      ...(init?.body !== undefined ? { payload: String(init.body) } : {}),
    });
    if (url.pathname.endsWith('/sync/push') && faults.dropNextPushAnswers > 0) {
      faults.dropNextPushAnswers -= 1;
      throw new TypeError('network connection lost');
    }
    const headers = new Headers();
    for (const [k, v] of Object.entries(res.headers)) if (v !== undefined) headers.set(k, String(v));
    return new Response(res.body, { status: res.statusCode, headers });
  }) as unknown as typeof fetch;
}

let server: TestServer;
beforeAll(async () => {
  server = await startTestServer();
});
afterAll(async () => {
  await server.close();
});
afterEach(closeAll);

async function enrolledTablet(faults = { dropNextPushAnswers: 0 }): Promise<{ db: AppDb; api: ApiClient; deviceId: string; token: string }> {
  const api = createApiClient({ baseUrl: BASE, fetch: injectFetch(server, faults) });
  const { code } = await issueEnrolmentCode(server.store, SITE, 'p-adm', server.now());
  const enrolled = await api.enrolDevice({ code, deviceName: 'Tablet contract' });
  const db = await freshDb();
  await setDeviceIdentity(db, { deviceId: enrolled.deviceId, deviceToken: enrolled.deviceToken, siteId: enrolled.siteId, deviceName: 'Tablet contract' });
  return { db, api, deviceId: enrolled.deviceId, token: enrolled.deviceToken };
}

describe('client against the real sync server', () => {
  it('enrols, signs in, and the offline verifier from the server checks the PIN on the tablet', async () => {
    const { api, token } = await enrolledTablet();
    const res = await api.signIn(token, { login: 'odile', pin: '1234' });
    expect(res.person.id).toBe('p-op');
    expect(await verifyOffline('1234', res.offlineVerifier)).toBe(true);
    expect(await verifyOffline('4321', res.offlineVerifier)).toBe(false);
    await expect(api.signIn(token, { login: 'odile', pin: '9999' })).rejects.toMatchObject({ code: 'unauthorized' });
  });

  it('pushes, pulls set-up, keeps a server rejection visible, and a lost answer ends as a duplicate', async () => {
    const faults = { dropNextPushAnswers: 1 };
    const { db, api, deviceId } = await enrolledTablet(faults);
    const good = [0, 1, 2].map((i) => makeSample({ deviceId, characteristicId: 'ch-len', recordedBy: 'p-op', values: [10 + i / 100] }));
    const bad = makeSample({ deviceId, characteristicId: 'no-such-characteristic', recordedBy: 'p-op' });
    for (const s of [...good, bad]) await saveDeviceRecord(db, s);
    let clock = Date.now();
    const engine = createSyncEngine({ db, api, now: () => clock, random: () => 0.5, locks: null, windowTarget: null, documentTarget: null });

    const first = await engine.syncNow();
    expect(first.error?.code).toBe('offline'); // the answer was lost after the commit
    expect((await countOutbox(db)).pending).toBe(4);

    clock += 60_000;
    const second = await engine.syncNow();
    expect(second).toMatchObject({ ok: true, acked: 3, rejected: 1, conflict: 0 });
    expect(second.skipped).toEqual([]);
    for (const s of good) expect((await getOutboxRow(db, s.id))?.state).toBe('acked');
    const problems = await listOutboxProblems(db);
    expect(problems.map((p) => p.id)).toEqual([bad.id]);
    expect(problems[0]?.lastError).toMatch(/no-such-characteristic/);

    const setup = await getSetup(db);
    expect(setup.characteristics.map((c) => c.id).sort()).toEqual(['ch-def', 'ch-len']);
    expect(setup.people.length).toBeGreaterThanOrEqual(4);
    expect(setup.sites.map((s) => s.id)).toEqual([SITE]);

    // Nothing left to send: a further run pushes nothing.
    const third = await engine.syncNow({ ignoreBackoff: true });
    expect(third).toMatchObject({ ok: true, acked: 0, rejected: 0 });
  });
});

import { afterEach, describe, expect, it } from 'vitest';
import { countOutbox, getOutboxRow, saveDeviceRecord, setDeviceIdentity } from '../../src/store';
import { ApiError, createApiClient, type SyncApi } from '../../src/sync/api-client';
import { createSyncEngine } from '../../src/sync/sync-engine';
import { closeAll, freshDb, makeSample } from '../store/helpers';
import { BASE_URL, FakeSyncServer } from './fake-server';

afterEach(closeAll);

/** A server that has withdrawn this tablet: every call is answered 401 device-revoked, as auth.ts does. */
const withdrawn: SyncApi = {
  pushRecords: async () => {
    throw new ApiError('unauthorized', 'Not allowed: This tablet has been withdrawn by an administrator; a site admin can reinstate it (its unsent records then go at its next sync).', { status: 401, serverCode: 'device-revoked' });
  },
  pullEntries: async () => {
    throw new ApiError('unauthorized', 'Not allowed: This tablet has been withdrawn by an administrator; a site admin can reinstate it (its unsent records then go at its next sync).', { status: 401, serverCode: 'device-revoked' });
  },
};

describe('sync engine on a withdrawn tablet', () => {
  it('reports device-revoked and keeps every unsent record pending, with the reason, run after run', async () => {
    const db = await freshDb();
    await setDeviceIdentity(db, { deviceId: 'tab-1', deviceToken: 'tok', siteId: 'plant-1', deviceName: 'Tablet 1' });
    const now = Date.UTC(2026, 11, 2, 8);
    const samples = [makeSample(), makeSample()];
    for (const s of samples) await saveDeviceRecord(db, s, now);
    const engine = createSyncEngine({ db, api: withdrawn, now: () => now, random: () => 0.5, locks: null, windowTarget: null, documentTarget: null });
    for (let run = 0; run < 3; run++) {
      const report = await engine.syncNow({ ignoreBackoff: true });
      expect(report.ok).toBe(false);
      expect(report.error?.code).toBe('device-revoked');
    }
    expect(engine.getStatus()).toMatchObject({ state: 'error', pending: 2, lastErrorCode: 'device-revoked' });
    expect(await countOutbox(db)).toMatchObject({ pending: 2, rejected: 0, conflict: 0 });
    const row = await getOutboxRow(db, samples[0]!.id);
    expect(row?.state).toBe('pending');
    expect(row?.lastError).toMatch(/withdrawn by an administrator/);
  });

  it('a pull refused the same way (nothing to send) is reported alike', async () => {
    const db = await freshDb();
    await setDeviceIdentity(db, { deviceId: 'tab-1', deviceToken: 'tok', siteId: 'plant-1', deviceName: 'Tablet 1' });
    const engine = createSyncEngine({ db, api: withdrawn, locks: null, windowTarget: null, documentTarget: null });
    expect((await engine.syncNow()).error?.code).toBe('device-revoked');
    engine.stop();
  });
});

describe('sync engine on a tablet an admin reinstates', () => {
  it('its next run, even one the timer starts (backoff not ignored), sends every kept record once and clears the withdrawn state', async () => {
    const db = await freshDb();
    await setDeviceIdentity(db, { deviceId: 'tab-1', deviceToken: 'device-token-1', siteId: 'plant-1', deviceName: 'Tablet 1' });
    const clock = { now: Date.UTC(2026, 11, 2, 8) };
    const server = new FakeSyncServer();
    const real = createApiClient({ baseUrl: BASE_URL, fetch: server.fetch, now: () => clock.now });
    let isWithdrawn = true;
    const api: SyncApi = {
      pushRecords: (token, body) => (isWithdrawn ? withdrawn.pushRecords(token, body) : real.pushRecords(token, body)),
      pullEntries: (token, cursor, limit) => (isWithdrawn ? withdrawn.pullEntries(token, cursor, limit) : real.pullEntries(token, cursor, limit)),
    };
    const samples = [makeSample(), makeSample(), makeSample()];
    for (const s of samples) await saveDeviceRecord(db, s, clock.now);
    const engine = createSyncEngine({ db, api, now: () => clock.now, random: () => 0.99, locks: null, windowTarget: null, documentTarget: null });
    for (let run = 0; run < 4; run++) expect((await engine.syncNow({ ignoreBackoff: true })).error?.code).toBe('device-revoked');
    // Four failures put the rows' next attempt minutes away.
    expect((await getOutboxRow(db, samples[0]!.id))?.nextAttemptAt).toBeGreaterThan(clock.now + 5_000);

    isWithdrawn = false; // the admin reinstates it: the same token works again
    const report = await engine.syncNow();
    expect(report).toMatchObject({ ok: true, acked: 3 });
    expect(engine.getStatus()).toMatchObject({ state: 'idle', pending: 0, lastErrorCode: null, lastError: null });
    expect([...server.sendCounts().values()]).toEqual([1, 1, 1]);
    expect(server.log.filter((e) => e.entry.kind === 'record')).toHaveLength(3);
    // Nothing goes twice afterwards.
    expect((await engine.syncNow({ ignoreBackoff: true })).acked).toBe(0);
    expect(server.log.filter((e) => e.entry.kind === 'record')).toHaveLength(3);
  });
});


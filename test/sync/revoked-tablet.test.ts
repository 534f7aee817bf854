import { afterEach, describe, expect, it } from 'vitest';
import { countOutbox, getOutboxRow, saveDeviceRecord, setDeviceIdentity } from '../../src/store';
import { ApiError, type SyncApi } from '../../src/sync/api-client';
import { createSyncEngine } from '../../src/sync/sync-engine';
import { closeAll, freshDb, makeSample } from '../store/helpers';

afterEach(closeAll);

/** A server that has withdrawn this tablet: every call is answered 401 device-revoked, as auth.ts does. */
const withdrawn: SyncApi = {
  pushRecords: async () => {
    throw new ApiError('unauthorized', 'Not allowed: This tablet has been withdrawn by an administrator; enrol it again to use it.', { status: 401, serverCode: 'device-revoked' });
  },
  pullEntries: async () => {
    throw new ApiError('unauthorized', 'Not allowed: This tablet has been withdrawn by an administrator; enrol it again to use it.', { status: 401, serverCode: 'device-revoked' });
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

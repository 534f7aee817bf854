import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { contentHash } from '../../src/server/canonical-json';
import type { RecordToInsert, ServerStore } from '../../src/server/store/server-store';
import { makeSample } from './fixtures';

/**
 * Behaviour every ServerStore must have, written against the interface only, so the SQLite
 * store and a later PostgreSQL store run the same checks.
 */
export function describeServerStoreContract(label: string, open: () => Promise<{ store: ServerStore; dispose: () => Promise<void> }>): void {
  describe(`ServerStore contract: ${label}`, () => {
    let store: ServerStore;
    let dispose: () => Promise<void>;
    beforeEach(async () => {
      ({ store, dispose } = await open());
    });
    afterEach(async () => dispose());

    const T = '2026-12-01T08:00:00.000Z';
    const item = (record = makeSample('dev-1'), siteId = 's1'): RecordToInsert => ({
      record, siteId, contentHash: contentHash(record), deviceId: 'dev-1', personId: record.recordedBy, clientTime: record.takenAt,
    });

    it('keeps one epoch for the life of the database', async () => {
      const epoch = await store.getServerEpoch();
      expect(epoch.length).toBeGreaterThanOrEqual(16);
      expect(await store.getServerEpoch()).toBe(epoch);
    });

    it('versions set-up: a new version appends, getSetup returns the latest, listSetup is per site', async () => {
      const [s1, s2] = await store.appendSetup(
        [
          { siteId: 's1', record: { kind: 'line', id: 'l1', body: { id: 'l1', siteId: 's1', name: 'One' } } },
          { siteId: 's2', record: { kind: 'line', id: 'l2', body: { id: 'l2', siteId: 's2', name: 'Two' } } },
        ],
        T,
      );
      expect(s2).toBe((s1 ?? 0) + 1);
      const [s3] = await store.appendSetup([{ siteId: 's1', record: { kind: 'line', id: 'l1', body: { id: 'l1', siteId: 's1', name: 'One (new)' } } }], T);
      expect(await store.getSetup('line', 'l1')).toEqual({ kind: 'line', id: 'l1', siteId: 's1', body: { id: 'l1', siteId: 's1', name: 'One (new)' }, serverSeq: s3 });
      expect((await store.listSetup('s1', 'line')).map((l) => l.id)).toEqual(['l1']);
      expect(await store.getSetup('line', 'nope')).toBeUndefined();
      const log = await store.readLog('s1', 0, 10);
      expect(log.map((r) => [r.serverSeq, r.entry.id])).toEqual([[s1, 'l1'], [s3, 'l1']]);
    });

    it('replaces person secrets', async () => {
      const secrets = { personId: 'p1', pinHash: 'a', pinSalt: 'b', verifierSalt: 'c', verifierHash: 'd', verifierIterations: 5, updatedAt: T };
      await store.setPersonSecrets(secrets);
      await store.setPersonSecrets({ ...secrets, pinHash: 'a2' });
      expect(await store.getPersonSecrets('p1')).toEqual({ ...secrets, pinHash: 'a2' });
      expect(await store.getPersonSecrets('p2')).toBeUndefined();
    });

    it('redeems an enrolment code once, before it expires', async () => {
      await store.createEnrolmentCode({ codeHash: 'h1', siteId: 's1', createdBy: 'p1', createdAt: T, expiresAt: '2026-12-01T08:15:00.000Z' });
      const device = (id: string) => ({ id, name: id, tokenHash: `t-${id}`, enrolledAt: T });
      expect(await store.redeemEnrolmentCode('h-unknown', T, device('d0'))).toEqual({ ok: false, reason: 'unknown' });
      expect(await store.redeemEnrolmentCode('h1', '2026-12-01T08:15:00.000Z', device('d0'))).toEqual({ ok: false, reason: 'expired' });
      expect(await store.redeemEnrolmentCode('h1', T, device('d1'))).toEqual({ ok: true, siteId: 's1' });
      expect(await store.redeemEnrolmentCode('h1', T, device('d2'))).toEqual({ ok: false, reason: 'used' });
      expect(await store.findDeviceByTokenHash('t-d1')).toMatchObject({ id: 'd1', siteId: 's1', revokedAt: null });
      expect(await store.findDeviceByTokenHash('t-d2')).toBeUndefined();
    });

    it('revokes a device once and lists a site’s devices', async () => {
      await store.createDevice({ id: 'd1', siteId: 's1', name: 'A', tokenHash: 't1', enrolledAt: T });
      expect(await store.revokeDevice('d1', '2026-12-01T09:00:00.000Z')).toBe(true);
      expect(await store.revokeDevice('d1', '2026-12-01T10:00:00.000Z')).toBe(true);
      expect((await store.getDevice('d1'))?.revokedAt).toBe('2026-12-01T09:00:00.000Z');
      expect(await store.revokeDevice('d-none', T)).toBe(false);
      expect((await store.listDevices('s1')).map((d) => d.id)).toEqual(['d1']);
      expect(await store.listDevices('s2')).toEqual([]);
    });

    it('reinstates a withdrawn device: the same token finds it in use again, and a second reinstate changes nothing', async () => {
      await store.createDevice({ id: 'd1', siteId: 's1', name: 'A', tokenHash: 't1', enrolledAt: T });
      await store.revokeDevice('d1', '2026-12-01T09:00:00.000Z');
      expect(await store.reinstateDevice('d1')).toBe(true);
      expect(await store.findDeviceByTokenHash('t1')).toMatchObject({ id: 'd1', siteId: 's1', revokedAt: null });
      expect(await store.reinstateDevice('d1')).toBe(true);
      expect((await store.getDevice('d1'))?.revokedAt).toBeNull();
      expect(await store.reinstateDevice('d-none')).toBe(false);
      // Withdrawn again later: a fresh withdrawal time, not the first one.
      await store.revokeDevice('d1', '2026-12-01T11:00:00.000Z');
      expect((await store.getDevice('d1'))?.revokedAt).toBe('2026-12-01T11:00:00.000Z');
    });

    it('stores sessions by token hash', async () => {
      const session = { tokenHash: 'st', personId: 'p1', deviceId: 'd1', createdAt: T, expiresAt: '2026-12-01T20:00:00.000Z' };
      await store.createSession(session);
      expect(await store.findSessionByTokenHash('st')).toEqual(session);
      expect(await store.findSessionByTokenHash('other')).toBeUndefined();
    });

    it('inserts records if absent: stored, duplicate with the same serverSeq, conflict keeping the original', async () => {
      const a = makeSample('dev-1');
      const [first] = await store.insertRecords([item(a)], T);
      expect(first).toEqual({ id: a.id, status: 'stored', serverSeq: expect.any(Number) });
      const again = await store.insertRecords([item(a), item({ ...a, values: [1] })], T);
      expect(again).toEqual([
        { id: a.id, status: 'duplicate', serverSeq: first?.serverSeq },
        { id: a.id, status: 'conflict', serverSeq: first?.serverSeq },
      ]);
      const log = await store.readLog('s1', 0, 10);
      expect(log).toEqual([{ serverSeq: first?.serverSeq, serverTime: T, entry: { kind: 'record', id: a.id, body: a } }]);
    });

    it('reads the log of one site after a cursor, in serverSeq order, at most limit rows', async () => {
      const records = Array.from({ length: 6 }, () => makeSample('dev-1'));
      const out = await store.insertRecords(records.map((r, i) => item(r, i % 2 === 0 ? 's1' : 's2')), T);
      const seqs = out.map((o) => o.serverSeq);
      expect(seqs).toEqual([...seqs].sort((x, y) => x - y));
      const s1 = await store.readLog('s1', 0, 10);
      expect(s1.map((r) => r.entry.id)).toEqual([records[0]?.id, records[2]?.id, records[4]?.id]);
      const page = await store.readLog('s1', s1[0]?.serverSeq ?? 0, 1);
      expect(page.map((r) => r.entry.id)).toEqual([records[2]?.id]);
    });
  });
}

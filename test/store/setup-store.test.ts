import { afterEach, describe, expect, it, vi } from 'vitest';
import { IDBObjectStore as FakeStore } from 'fake-indexeddb';
import {
  StoreError,
  applyPulledEntries,
  getDeviceRecord,
  getOutboxRow,
  getPullState,
  getSetup,
  saveDeviceRecord,
} from '../../src/store';
import { closeAll, freshDb, makeSample } from './helpers';

afterEach(() => {
  vi.restoreAllMocks();
  closeAll();
});

const at = '2026-12-02T08:00:00.000Z';
const site = (name: string, serverSeq: number) => ({
  serverSeq,
  serverTime: at,
  entry: { kind: 'site', id: 'plant-1', body: { id: 'plant-1', name } },
});
const line = (serverSeq: number) => ({
  serverSeq,
  serverTime: at,
  entry: { kind: 'line', id: 'line-3', body: { id: 'line-3', siteId: 'plant-1', name: 'Line 3' } },
});

describe('applyPulledEntries()', () => {
  it('writes set-up, records and the cursor together', async () => {
    const db = await freshDb();
    const fromOtherTablet = makeSample({ deviceId: 'tab-2' });
    const result = await applyPulledEntries(
      db,
      [site('Plant One', 1), line(2), { serverSeq: 3, serverTime: at, entry: { kind: 'record', id: fromOtherTablet.id, body: fromOtherTablet } }],
      3,
      'epoch-a',
    );
    expect(result).toMatchObject({ setupWritten: 2, recordsWritten: 1, ownAcked: 0, skipped: [], cursor: 3 });
    expect(await getPullState(db)).toEqual({ cursor: 3, serverEpoch: 'epoch-a' });
    expect(await getDeviceRecord(db, fromOtherTablet.id)).toEqual(fromOtherTablet);
    const setup = await getSetup(db);
    expect(setup.sites).toEqual([{ id: 'plant-1', name: 'Plant One' }]);
    expect(setup.lines).toHaveLength(1);
  });

  it('keeps the latest version of a set-up entity, whatever order the versions arrive in', async () => {
    const db = await freshDb();
    await applyPulledEntries(db, [site('Old name', 1), site('New name', 5)], 5, 'e');
    expect((await getSetup(db)).sites).toEqual([{ id: 'plant-1', name: 'New name' }]);
    // A stale version (lower serverSeq) does not overwrite the newer one.
    await applyPulledEntries(db, [site('Stale', 4)], 6, 'e');
    expect((await getSetup(db)).sites).toEqual([{ id: 'plant-1', name: 'New name' }]);
    await applyPulledEntries(db, [site('Newest', 7)], 7, 'e');
    expect((await getSetup(db)).sites).toEqual([{ id: 'plant-1', name: 'Newest' }]);
  });

  it('skips and reports invalid entries, stores the valid ones and still advances the cursor', async () => {
    const db = await freshDb();
    const bad = { serverSeq: 2, serverTime: at, entry: { kind: 'record', id: 'not-a-uuid', body: { kind: 'sample' } } };
    const result = await applyPulledEntries(db, [site('Plant', 1), bad, null, line(4)], 4, 'e');
    expect(result.setupWritten).toBe(2);
    expect(result.skipped.map((s) => [s.index, s.serverSeq])).toEqual([[1, 2], [2, undefined]]);
    expect(result.skipped[0]?.reason).toMatch(/id|body/);
    expect((await getPullState(db)).cursor).toBe(4);
  });

  it('marks this tablet\'s own pending record acked when it comes back in the pull', async () => {
    const db = await freshDb();
    const mine = makeSample();
    await saveDeviceRecord(db, mine);
    const result = await applyPulledEntries(db, [{ serverSeq: 9, serverTime: at, entry: { kind: 'record', id: mine.id, body: mine } }], 9, 'e', 123);
    expect(result.ownAcked).toBe(1);
    expect(result.recordsWritten).toBe(0);
    expect(await getOutboxRow(db, mine.id)).toMatchObject({ state: 'acked', serverSeq: 9, ackedEpoch: 'e', ackedAt: 123 });
  });

  it('writes neither data nor cursor when the transaction fails (a full disk on the cursor write)', async () => {
    const db = await freshDb();
    const original = FakeStore.prototype.put;
    vi.spyOn(FakeStore.prototype, 'put').mockImplementation(function (this: IDBObjectStore, ...args: Parameters<IDBObjectStore['put']>) {
      if (this.name === 'meta') throw new DOMException('The quota has been exceeded.', 'QuotaExceededError');
      return original.apply(this, args);
    });
    const error = await applyPulledEntries(db, [site('Plant', 1)], 1, 'e').catch((e: unknown) => e);
    expect(error).toBeInstanceOf(StoreError);
    expect((error as StoreError).code).toBe('storage-full');
    vi.restoreAllMocks();
    expect((await getSetup(db)).sites).toEqual([]);
    expect(await getPullState(db)).toEqual({ cursor: 0, serverEpoch: null });
  });
});

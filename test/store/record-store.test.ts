import { afterEach, describe, expect, it, vi } from 'vitest';
import {
  StoreError,
  countOutbox,
  getAcksForCharacteristic,
  getAllSamples,
  getResponsesForSample,
  getCurrentSamplesForCharacteristic,
  getDeviceRecord,
  getDeviceSeq,
  getOutboxRow,
  getResponsesForCharacteristic,
  getSamplesForCharacteristic,
  saveDeviceRecord,
} from '../../src/store';
import { closeAll, freshDb, makeAck, makeResponse, makeSample } from './helpers';

afterEach(() => {
  vi.restoreAllMocks();
  closeAll();
});

describe('saveDeviceRecord()', () => {
  it('writes the record and a pending outbox row with the next device sequence number', async () => {
    const db = await freshDb();
    const sample = makeSample();
    const saved = await saveDeviceRecord(db, sample, 1_000);
    expect(saved.deviceSeq).toBe(1);
    expect(await getDeviceRecord(db, sample.id)).toEqual(sample);
    expect(await getOutboxRow(db, sample.id)).toMatchObject({
      id: sample.id,
      kind: 'sample',
      state: 'pending',
      deviceSeq: 1,
      attempts: 0,
      nextAttemptAt: 1_000,
      createdAt: 1_000,
    });
  });

  it('increments the device sequence by one per record, across kinds', async () => {
    const db = await freshDb();
    const s = makeSample();
    const r = makeResponse(s.id);
    const a = makeAck(r.id);
    const seqs = [];
    for (const rec of [s, r, a]) seqs.push((await saveDeviceRecord(db, rec)).deviceSeq);
    expect(seqs).toEqual([1, 2, 3]);
    expect(await getDeviceSeq(db)).toBe(3);
    expect(await countOutbox(db)).toEqual({ pending: 3, rejected: 0, conflict: 0, acked: 0 });
    expect(await getResponsesForCharacteristic(db, 'bore-dia')).toEqual([r]);
    expect(await getAcksForCharacteristic(db, 'bore-dia')).toEqual([a]);
    expect(await getResponsesForSample(db, s.id)).toEqual([r]);
    expect(await getAllSamples(db)).toEqual([s]);
  });

  it('rejects invalid input with a clear message and writes nothing', async () => {
    const db = await freshDb();
    const bad = { ...makeSample(), values: ['ten'] };
    const error = await saveDeviceRecord(db, bad).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(StoreError);
    expect((error as StoreError).code).toBe('invalid-record');
    expect((error as StoreError).message).toMatch(/not valid[\s\S]*values/);
    expect(await getDeviceSeq(db)).toBe(0);
  });

  it('is atomic: when the outbox write fails, neither the record nor the sequence number is kept', async () => {
    const db = await freshDb();
    const sample = makeSample();
    // An outbox row already holding this id makes the outbox `add` fail inside the transaction.
    await db.put('outbox', {
      id: sample.id, format: 1, kind: 'sample', state: 'acked', deviceSeq: 99, createdAt: 0, attempts: 1, nextAttemptAt: 0,
    });
    const error = await saveDeviceRecord(db, sample).catch((e: unknown) => e);
    expect((error as StoreError).code).toBe('duplicate-id');
    expect(await getDeviceRecord(db, sample.id)).toBeUndefined();
    expect(await getDeviceSeq(db)).toBe(0);
    expect((await getOutboxRow(db, sample.id))?.deviceSeq).toBe(99);
  });

  it('refuses to reuse an id (records are append-only)', async () => {
    const db = await freshDb();
    const sample = makeSample();
    await saveDeviceRecord(db, sample);
    const error = await saveDeviceRecord(db, { ...sample, values: [11] }).catch((e: unknown) => e);
    expect((error as StoreError).code).toBe('duplicate-id');
    expect(await getDeviceRecord(db, sample.id)).toEqual(sample);
    expect(await getDeviceSeq(db)).toBe(1);
  });

  it('surfaces a full disk as storage-full and keeps nothing of the failed write', async () => {
    const db = await freshDb();
    // idb proxies to the raw fake store: make the raw outbox `add` fail as a full disk does (sync.md §2.6).
    const { IDBObjectStore: FakeStore } = await import('fake-indexeddb');
    const original = FakeStore.prototype.add;
    vi.spyOn(FakeStore.prototype, 'add').mockImplementation(function (this: IDBObjectStore, ...args: Parameters<IDBObjectStore['add']>) {
      if (this.name === 'outbox') throw new DOMException('The quota has been exceeded.', 'QuotaExceededError');
      return original.apply(this, args);
    });
    const sample = makeSample();
    const error = await saveDeviceRecord(db, sample).catch((e: unknown) => e);
    expect((error as StoreError).code).toBe('storage-full');
    expect((error as StoreError).message).toMatch(/storage is full/);
    vi.restoreAllMocks();
    expect(await getDeviceRecord(db, sample.id)).toBeUndefined();
    expect(await getDeviceSeq(db)).toBe(0);
  });
});

describe('getSamplesForCharacteristic()', () => {
  it('orders by takenAt, then id, and keeps other characteristics out', async () => {
    const db = await freshDb();
    const late = makeSample({ takenAt: '2026-12-02T10:00:00.000Z' });
    const early = makeSample({ takenAt: '2026-12-02T07:00:00.000Z' });
    const tieB = makeSample({ id: '01900000-0000-7000-8000-00000000000b', takenAt: '2026-12-02T08:00:00.000Z' });
    const tieA = makeSample({ id: '01900000-0000-7000-8000-00000000000a', takenAt: '2026-12-02T08:00:00.000Z' });
    const other = makeSample({ characteristicId: 'bore-dia-2' });
    for (const s of [late, tieB, other, early, tieA]) await saveDeviceRecord(db, s);
    expect((await getSamplesForCharacteristic(db, 'bore-dia')).map((s) => s.id)).toEqual([early.id, tieA.id, tieB.id, late.id]);
  });

  it('returns corrected values in place through getCurrentSamplesForCharacteristic', async () => {
    const db = await freshDb();
    const a = makeSample({ takenAt: '2026-12-02T08:00:00.000Z', values: [10.5] });
    const b = makeSample({ takenAt: '2026-12-02T08:10:00.000Z', values: [10.1] });
    const fix = makeSample({ takenAt: '2026-12-02T08:00:00.000Z', values: [10.05], supersedes: a.id, reason: 'Typo' });
    for (const s of [a, b, fix]) await saveDeviceRecord(db, s);
    expect((await getCurrentSamplesForCharacteristic(db, 'bore-dia')).map((s) => s.values)).toEqual([[10.05], [10.1]]);
  });
});

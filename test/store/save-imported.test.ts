import { afterEach, describe, expect, it } from 'vitest';
import { getOutboxRow, getSamplesForCharacteristic, saveImportedSamples, StoreError } from '../../src/store';
import { closeAll, freshDb, makeSample } from './helpers';

afterEach(closeAll);

describe('saveImportedSamples()', () => {
  it('writes each sample with a pending outbox row, device sequence numbers in order', async () => {
    const db = await freshDb();
    const samples = [1, 2, 3].map((i) => makeSample({ takenAt: `2026-11-0${i}T08:00:00.000Z`, imported: { file: 'sheet.csv', line: i + 1 } }));
    expect(await saveImportedSamples(db, samples, 1000)).toEqual({ saved: 3, alreadyHeld: 0 });
    expect((await getSamplesForCharacteristic(db, 'bore-dia')).map((s) => s.imported?.line)).toEqual([2, 3, 4]);
    const rows = await Promise.all(samples.map((s) => getOutboxRow(db, s.id)));
    expect(rows.map((r) => [r?.state, r?.deviceSeq, r?.createdAt])).toEqual([['pending', 1, 1000], ['pending', 2, 1000], ['pending', 3, 1000]]);
  });

  it('skips ids the tablet already holds, and the same id twice in one batch', async () => {
    const db = await freshDb();
    const [a, b] = [makeSample(), makeSample()];
    await saveImportedSamples(db, [a!]);
    expect(await saveImportedSamples(db, [a!, b!, b!])).toEqual({ saved: 1, alreadyHeld: 2 });
    expect(await getSamplesForCharacteristic(db, 'bore-dia')).toHaveLength(2);
    expect((await getOutboxRow(db, b!.id))?.deviceSeq).toBe(2);
  });

  it('writes nothing when one sample of the batch is not valid', async () => {
    const db = await freshDb();
    const bad = makeSample({ values: [] });
    const error = await saveImportedSamples(db, [makeSample(), bad]).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(StoreError);
    expect((error as StoreError).code).toBe('invalid-record');
    expect(await getSamplesForCharacteristic(db, 'bore-dia')).toEqual([]);
  });
});

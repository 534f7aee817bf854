import { DeviceRecord, describeIssues, type Acknowledgement, type Response, type Sample } from '../schema';
import { OUTBOX_ROW_FORMAT, RECORD_STORE, type AppDb, type OutboxRow } from './app-db';
import { resolveCorrections } from './resolve-corrections';
import { StoreError, toWriteError } from './store-error';

export interface SavedRecord {
  record: DeviceRecord;
  deviceSeq: number;
}

/**
 * Saves a record made on this tablet together with its outbox row, in ONE readwrite transaction with
 * strict durability (sync.md §2.1, §3.2). Allocates the next device sequence number in the same
 * transaction. Resolves only once the transaction has committed: only then is it "saved on tablet".
 * Throws StoreError 'invalid-record' for bad input, 'duplicate-id' for a reused id, 'storage-full' when
 * the disk is full.
 */
export async function saveDeviceRecord(db: AppDb, input: unknown, now: number = Date.now()): Promise<SavedRecord> {
  const parsed = DeviceRecord.safeParse(input);
  if (!parsed.success) {
    throw new StoreError('invalid-record', `The record was not saved because it is not valid:\n${describeIssues(parsed.error)}`);
  }
  const record = parsed.data;
  const storeName = RECORD_STORE[record.kind];
  const tx = db.transaction([storeName, 'outbox', 'meta'], 'readwrite', { durability: 'strict' });
  let deviceSeq = 0;
  try {
    const meta = tx.objectStore('meta');
    const seqRow = await meta.get('deviceSeq');
    deviceSeq = (seqRow?.key === 'deviceSeq' ? seqRow.value : 0) + 1;
    await meta.put({ key: 'deviceSeq', value: deviceSeq });
    // `add`, not `put`: records are append-only and an id is never reused.
    await tx.objectStore(storeName).add(record as Sample & Response & Acknowledgement);
    const row: OutboxRow = {
      id: record.id,
      format: OUTBOX_ROW_FORMAT,
      kind: record.kind,
      state: 'pending',
      deviceSeq,
      createdAt: now,
      attempts: 0,
      nextAttemptAt: now,
    };
    await tx.objectStore('outbox').add(row);
    await tx.done;
  } catch (e) {
    // A failed request aborts the transaction; make sure it is aborted and wait for it to end.
    try {
      tx.abort();
    } catch {
      // already finished or aborted: nothing more to undo
    }
    await tx.done.catch(() => {}); // side promise: the error is reported below
    throw toWriteError(tx.error ?? e, `The ${record.kind}`);
  }
  return { record, deviceSeq };
}

/** Every sample of a characteristic (corrections included), ordered by takenAt then id. */
export async function getSamplesForCharacteristic(db: AppDb, characteristicId: string): Promise<Sample[]> {
  const range = IDBKeyRange.bound([characteristicId, ''], [characteristicId, '\uffff']);
  // The index orders by [characteristicId, takenAt] and then by primary key (id) for equal takenAt.
  return db.getAllFromIndex('samples', 'byCharacteristicTakenAt', range);
}

/** How many samples (corrections included) a characteristic has: a cheap check that a cached copy is whole. */
export async function countSamplesForCharacteristic(db: AppDb, characteristicId: string): Promise<number> {
  const range = IDBKeyRange.bound([characteristicId, ''], [characteristicId, '\uffff']);
  return db.countFromIndex('samples', 'byCharacteristicTakenAt', range);
}

/** The samples as the chart shows them: corrections applied (see resolveCorrections). */
export async function getCurrentSamplesForCharacteristic(db: AppDb, characteristicId: string): Promise<Sample[]> {
  return resolveCorrections(await getSamplesForCharacteristic(db, characteristicId));
}

export async function getResponsesForCharacteristic(db: AppDb, characteristicId: string): Promise<Response[]> {
  return db.getAllFromIndex('responses', 'byCharacteristic', characteristicId);
}

export async function getResponsesForSample(db: AppDb, sampleId: string): Promise<Response[]> {
  return db.getAllFromIndex('responses', 'bySample', sampleId);
}

/** Every sample on this tablet, ordered by characteristic, then takenAt, then id. */
export async function getAllSamples(db: AppDb): Promise<Sample[]> {
  return db.getAllFromIndex('samples', 'byCharacteristicTakenAt');
}

export async function getAcksForCharacteristic(db: AppDb, characteristicId: string): Promise<Acknowledgement[]> {
  return db.getAllFromIndex('acks', 'byCharacteristic', characteristicId);
}

export async function getAcksForResponse(db: AppDb, responseId: string): Promise<Acknowledgement[]> {
  return db.getAllFromIndex('acks', 'byResponse', responseId);
}

/** One device record by id, whatever its kind; undefined when this tablet does not hold it. */
export async function getDeviceRecord(db: AppDb, id: string): Promise<DeviceRecord | undefined> {
  const tx = db.transaction(['samples', 'responses', 'acks'], 'readonly');
  const [s, r, a] = await Promise.all([
    tx.objectStore('samples').get(id),
    tx.objectStore('responses').get(id),
    tx.objectStore('acks').get(id),
  ]);
  return s ?? r ?? a;
}

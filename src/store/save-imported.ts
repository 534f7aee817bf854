import { Sample, describeIssues } from '../schema';
import { OUTBOX_ROW_FORMAT, type AppDb, type OutboxRow } from './app-db';
import { StoreError, toWriteError } from './store-error';

export interface ImportedBatchResult {
  /** Samples written now, each with its outbox row. */
  readonly saved: number;
  /** Samples whose id this tablet already holds (imported before): left as they are. */
  readonly alreadyHeld: number;
}

/**
 * Saves a batch of imported samples with their outbox rows in ONE readwrite transaction with strict
 * durability, like saveDeviceRecord does for one record: either the whole batch is on the tablet and
 * queued for the server, or none of it is. A sample whose id is already held is skipped (import ids are
 * derived from the row, so a file imported twice adds nothing). Throws StoreError 'invalid-record' when
 * one sample is not valid (nothing is written), 'storage-full' when the disk is full.
 */
export async function saveImportedSamples(db: AppDb, samples: readonly Sample[], now: number = Date.now()): Promise<ImportedBatchResult> {
  const valid: Sample[] = [];
  for (const s of samples) {
    const parsed = Sample.safeParse(s);
    if (!parsed.success) throw new StoreError('invalid-record', `The imported samples were not saved: sample ${s.id} is not valid:\n${describeIssues(parsed.error)}`);
    valid.push(parsed.data);
  }
  const tx = db.transaction(['samples', 'outbox', 'meta'], 'readwrite', { durability: 'strict' });
  try {
    const store = tx.objectStore('samples');
    const held = await Promise.all(valid.map((s) => store.getKey(s.id)));
    const fresh = valid.filter((_, i) => held[i] === undefined);
    const meta = tx.objectStore('meta');
    const seqRow = await meta.get('deviceSeq');
    let deviceSeq = seqRow?.key === 'deviceSeq' ? seqRow.value : 0;
    const writes: Promise<unknown>[] = [];
    const seen = new Set<string>();
    for (const s of fresh) {
      if (seen.has(s.id)) continue; // the same id twice in one batch: written once
      seen.add(s.id);
      deviceSeq += 1;
      const row: OutboxRow = { id: s.id, format: OUTBOX_ROW_FORMAT, kind: 'sample', state: 'pending', deviceSeq, createdAt: now, attempts: 0, nextAttemptAt: now };
      writes.push(store.add(s), tx.objectStore('outbox').add(row));
    }
    writes.push(meta.put({ key: 'deviceSeq', value: deviceSeq }));
    await Promise.all(writes);
    await tx.done;
    return { saved: seen.size, alreadyHeld: valid.length - seen.size };
  } catch (e) {
    try {
      tx.abort();
    } catch {
      // already finished or aborted: nothing more to undo
    }
    await tx.done.catch(() => {}); // side promise: the error is reported below
    throw toWriteError(tx.error ?? e, 'The imported samples');
  }
}

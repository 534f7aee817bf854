import type { DeviceRecord, PushResult } from '../schema';
import { RECORD_STORE, type AppDb, type OutboxRow } from './app-db';
import { toWriteError } from './store-error';

/** An outbox row with the record it carries. */
export interface OutboxItem {
  row: OutboxRow;
  record: DeviceRecord;
}

async function commit<T>(tx: { done: Promise<void>; error: DOMException | null; abort(): void }, work: Promise<T>, what: string): Promise<T> {
  try {
    const value = await work;
    await tx.done;
    return value;
  } catch (e) {
    try {
      tx.abort();
    } catch {
      // already finished or aborted
    }
    await tx.done.catch(() => {}); // side promise: the error is thrown below
    throw toWriteError(tx.error ?? e, what);
  }
}

/**
 * Pending rows whose backoff has passed (nextAttemptAt <= now), oldest device sequence first, with their
 * records, leaving out `skipIds`. A row whose record is missing is left out (and stays pending, so it stays visible).
 */
export async function listDueOutbox(
  db: AppDb,
  now: number,
  limit: number,
  skipIds: ReadonlySet<string> = new Set(),
): Promise<OutboxItem[]> {
  const tx = db.transaction(['outbox', 'samples', 'responses', 'acks'], 'readonly');
  const range = IDBKeyRange.bound(['pending', -Infinity], ['pending', Infinity]);
  const due: OutboxItem[] = [];
  for await (const cursor of tx.objectStore('outbox').index('byStateSeq').iterate(range)) {
    const row = cursor.value;
    if (row.nextAttemptAt > now || skipIds.has(row.id)) continue;
    const record = await tx.objectStore(RECORD_STORE[row.kind]).get(row.id);
    if (record !== undefined) due.push({ row, record });
    if (due.length >= limit) break;
  }
  await tx.done;
  return due;
}

async function updateRows(db: AppDb, ids: readonly string[], what: string, change: (row: OutboxRow) => OutboxRow | undefined): Promise<number> {
  const tx = db.transaction('outbox', 'readwrite', { durability: 'strict' });
  const work = (async () => {
    let changed = 0;
    for (const id of ids) {
      const row = await tx.store.get(id);
      const next = row && change(row);
      if (next) {
        await tx.store.put(next);
        changed += 1;
      }
    }
    return changed;
  })();
  return commit(tx, work, what);
}

/** Pending rows become `sending`; counts the attempt. */
export function markSending(db: AppDb, ids: readonly string[], now: number): Promise<number> {
  return updateRows(db, ids, 'The outbox update', (row) =>
    row.state === 'pending' ? { ...row, state: 'sending', attempts: row.attempts + 1, lastAttemptAt: now } : undefined,
  );
}

export interface PushOutcome {
  acked: number;
  rejected: number;
  conflict: number;
}

/**
 * Records the server's per-record answers: stored/duplicate → acked with serverSeq (and the epoch);
 * rejected/conflict → terminal, with the reason kept and the row kept visible. Never deletes a row.
 */
export function applyPushResults(db: AppDb, results: readonly PushResult[], serverEpoch: string, now: number): Promise<PushOutcome> {
  const outcome: PushOutcome = { acked: 0, rejected: 0, conflict: 0 };
  const byId = new Map(results.map((r) => [r.id, r] as const));
  return updateRows(db, [...byId.keys()], 'The sync result', (row) => {
    const r = byId.get(row.id);
    if (!r || row.state === 'rejected' || row.state === 'conflict') return undefined;
    if (r.status === 'stored' || r.status === 'duplicate') {
      outcome.acked += 1;
      return {
        ...row,
        state: 'acked',
        ackedAt: now,
        ackedEpoch: serverEpoch,
        lastError: undefined,
        ...(r.serverSeq !== undefined ? { serverSeq: r.serverSeq } : {}),
      };
    }
    outcome[r.status] += 1;
    const reason = r.reason ?? (r.status === 'conflict' ? 'The server holds a different record with this id.' : 'Rejected by the server.');
    return { ...row, state: r.status, lastError: reason };
  }).then(() => outcome);
}

/** Rows whose send failed (or whose outcome is unknown) go back to pending with the error and a retry time. */
export function markSendFailed(db: AppDb, ids: readonly string[], error: string, nextAttemptAt: number): Promise<number> {
  return updateRows(db, ids, 'The outbox update', (row) =>
    row.state === 'pending' || row.state === 'sending' ? { ...row, state: 'pending', lastError: error, nextAttemptAt } : undefined,
  );
}

/** Marks rows rejected on this side (e.g. the server refused a single-record batch as a whole). */
export function markRejected(db: AppDb, ids: readonly string[], reason: string): Promise<number> {
  return updateRows(db, ids, 'The outbox update', (row) =>
    row.state === 'pending' || row.state === 'sending' ? { ...row, state: 'rejected', lastError: reason } : undefined,
  );
}

/**
 * Puts rejected rows back in the queue, for a person's "send again" after the cause was fixed (e.g. the
 * set-up the server was missing now exists). Conflicts are not re-queued: the server keeps its version.
 */
export function requeueRejected(db: AppDb, ids: readonly string[], now: number): Promise<number> {
  return updateRows(db, ids, 'The outbox update', (row) =>
    row.state === 'rejected' ? { ...row, state: 'pending', attempts: 0, nextAttemptAt: now } : undefined,
  );
}

async function idsInState(db: AppDb, state: OutboxRow['state']): Promise<string[]> {
  const range = IDBKeyRange.bound([state, -Infinity], [state, Infinity]);
  return db.getAllKeysFromIndex('outbox', 'byStateSeq', range);
}

/**
 * Rows left `sending` by a tab that died mid-send go back to pending (sync.md §2.1). Call only while no
 * sender runs (at start-up, or inside the sender lock).
 */
export async function resetSendingOnStart(db: AppDb): Promise<number> {
  const ids = await idsInState(db, 'sending');
  return updateRows(db, ids, 'The outbox update', (row) => (row.state === 'sending' ? { ...row, state: 'pending' } : undefined));
}

/** What adopting a server epoch did: first contact, same epoch, or a changed epoch (a restore). */
export type EpochChange = 'first' | 'same' | 'changed';

/**
 * Adopts the server epoch (sync.md §2.16). If it differs from the stored one, in ONE transaction: the pull
 * cursor goes back to 0 under the new epoch, and every row acked under another epoch becomes pending
 * again so it is re-sent (idempotent on the server). Safe to repeat.
 */
export async function adoptServerEpoch(db: AppDb, serverEpoch: string, now: number): Promise<EpochChange> {
  const tx = db.transaction(['outbox', 'meta'], 'readwrite', { durability: 'strict' });
  const work = (async (): Promise<EpochChange> => {
    const pull = await tx.objectStore('meta').get('pull');
    const known = pull?.key === 'pull' ? pull.value.serverEpoch : null;
    if (known === serverEpoch) return 'same';
    await tx.objectStore('meta').put({ key: 'pull', value: { cursor: 0, serverEpoch } });
    const range = IDBKeyRange.bound(['acked', -Infinity], ['acked', Infinity]);
    for await (const cursor of tx.objectStore('outbox').index('byStateSeq').iterate(range)) {
      if (cursor.value.ackedEpoch !== serverEpoch) {
        await cursor.update({ ...cursor.value, state: 'pending', attempts: 0, nextAttemptAt: now });
      }
    }
    return known === null ? 'first' : 'changed';
  })();
  return commit(tx, work, 'The server epoch');
}

export interface OutboxCounts {
  /** Not yet acknowledged: pending plus sending. */
  pending: number;
  rejected: number;
  conflict: number;
  acked: number;
}

export async function countOutbox(db: AppDb): Promise<OutboxCounts> {
  const index = db.transaction('outbox').store.index('byStateSeq');
  const count = (state: OutboxRow['state']) => index.count(IDBKeyRange.bound([state, -Infinity], [state, Infinity]));
  const [pending, sending, rejected, conflict, acked] = await Promise.all([
    count('pending'),
    count('sending'),
    count('rejected'),
    count('conflict'),
    count('acked'),
  ]);
  return { pending: pending + sending, rejected, conflict, acked };
}

/** Rows that need a person's attention: rejected or in conflict, oldest first. Never auto-deleted. */
export async function listOutboxProblems(db: AppDb): Promise<OutboxRow[]> {
  const index = db.transaction('outbox').store.index('byStateSeq');
  const [rejected, conflict] = await Promise.all(
    (['rejected', 'conflict'] as const).map((s) => index.getAll(IDBKeyRange.bound([s, -Infinity], [s, Infinity]))),
  );
  return [...(rejected ?? []), ...(conflict ?? [])].sort((a, b) => a.deviceSeq - b.deviceSeq);
}

/**
 * Outbox state per record id, for the two badges "saved on tablet" / "synced" (sync.md §0): an id with
 * no entry was not made on this tablet (pulled from the server, so synced by definition).
 */
export async function getOutboxStates(db: AppDb, ids: readonly string[]): Promise<Map<string, OutboxRow['state']>> {
  const store = db.transaction('outbox').store;
  const rows = await Promise.all(ids.map((id) => store.get(id)));
  const states = new Map<string, OutboxRow['state']>();
  for (const row of rows) if (row) states.set(row.id, row.state);
  return states;
}

export async function getOutboxRow(db: AppDb, id: string): Promise<OutboxRow | undefined> {
  return db.get('outbox', id);
}


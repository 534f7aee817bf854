import { afterEach, describe, expect, it } from 'vitest';
import {
  adoptServerEpoch,
  applyPushResults,
  countOutbox,
  getOutboxRow,
  getOutboxStates,
  getPullState,
  listDueOutbox,
  listOutboxProblems,
  markSendFailed,
  markSending,
  requeueRejected,
  resetSendingOnStart,
  saveDeviceRecord,
} from '../../src/store';
import { closeAll, freshDb, makeSample } from './helpers';

afterEach(closeAll);

async function dbWith(n: number) {
  const db = await freshDb();
  const samples = [];
  for (let i = 0; i < n; i++) {
    const s = makeSample();
    await saveDeviceRecord(db, s, 1_000);
    samples.push(s);
  }
  return { db, samples };
}

describe('outbox store', () => {
  it('lists due rows oldest first, with their records, up to the limit', async () => {
    const { db, samples } = await dbWith(3);
    const due = await listDueOutbox(db, 1_000, 2);
    expect(due.map((d) => d.row.id)).toEqual([samples[0]?.id, samples[1]?.id]);
    expect(due[0]?.record).toEqual(samples[0]);
    expect(await listDueOutbox(db, 999, 10)).toEqual([]);
  });

  it('moves rows pending → sending → acked and keeps them (never deletes)', async () => {
    const { db, samples } = await dbWith(2);
    const ids = samples.map((s) => s.id);
    await markSending(db, ids, 2_000);
    expect(await getOutboxRow(db, ids[0]!)).toMatchObject({ state: 'sending', attempts: 1, lastAttemptAt: 2_000 });
    expect(await listDueOutbox(db, 5_000, 10)).toEqual([]);
    const outcome = await applyPushResults(
      db,
      [
        { id: ids[0]!, status: 'stored', serverSeq: 7 },
        { id: ids[1]!, status: 'duplicate', serverSeq: 3 },
      ],
      'e1',
      3_000,
    );
    expect(outcome).toEqual({ acked: 2, rejected: 0, conflict: 0 });
    expect(await getOutboxRow(db, ids[0]!)).toMatchObject({ state: 'acked', serverSeq: 7, ackedEpoch: 'e1', ackedAt: 3_000 });
    expect(await countOutbox(db)).toEqual({ pending: 0, rejected: 0, conflict: 0, acked: 2 });
  });

  it('keeps rejected and conflicting rows visible with their reason, and never sends them again', async () => {
    const { db, samples } = await dbWith(2);
    const [a, b] = samples.map((s) => s.id) as [string, string];
    await markSending(db, [a, b], 1_000);
    await applyPushResults(db, [{ id: a, status: 'rejected', reason: 'Unknown characteristic' }, { id: b, status: 'conflict' }], 'e', 1_000);
    const problems = await listOutboxProblems(db);
    expect(problems.map((p) => [p.id, p.state])).toEqual([[a, 'rejected'], [b, 'conflict']]);
    expect(problems[0]?.lastError).toBe('Unknown characteristic');
    expect(problems[1]?.lastError).toMatch(/different record/);
    await markSendFailed(db, [a, b], 'x', 0);
    expect(await listDueOutbox(db, Infinity, 10)).toEqual([]);
    expect(await countOutbox(db)).toEqual({ pending: 0, rejected: 1, conflict: 1, acked: 0 });
  });

  it('puts failed sends back to pending with the error and retry time', async () => {
    const { db, samples } = await dbWith(1);
    const id = samples[0]!.id;
    await markSending(db, [id], 1_000);
    await markSendFailed(db, [id], 'Could not reach the sync server', 9_000);
    expect(await getOutboxRow(db, id)).toMatchObject({ state: 'pending', attempts: 1, nextAttemptAt: 9_000, lastError: 'Could not reach the sync server' });
    expect(await listDueOutbox(db, 8_999, 10)).toEqual([]);
    expect(await listDueOutbox(db, 9_000, 10)).toHaveLength(1);
  });

  it('resets rows left sending by a dead tab', async () => {
    const { db, samples } = await dbWith(2);
    await markSending(db, samples.map((s) => s.id), 1_000);
    expect(await resetSendingOnStart(db)).toBe(2);
    expect(await listDueOutbox(db, 1_000, 10)).toHaveLength(2);
  });

  it('on a new server epoch re-queues rows acked under the old one and resets the pull cursor', async () => {
    const { db, samples } = await dbWith(2);
    const [a, b] = samples.map((s) => s.id) as [string, string];
    expect(await adoptServerEpoch(db, 'e1', 0)).toBe('first');
    await markSending(db, [a], 1_000);
    await applyPushResults(db, [{ id: a, status: 'stored', serverSeq: 1 }], 'e1', 1_000);
    expect(await adoptServerEpoch(db, 'e1', 0)).toBe('same');
    expect(await getOutboxRow(db, a)).toMatchObject({ state: 'acked' });
    expect(await adoptServerEpoch(db, 'e2', 5_000)).toBe('changed');
    expect(await getOutboxRow(db, a)).toMatchObject({ state: 'pending', nextAttemptAt: 5_000, attempts: 0 });
    expect((await getOutboxRow(db, b))?.state).toBe('pending');
    expect(await getPullState(db)).toEqual({ cursor: 0, serverEpoch: 'e2' });
  });

  it('re-queues rejected rows on request, but never conflicts', async () => {
    const { db, samples } = await dbWith(2);
    const [a, b] = samples.map((s) => s.id) as [string, string];
    await markSending(db, [a, b], 1_000);
    await applyPushResults(db, [{ id: a, status: 'rejected', reason: 'Unknown characteristic' }, { id: b, status: 'conflict' }], 'e', 1_000);
    expect(await requeueRejected(db, [a, b], 7_000)).toBe(1);
    expect(await getOutboxRow(db, a)).toMatchObject({ state: 'pending', attempts: 0, nextAttemptAt: 7_000 });
    expect((await getOutboxRow(db, b))?.state).toBe('conflict');
  });

  it('tells the outbox state per id, and nothing for records not made here', async () => {
    const { db, samples } = await dbWith(2);
    const [a, b] = samples.map((s) => s.id) as [string, string];
    await markSending(db, [a], 1_000);
    await applyPushResults(db, [{ id: a, status: 'stored', serverSeq: 1 }], 'e', 1_000);
    const states = await getOutboxStates(db, [a, b, '01900000-0000-7000-8000-000000000001']);
    expect([...states]).toEqual([[a, 'acked'], [b, 'pending']]);
  });
});

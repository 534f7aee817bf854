import { afterEach, describe, expect, it } from 'vitest';
import type { DeviceRecord } from '../../src/schema';
import {
  countOutbox,
  getDeviceRecord,
  getOutboxRow,
  getPullState,
  getSetup,
  listOutboxProblems,
  saveDeviceRecord,
  setDeviceIdentity,
  type AppDb,
} from '../../src/store';
import { ApiError, createApiClient, type SyncApi } from '../../src/sync/api-client';
import { createSyncEngine, type LockManagerLike, type SyncEngineOptions } from '../../src/sync/sync-engine';
import { closeAll, freshDb, makeSample } from '../store/helpers';
import { BASE_URL, FakeSyncServer } from './fake-server';

afterEach(closeAll);

const TOKEN = 'device-token-1';

interface Harness {
  db: AppDb;
  server: FakeSyncServer;
  clock: { now: number };
  timers: { fn: () => void; ms: number }[];
  engine: ReturnType<typeof createSyncEngine>;
}

async function harness(overrides: Partial<SyncEngineOptions> = {}, db?: AppDb, server?: FakeSyncServer): Promise<Harness> {
  const theDb = db ?? (await freshDb());
  if (!db) await setDeviceIdentity(theDb, { deviceId: 'tab-1', deviceToken: TOKEN, siteId: 'plant-1', deviceName: 'Tablet 1' });
  const theServer = server ?? new FakeSyncServer();
  const clock = { now: Date.UTC(2026, 11, 2, 8) };
  const timers: Harness['timers'] = [];
  const engine = createSyncEngine({
    db: theDb,
    api: createApiClient({ baseUrl: BASE_URL, fetch: theServer.fetch, now: () => clock.now }),
    now: () => clock.now,
    random: () => 0.5,
    setTimeout: (fn, ms) => timers.push({ fn, ms }),
    clearTimeout: () => {},
    locks: null,
    windowTarget: null,
    documentTarget: null,
    ...overrides,
  });
  return { db: theDb, server: theServer, clock, timers, engine };
}

async function saveSamples(h: Harness, n: number, overrides: Partial<DeviceRecord> = {}): Promise<string[]> {
  const ids: string[] = [];
  for (let i = 0; i < n; i++) {
    const s = makeSample(overrides as never);
    await saveDeviceRecord(h.db, s, h.clock.now);
    ids.push(s.id);
  }
  return ids;
}

const recordEntriesOnServer = (server: FakeSyncServer) => server.log.filter((e) => e.entry.kind === 'record').length;

/** A lock manager shared by several engines, like navigator.locks across tabs of one origin. */
function sharedLocks(): LockManagerLike {
  let tail: Promise<unknown> = Promise.resolve();
  return {
    request<T>(_name: string, callback: () => Promise<T>): Promise<T> {
      const run = tail.then(callback);
      tail = run.catch(() => undefined);
      return run;
    },
  };
}

describe('sync engine', () => {
  it('offline, then online: every record reaches the server exactly once', async () => {
    const h = await harness({ batchSize: 100 });
    const ids = await saveSamples(h, 250);
    h.server.offline = true;
    const first = await h.engine.syncNow();
    expect(first.ok).toBe(false);
    expect(first.error?.code).toBe('offline');
    expect(h.engine.getStatus()).toMatchObject({ state: 'offline', pending: 250, lastSuccessAt: null });
    expect(h.server.records.size).toBe(0);

    h.server.offline = false;
    h.clock.now += 10 * 60_000;
    const second = await h.engine.syncNow();
    expect(second).toMatchObject({ ok: true, acked: 250, rejected: 0, conflict: 0, retryLater: 0 });
    expect(h.engine.getStatus()).toMatchObject({ state: 'idle', pending: 0, lastError: null, lastSuccessAt: h.clock.now });
    expect(h.server.records.size).toBe(250);
    expect(recordEntriesOnServer(h.server)).toBe(250);
    expect([...h.server.sendCounts().values()].every((n) => n === 1)).toBe(true);
    expect(h.server.pushes.map((p) => p.ids.length)).toEqual([100, 100, 50]);
    expect(new Set(ids)).toEqual(new Set(h.server.records.keys()));
  });

  it('keeps a failed batch pending with backoff: a timer run before the retry time sends nothing', async () => {
    const h = await harness();
    const [id] = await saveSamples(h, 1);
    h.server.fail503 = 1;
    const first = await h.engine.syncNow();
    expect(first.error?.code).toBe('server');
    const row = await getOutboxRow(h.db, id!);
    // Retry-After: 2 s from the server is the lower bound; full jitter with random 0.5 at attempt 0 is 500 ms.
    expect(row).toMatchObject({ state: 'pending', attempts: 1, nextAttemptAt: h.clock.now + 2_000 });
    await h.engine.syncNow();
    expect(h.server.pushes).toHaveLength(0);
    h.clock.now += 2_000;
    expect((await h.engine.syncNow()).acked).toBe(1);
  });

  it('answer lost after the server committed: the resend is a duplicate and the row is acked, with no extra rows', async () => {
    const h = await harness();
    const ids = await saveSamples(h, 5);
    h.server.dropResponsesAfterCommit = 1;
    const first = await h.engine.syncNow();
    expect(first.error?.code).toBe('offline');
    expect(h.server.records.size).toBe(5);
    expect((await countOutbox(h.db)).pending).toBe(5);

    h.clock.now += 60_000;
    const second = await h.engine.syncNow();
    expect(second).toMatchObject({ ok: true, acked: 5 });
    expect(recordEntriesOnServer(h.server)).toBe(5);
    expect([...h.server.sendCounts().values()]).toEqual([2, 2, 2, 2, 2]);
    for (const id of ids) {
      expect(await getOutboxRow(h.db, id)).toMatchObject({ state: 'acked', serverSeq: h.server.records.get(id)?.serverSeq });
    }
  });

  it('a rejected record stays visible with its reason and is not sent again', async () => {
    const h = await harness();
    h.server.rejectRecord = (r) => (r.kind === 'sample' && r.comment === 'bad gauge' ? 'Gauge not calibrated' : undefined);
    await saveSamples(h, 2);
    const [badId] = await saveSamples(h, 1, { comment: 'bad gauge' } as Partial<DeviceRecord>);
    const first = await h.engine.syncNow();
    expect(first).toMatchObject({ ok: true, acked: 2, rejected: 1 });
    expect(h.engine.getStatus()).toMatchObject({ pending: 0, rejected: 1 });
    const problems = await listOutboxProblems(h.db);
    expect(problems.map((p) => [p.id, p.state, p.lastError])).toEqual([[badId, 'rejected', 'Gauge not calibrated']]);

    const pushesBefore = h.server.pushes.length;
    for (let i = 0; i < 3; i++) {
      h.clock.now += 3_600_000;
      await h.engine.syncNow({ ignoreBackoff: true });
    }
    expect(h.server.pushes.length).toBe(pushesBefore);
    expect(await getDeviceRecord(h.db, badId!)).toBeDefined();
  });

  it('a conflict (same id, different content on the server) is kept as a terminal, visible state', async () => {
    const h = await harness();
    const mine = makeSample({ values: [10.02] });
    h.server.storeRecord({ ...mine, values: [99] });
    await saveDeviceRecord(h.db, mine, h.clock.now);
    const report = await h.engine.syncNow();
    expect(report.conflict).toBe(1);
    expect(await getOutboxRow(h.db, mine.id)).toMatchObject({ state: 'conflict' });
    expect(h.engine.getStatus().conflict).toBe(1);
    h.clock.now += 3_600_000;
    await h.engine.syncNow({ ignoreBackoff: true });
    expect(h.server.sendCounts().get(mine.id)).toBe(1);
    // The local record is not overwritten by the server's different version pulled back.
    expect(await getDeviceRecord(h.db, mine.id)).toEqual(mine);
  });

  it('a new server epoch (restore from backup) makes the tablet re-send what it keeps and pull again from 0', async () => {
    const h = await harness();
    const backup = h.server.snapshot();
    await saveSamples(h, 3);
    await h.engine.syncNow();
    expect(h.server.records.size).toBe(3);

    h.server.restore(backup); // the 3 records are lost on the server; epoch-2
    await saveSamples(h, 1);
    const report = await h.engine.syncNow();
    expect(report.epochChanged).toBe(true);
    expect(report.ok).toBe(true);
    expect(h.server.records.size).toBe(4);
    expect(h.server.pulls.at(-1)).toBe(0);
    expect(await getPullState(h.db)).toEqual({ cursor: 4, serverEpoch: 'epoch-2' });
    expect(await countOutbox(h.db)).toMatchObject({ pending: 0, acked: 4 });

    // Epoch change seen first by the pull (nothing to push): re-send and re-pull all the same.
    const backup2 = h.server.snapshot();
    h.server.restore({ ...backup2, records: new Map(), log: [], seq: 0 });
    const again = await h.engine.syncNow();
    expect(again.epochChanged).toBe(true);
    expect(h.server.records.size).toBe(4);
    expect(await getPullState(h.db)).toEqual({ cursor: 4, serverEpoch: 'epoch-3' });
  });

  it('concurrent syncNow calls do not send a record twice (one sender at a time)', async () => {
    const h = await harness({ batchSize: 10 });
    h.server.pushDelayMs = 5;
    await saveSamples(h, 30);
    await Promise.all([h.engine.syncNow(), h.engine.syncNow(), h.engine.syncNow()]);
    expect([...h.server.sendCounts().values()].every((n) => n === 1)).toBe(true);
    expect(h.server.sendCounts().size).toBe(30);
    expect(h.server.maxInFlightPushes).toBe(1);
  });

  it('two engines on one database (two tabs) take turns through the sender lock', async () => {
    const locks = sharedLocks();
    const a = await harness({ batchSize: 10, locks });
    const b = await harness({ batchSize: 10, locks }, a.db, a.server);
    a.server.pushDelayMs = 5;
    await saveSamples(a, 25);
    await Promise.all([a.engine.syncNow(), b.engine.syncNow()]);
    expect([...a.server.sendCounts().values()].every((n) => n === 1)).toBe(true);
    expect(a.server.records.size).toBe(25);
    expect(a.server.maxInFlightPushes).toBe(1);
  });

  it('pulls set-up and other tablets\' records page by page, skipping and reporting a bad entry', async () => {
    const h = await harness({ pullLimit: 2 });
    h.server.addSetup({ kind: 'site', id: 'plant-1', body: { id: 'plant-1', name: 'Plant 1' } });
    h.server.addRawLogEntry({ serverSeq: 2, serverTime: 'yesterday', entry: { kind: 'site' } });
    const other = makeSample({ deviceId: 'tab-2' });
    h.server.storeRecord(other);
    h.server.addSetup({ kind: 'line', id: 'line-1', body: { id: 'line-1', siteId: 'plant-1', name: 'Line 1' } });
    h.server.addSetup({ kind: 'site', id: 'plant-1', body: { id: 'plant-1', name: 'Plant One' } });
    const report = await h.engine.syncNow();
    expect(report.ok).toBe(true);
    expect(report.pulled).toBe(4);
    expect(report.skipped).toHaveLength(1);
    expect(report.skipped[0]?.serverSeq).toBe(2);
    expect(h.server.pulls).toEqual([0, 2, 4]);
    expect(await getPullState(h.db)).toEqual({ cursor: 5, serverEpoch: 'epoch-1' });
    expect(await getDeviceRecord(h.db, other.id)).toEqual(other);
    expect((await getSetup(h.db)).sites).toEqual([{ id: 'plant-1', name: 'Plant One' }]);
    // The next run asks only for what is new.
    await h.engine.syncNow();
    expect(h.server.pulls.at(-1)).toBe(5);
  });

  it('splits a batch the server refuses as a whole until the bad record stands alone', async () => {
    const h = await harness();
    const ids = await saveSamples(h, 5);
    const badId = ids[3]!;
    const api = createApiClient({ baseUrl: BASE_URL, fetch: h.server.fetch });
    const picky: SyncApi = {
      pullEntries: api.pullEntries,
      pushRecords: (token, request) =>
        request.records.some((r) => r.id === badId)
          ? Promise.reject(new ApiError('rejected', 'The sync server refused the request: body too large', { status: 413 }))
          : api.pushRecords(token, request),
    };
    const h2 = await harness({ api: picky }, h.db, h.server);
    const report = await h2.engine.syncNow();
    expect(report).toMatchObject({ acked: 4, rejected: 1 });
    expect(await getOutboxRow(h.db, badId)).toMatchObject({ state: 'rejected', lastError: expect.stringMatching(/too large/) });
  });

  it('sends each record with its device sequence number, so the server can tell which numbers never arrived', async () => {
    const h = await harness();
    const ids = await saveSamples(h, 3);
    const api = createApiClient({ baseUrl: BASE_URL, fetch: h.server.fetch });
    const sent: { id: string; seq: number | undefined }[] = [];
    const spy: SyncApi = {
      pullEntries: api.pullEntries,
      pushRecords: (token, request) => {
        request.records.forEach((r, i) => sent.push({ id: r.id, seq: request.deviceSeqs?.[i] }));
        return api.pushRecords(token, request);
      },
    };
    const h2 = await harness({ api: spy }, h.db, h.server);
    await h2.engine.syncNow();
    expect(sent).toEqual(ids.map((id, i) => ({ id, seq: i + 1 })));
  });

  it('does not turn the outbox into rejections when the push route answers 404 (wrong address)', async () => {
    const h = await harness();
    const ids = await saveSamples(h, 3);
    const api = createApiClient({ baseUrl: 'http://sync.test/wrong/prefix', fetch: h.server.fetch });
    const h2 = await harness({ api }, h.db, h.server);
    const report = await h2.engine.syncNow();
    expect(report.error?.code).toBe('rejected');
    expect(report.rejected).toBe(0);
    for (const id of ids) expect((await getOutboxRow(h.db, id))?.state).toBe('pending');
    expect(h2.engine.getStatus()).toMatchObject({ state: 'error', pending: 3, rejected: 0 });
  });

  it('estimates the clock offset from the server Date header and flags a skew over 2 minutes', async () => {
    const h = await harness();
    h.server.serverClock = () => h.clock.now + 30_000;
    await h.engine.syncNow();
    expect(h.engine.getStatus()).toMatchObject({ clockOffsetMs: 30_000, isClockSkewed: false });
    h.server.serverClock = () => h.clock.now - 5 * 60_000;
    await h.engine.syncNow();
    expect(h.engine.getStatus()).toMatchObject({ clockOffsetMs: -300_000, isClockSkewed: true });
  });

  it('stops with a clear error when the device token is refused, keeping the rows pending', async () => {
    const h = await harness();
    await saveSamples(h, 2);
    h.server.tokens.clear();
    const report = await h.engine.syncNow();
    expect(report.error?.code).toBe('unauthorized');
    expect(h.engine.getStatus()).toMatchObject({ state: 'error', pending: 2, lastErrorCode: 'unauthorized' });
  });

  it('reports a tablet that is not enrolled without calling the server', async () => {
    const db = await freshDb();
    const h = await harness({}, db);
    const report = await h.engine.syncNow();
    expect(report.error?.code).toBe('not-enrolled');
    expect(h.server.pushes).toHaveLength(0);
    expect(h.server.pulls).toHaveLength(0);
  });

  it('start(): syncs at once, on `online`, on becoming visible, and on a timer that backs off while failing', async () => {
    const win = new EventTarget();
    const doc = Object.assign(new EventTarget(), { visibilityState: 'visible' });
    const h = await harness({ windowTarget: win, documentTarget: doc, idleIntervalMs: 30_000 });
    const statuses: string[] = [];
    h.engine.subscribe((s) => statuses.push(s.state));
    await saveSamples(h, 1);
    h.engine.start();
    await expect.poll(() => h.server.records.size).toBe(1);
    await expect.poll(() => h.timers.length).toBe(1);
    expect(h.timers[0]?.ms).toBe(30_000);
    expect(statuses).toContain('syncing');

    h.server.offline = true;
    h.timers[0]!.fn();
    await expect.poll(() => h.timers.length).toBe(2);
    expect(h.engine.getStatus().state).toBe('offline');
    // First failure: full jitter over [0, 1 s) with random 0.5, held to the 1 s timer minimum.
    expect(h.timers[1]?.ms).toBe(1_000);

    h.server.offline = false;
    await saveSamples(h, 1);
    win.dispatchEvent(new Event('online'));
    await expect.poll(() => h.server.records.size).toBe(2);
    await expect.poll(() => h.engine.getStatus().state).toBe('idle');

    await saveSamples(h, 1);
    doc.dispatchEvent(new Event('visibilitychange'));
    await expect.poll(() => h.server.records.size).toBe(3);

    h.engine.stop();
    await saveSamples(h, 1);
    win.dispatchEvent(new Event('online'));
    await new Promise((r) => setTimeout(r, 20));
    expect(h.server.records.size).toBe(3);
  });
});

import { MAX_PULL_PAGE, MAX_PUSH_RECORDS } from '../schema';
import {
  adoptServerEpoch,
  applyPulledEntries,
  applyPushResults,
  countOutbox,
  getDeviceIdentity,
  getPullState,
  getSyncStatusRecord,
  listDueOutbox,
  markRejected,
  markSendFailed,
  markSending,
  resetSendingOnStart,
  setSyncStatusRecord,
  type AppDb,
  type OutboxItem,
  type SkippedEntry,
} from '../store';
import { ApiError, type ApiErrorCode, type SyncApi } from './api-client';
import { DEFAULT_BACKOFF, nextDelay, type BackoffOptions } from './backoff';
import { newRecordId } from './ids';

export type SyncState = 'idle' | 'syncing' | 'offline' | 'error';

/**
 * Why a run stopped, beyond the API's own codes. 'device-revoked': an administrator withdrew this tablet;
 * its unsent records stay in the outbox (pending, never dropped) and on its charts.
 */
export type SyncErrorCode = ApiErrorCode | 'not-enrolled' | 'storage' | 'server-misbehaving' | 'device-revoked';

/** The run's failure code for an API error: a withdrawn tablet is told apart from other refusals. */
function codeOf(error: ApiError): SyncErrorCode {
  return error.code === 'unauthorized' && error.details.serverCode === 'device-revoked' ? 'device-revoked' : error.code;
}

/** Plain data for the status line; `pending` counts records not yet acknowledged by the server. */
export interface SyncStatus {
  state: SyncState;
  pending: number;
  rejected: number;
  conflict: number;
  lastSuccessAt: number | null;
  lastError: string | null;
  lastErrorCode: SyncErrorCode | null;
  /** Server clock minus tablet clock (ms) from the last pull's Date header; null until known. */
  clockOffsetMs: number | null;
  /** The tablet clock is off by more than CLOCK_SKEW_LIMIT_MS: show it and flag it (sync.md §2.7). */
  isClockSkewed: boolean;
  progress?: { pushed: number; toPush: number; pulled: number };
}

export interface SyncReport {
  ok: boolean;
  /** Records the server confirmed (stored or duplicate) in this run. */
  acked: number;
  rejected: number;
  conflict: number;
  /** Records whose send failed or whose outcome is unknown; they stay pending. */
  retryLater: number;
  /** Pulled entries written (set-up plus other devices' records). */
  pulled: number;
  /** Pulled entries that failed validation and were skipped. */
  skipped: SkippedEntry[];
  /** The server's epoch changed (a restore): acked records were re-sent and the pull restarted at 0. */
  epochChanged: boolean;
  error?: { code: SyncErrorCode; message: string };
}

export interface SyncNowOptions {
  /** Send rows still waiting out their backoff too (after `online`, or when a person asks). */
  ignoreBackoff?: boolean;
}

/** The Web Locks API surface used (navigator.locks). */
export interface LockManagerLike {
  request<T>(name: string, callback: () => Promise<T>): Promise<T>;
}

interface EventTargetLike {
  addEventListener(type: string, listener: () => void): void;
  removeEventListener(type: string, listener: () => void): void;
}

export interface SyncEngineOptions {
  db: AppDb;
  api: SyncApi;
  now?: () => number;
  random?: () => number;
  setTimeout?: (fn: () => void, ms: number) => unknown;
  clearTimeout?: (handle: unknown) => void;
  /** Records per push (at most MAX_PUSH_RECORDS). */
  batchSize?: number;
  pullLimit?: number;
  /** Timer period while all is well (sync.md §3.5: 30 s). */
  idleIntervalMs?: number;
  backoff?: BackoffOptions;
  /** navigator.locks by default where it exists; null to use only the in-memory guard. */
  locks?: LockManagerLike | null;
  newBatchId?: () => string;
  /** Where `online` and `visibilitychange` come from; window and document by default. */
  windowTarget?: EventTargetLike | null;
  documentTarget?: (EventTargetLike & { visibilityState?: string }) | null;
}

export interface SyncEngine {
  syncNow(options?: SyncNowOptions): Promise<SyncReport>;
  start(): void;
  stop(): void;
  getStatus(): SyncStatus;
  /** Re-reads counts and the last sync result from the database (e.g. after a save). */
  refreshStatus(): Promise<SyncStatus>;
  subscribe(listener: (status: SyncStatus) => void): () => void;
}

/** Clock offsets beyond this are flagged (sync.md §2.7 suggests about 2 minutes). */
export const CLOCK_SKEW_LIMIT_MS = 2 * 60_000;

/** Name of the Web Lock that makes one tab at a time the sender (sync.md §2.14). */
export const SENDER_LOCK = 'plumbline-outbox-sender';
/** How often one run may see the epoch change before it gives up (a server flapping between epochs). */
const MAX_EPOCH_CHANGES_PER_RUN = 3;
const MIN_TIMER_MS = 1_000;

class RunFailure extends Error {
  constructor(
    readonly code: SyncErrorCode,
    message: string,
    readonly retryAfterMs?: number,
  ) {
    super(message);
  }
}

/** Statuses that blame the request body; a missing status (client-side validation) counts too. */
function isContentRefusal(status: number | undefined): boolean {
  return status === undefined || status === 400 || status === 413 || status === 422;
}

function defaultLocks(): LockManagerLike | null {
  const nav = (globalThis as { navigator?: { locks?: LockManagerLike } }).navigator;
  return nav?.locks ?? null;
}

/**
 * The sender and puller. A run pushes every due outbox row in batches, then pulls pages until the server
 * has no more. Rows are only ever marked acked from a server answer of our schema; nothing is deleted.
 * One run at a time per tab (in-memory guard) and per origin (Web Lock where available).
 */
export function createSyncEngine(options: SyncEngineOptions): SyncEngine {
  const { db, api } = options;
  const now = options.now ?? Date.now;
  const random = options.random ?? Math.random;
  const setTimer = options.setTimeout ?? ((fn: () => void, ms: number) => globalThis.setTimeout(fn, ms));
  const clearTimer = options.clearTimeout ?? ((h: unknown) => globalThis.clearTimeout(h as ReturnType<typeof setTimeout>));
  const batchSize = Math.max(1, Math.min(options.batchSize ?? 100, MAX_PUSH_RECORDS));
  const pullLimit = Math.max(1, Math.min(options.pullLimit ?? MAX_PULL_PAGE, MAX_PULL_PAGE));
  const idleIntervalMs = options.idleIntervalMs ?? 30_000;
  const backoff = options.backoff ?? DEFAULT_BACKOFF;
  const locks = options.locks === undefined ? defaultLocks() : options.locks;
  const newBatchId = options.newBatchId ?? newRecordId;
  const g = globalThis as { window?: EventTargetLike; document?: EventTargetLike & { visibilityState?: string } };
  const windowTarget = options.windowTarget === undefined ? (g.window ?? null) : options.windowTarget;
  const documentTarget = options.documentTarget === undefined ? (g.document ?? null) : options.documentTarget;

  let status: SyncStatus = {
    state: 'idle',
    pending: 0,
    rejected: 0,
    conflict: 0,
    lastSuccessAt: null,
    lastError: null,
    lastErrorCode: null,
    clockOffsetMs: null,
    isClockSkewed: false,
  };
  const listeners = new Set<(s: SyncStatus) => void>();
  let running: Promise<SyncReport> | null = null;
  let queued: Promise<SyncReport> | null = null;
  let queuedIgnoresBackoff = false;
  let started = false;
  let timer: unknown = undefined;
  let consecutiveFailures = 0;
  let lastRetryAfterMs: number | undefined;

  function emit(next: Partial<SyncStatus>): void {
    status = { ...status, ...next };
    for (const listener of listeners) listener(status);
  }

  async function readCounts(): Promise<Pick<SyncStatus, 'pending' | 'rejected' | 'conflict'>> {
    const c = await countOutbox(db);
    return { pending: c.pending, rejected: c.rejected, conflict: c.conflict };
  }

  async function run(opts: SyncNowOptions): Promise<SyncReport> {
    const report: SyncReport = { ok: false, acked: 0, rejected: 0, conflict: 0, retryLater: 0, pulled: 0, skipped: [], epochChanged: false };
    const startedAt = now();
    let pushed = 0;
    let pulled = 0;
    let toPush = 0;
    const progress = () => emit({ progress: { pushed, toPush, pulled } });
    /** Ids sent in this run: each row goes out once per run (again only after an epoch change). */
    let sentThisRun = new Set<string>();
    let epochChanges = 0;
    // The rows of a tablet last told it was withdrawn wait out a backoff that came from the withdrawal, not from a
    // busy server: once an admin reinstates it, they go at its next run, whatever started it.
    const ignoreBackoff = opts.ignoreBackoff === true || status.lastErrorCode === 'device-revoked';

    const noteEpoch = async (serverEpoch: string): Promise<boolean> => {
      const change = await adoptServerEpoch(db, serverEpoch, now());
      if (change !== 'changed') return false;
      report.epochChanged = true;
      sentThisRun = new Set();
      epochChanges += 1;
      if (epochChanges > MAX_EPOCH_CHANGES_PER_RUN) {
        throw new RunFailure('server-misbehaving', 'The sync server keeps changing its epoch; sync stopped for now.');
      }
      toPush = pushed + (await countOutbox(db)).pending;
      return true;
    };

    const failBatch = async (items: readonly OutboxItem[], error: ApiError | RunFailure): Promise<never> => {
      const attempts = Math.max(...items.map((i) => i.row.attempts + 1));
      const retryAfterMs = error instanceof ApiError ? error.details.retryAfterMs : error.retryAfterMs;
      const at = now() + nextDelay(attempts - 1, random, backoff, retryAfterMs);
      await markSendFailed(db, items.map((i) => i.row.id), error.message, at);
      report.retryLater += items.length;
      if (error instanceof ApiError) throw new RunFailure(codeOf(error), error.message, retryAfterMs);
      throw error;
    };

    const sendBatch = async (token: string, items: readonly OutboxItem[]): Promise<void> => {
      const ids = items.map((i) => i.row.id);
      for (const id of ids) sentThisRun.add(id);
      await markSending(db, ids, now());
      let response;
      try {
        response = await api.pushRecords(token, { batchId: newBatchId(), records: items.map((i) => i.record), deviceSeqs: items.map((i) => i.row.deviceSeq) });
      } catch (e) {
        const error = e instanceof ApiError ? e : new ApiError('bad-response', e instanceof Error ? e.message : String(e));
        if (error.code === 'rejected' && isContentRefusal(error.details.status)) {
          // The whole request was refused for its content (400/413/422): split it until the record at fault
          // stands alone (sync.md §3.4). Other 4xx (404 from a wrong address, 409, 410) retry later instead,
          // so a misconfigured server can never turn the whole outbox into rejections.
          if (items.length > 1) {
            await markSendFailed(db, ids, error.message, now());
            const half = Math.ceil(items.length / 2);
            await sendBatch(token, items.slice(0, half));
            await sendBatch(token, items.slice(half));
            return;
          }
          await markRejected(db, ids, error.message);
          report.rejected += 1;
          return;
        }
        await failBatch(items, error);
        return;
      }
      await noteEpoch(response.serverEpoch);
      const sent = new Set(ids);
      const outcome = await applyPushResults(db, response.results.filter((r) => sent.has(r.id)), response.serverEpoch, now());
      report.acked += outcome.acked;
      report.rejected += outcome.rejected;
      report.conflict += outcome.conflict;
      pushed += outcome.acked;
      const answered = new Set(response.results.map((r) => r.id));
      const unanswered = items.filter((i) => !answered.has(i.row.id));
      if (unanswered.length > 0) {
        // No answer for a record means its outcome is unknown: keep it and try later (same id).
        const attempts = Math.max(...unanswered.map((i) => i.row.attempts + 1));
        await markSendFailed(
          db,
          unanswered.map((i) => i.row.id),
          'The server gave no answer for this record.',
          now() + nextDelay(attempts - 1, random, backoff),
        );
        report.retryLater += unanswered.length;
      }
      progress();
    };

    const pushAll = async (token: string): Promise<void> => {
      for (;;) {
        const dueBy = ignoreBackoff ? Number.POSITIVE_INFINITY : now();
        const items = await listDueOutbox(db, dueBy, batchSize, sentThisRun);
        if (items.length === 0) return;
        await sendBatch(token, items);
      }
    };

    const pullAll = async (token: string): Promise<boolean> => {
      let { cursor, serverEpoch } = await getPullState(db);
      let mustPushAgain = false;
      for (;;) {
        const page = await api.pullEntries(token, cursor, pullLimit);
        if (page.serverDateMs !== undefined) {
          // The Date header has 1 s resolution: offsets under a second are noise, not skew.
          const clockOffsetMs = page.serverDateMs - now();
          emit({ clockOffsetMs, isClockSkewed: Math.abs(clockOffsetMs) > CLOCK_SKEW_LIMIT_MS });
        }
        if (page.serverEpoch !== serverEpoch) {
          const askedFrom = cursor;
          if (await noteEpoch(page.serverEpoch)) mustPushAgain = true;
          ({ cursor, serverEpoch } = await getPullState(db));
          // A page asked for from another cursor than the adopted one is asked for again.
          if (cursor !== askedFrom || serverEpoch !== page.serverEpoch) continue;
        }
        const applied = await applyPulledEntries(db, page.entries, page.next, page.serverEpoch, now());
        pulled += applied.setupWritten + applied.recordsWritten;
        report.pulled += applied.setupWritten + applied.recordsWritten;
        report.skipped.push(...applied.skipped);
        progress();
        if (!page.hasMore) return mustPushAgain;
        if (page.next <= cursor) {
          throw new RunFailure('bad-response', 'The sync server said there is more to pull but its cursor did not advance.');
        }
        cursor = page.next;
      }
    };

    emit({ state: 'syncing', progress: { pushed, toPush, pulled } });
    try {
      // Inside the sender guard nothing else is sending, so a `sending` row is left from a dead tab.
      await resetSendingOnStart(db);
      const identity = await getDeviceIdentity(db);
      if (!identity) throw new RunFailure('not-enrolled', 'This tablet is not enrolled with a sync server yet.');
      const counts = await readCounts();
      toPush = counts.pending;
      emit({ ...counts, progress: { pushed, toPush, pulled } });
      await pushAll(identity.deviceToken);
      // After an epoch change seen by the pull, re-send, then pull again (bounded by MAX_EPOCH_CHANGES_PER_RUN).
      while (await pullAll(identity.deviceToken)) await pushAll(identity.deviceToken);
      report.ok = report.retryLater === 0;
      if (!report.ok) report.error = { code: 'bad-response', message: 'Some records got no answer from the server; they will be sent again.' };
    } catch (e) {
      const failure =
        e instanceof RunFailure
          ? e
          : e instanceof ApiError
            ? new RunFailure(codeOf(e), e.message, e.details.retryAfterMs)
            : new RunFailure('storage', `Sync stopped by a storage problem: ${e instanceof Error ? e.message : String(e)}`);
      report.error = { code: failure.code, message: failure.message };
      lastRetryAfterMs = failure.retryAfterMs;
    }

    const finishedAt = now();
    const previous = await getSyncStatusRecord(db).catch(() => null);
    const lastSuccessAt = report.ok ? finishedAt : (previous?.lastSuccessAt ?? status.lastSuccessAt);
    const lastError = report.error?.message ?? null;
    consecutiveFailures = report.ok ? 0 : consecutiveFailures + 1;
    if (report.ok) lastRetryAfterMs = undefined;
    await setSyncStatusRecord(db, { lastSuccessAt, lastAttemptAt: startedAt, lastError }).catch(() => {
      // side write: the status line below still shows the outcome
    });
    const counts = await readCounts().catch(() => ({ pending: status.pending, rejected: status.rejected, conflict: status.conflict }));
    const state: SyncState = report.ok ? 'idle' : report.error?.code === 'offline' ? 'offline' : 'error';
    emit({ state, ...counts, lastSuccessAt, lastError, lastErrorCode: report.error?.code ?? null, progress: { pushed, toPush, pulled } });
    return report;
  }

  function runGuarded(opts: SyncNowOptions): Promise<SyncReport> {
    return locks ? locks.request(SENDER_LOCK, () => run(opts)) : run(opts);
  }

  function scheduleNext(): void {
    if (!started) return;
    if (timer !== undefined) clearTimer(timer);
    const delay =
      consecutiveFailures === 0
        ? idleIntervalMs
        : Math.max(MIN_TIMER_MS, nextDelay(consecutiveFailures - 1, random, backoff, lastRetryAfterMs));
    timer = setTimer(() => {
      timer = undefined;
      void syncNow();
    }, delay);
  }

  function syncNow(opts: SyncNowOptions = {}): Promise<SyncReport> {
    if (running) {
      // A call during a run gets one follow-up run (rows saved meanwhile go out), never a parallel one.
      queuedIgnoresBackoff ||= opts.ignoreBackoff === true;
      queued ??= running.then(() => {
        const next = { ignoreBackoff: queuedIgnoresBackoff };
        queued = null;
        queuedIgnoresBackoff = false;
        return syncNow(next);
      });
      return queued;
    }
    const current = runGuarded(opts).finally(() => {
      running = null;
      scheduleNext();
    });
    running = current;
    return current;
  }

  const onOnline = () => {
    consecutiveFailures = 0; // sync.md §3.4: reset the backoff on `online`
    void syncNow({ ignoreBackoff: true });
  };
  const onVisibility = () => {
    if (documentTarget?.visibilityState === undefined || documentTarget.visibilityState === 'visible') {
      void syncNow({ ignoreBackoff: true });
    }
  };

  return {
    syncNow,
    start() {
      if (started) return;
      started = true;
      windowTarget?.addEventListener('online', onOnline);
      documentTarget?.addEventListener('visibilitychange', onVisibility);
      void syncNow({ ignoreBackoff: true });
    },
    stop() {
      started = false;
      windowTarget?.removeEventListener('online', onOnline);
      documentTarget?.removeEventListener('visibilitychange', onVisibility);
      if (timer !== undefined) clearTimer(timer);
      timer = undefined;
    },
    getStatus: () => status,
    async refreshStatus() {
      const [counts, record] = await Promise.all([readCounts(), getSyncStatusRecord(db)]);
      emit({ ...counts, lastSuccessAt: record.lastSuccessAt, lastError: status.lastError ?? record.lastError });
      return status;
    },
    subscribe(listener) {
      listeners.add(listener);
      return () => {
        listeners.delete(listener);
      };
    },
  };
}

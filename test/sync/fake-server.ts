/**
 * An in-memory sync server speaking the wire protocol of src/schema/protocol.ts, with fault injection.
 * It answers through a `fetch` function, so the real api-client and sync engine run against it.
 */
import {
  DeviceRecord,
  PROTOCOL_HEADER,
  PROTOCOL_VERSION,
  PushRequest,
  type PulledEntry,
  type PushResult,
  type SetupRecord,
} from '../../src/schema';

type LogEntry = PulledEntry;

interface Snapshot {
  records: Map<string, { json: string; serverSeq: number }>;
  log: LogEntry[];
  seq: number;
}

const canonical = (value: unknown): string =>
  JSON.stringify(value, (_k, v: unknown) =>
    v && typeof v === 'object' && !Array.isArray(v)
      ? Object.fromEntries(Object.entries(v as Record<string, unknown>).sort(([a], [b]) => (a < b ? -1 : 1)))
      : v,
  );

export class FakeSyncServer {
  epoch = 'epoch-1';
  private seq = 0;
  private epochCounter = 1;
  records = new Map<string, { json: string; serverSeq: number }>();
  log: LogEntry[] = [];
  tokens = new Set(['device-token-1']);

  // Fault injection.
  /** Refuse connections (fetch throws like a network error). */
  offline = false;
  /** Commit the next N pushes, then lose the answer (the client sees a network error). */
  dropResponsesAfterCommit = 0;
  /** Answer the next N requests with 503. */
  fail503 = 0;
  /** Per-record rejection: a reason to reject, or undefined to accept. */
  rejectRecord: (record: DeviceRecord) => string | undefined = () => undefined;
  /** When set, answers carry an HTTP Date header from this clock. */
  serverClock: (() => number) | undefined = undefined;
  /** Control switch: with dedup off the server stores every copy it receives (must make the checks fail). */
  dedup = true;
  /** Pause inside a push (ms) so overlapping requests can be seen. */
  pushDelayMs = 0;

  // Observations.
  pushes: { batchId: string; ids: string[] }[] = [];
  pulls: number[] = [];
  inFlightPushes = 0;
  maxInFlightPushes = 0;

  /** How often each id was offered in a push (including repeats). */
  sendCounts(): Map<string, number> {
    const counts = new Map<string, number>();
    for (const p of this.pushes) for (const id of p.ids) counts.set(id, (counts.get(id) ?? 0) + 1);
    return counts;
  }

  private append(entry: LogEntry['entry']): number {
    this.seq += 1;
    this.log.push({ serverSeq: this.seq, serverTime: new Date(Date.UTC(2026, 11, 2) + this.seq).toISOString(), entry });
    return this.seq;
  }

  addSetup(entry: SetupRecord): number {
    return this.append(entry);
  }

  /** Puts a raw (possibly invalid) entry in the log, as a buggy server might. */
  addRawLogEntry(raw: unknown): void {
    this.seq += 1;
    this.log.push(raw as LogEntry);
  }

  /** Stores a record as if another device (or an earlier request) sent it. */
  storeRecord(record: DeviceRecord): number {
    const serverSeq = this.append({ kind: 'record', id: record.id, body: record });
    this.records.set(record.id, { json: canonical(record), serverSeq });
    return serverSeq;
  }

  snapshot(): Snapshot {
    return { records: new Map(this.records), log: [...this.log], seq: this.seq };
  }

  /** Restores a backup: everything after it is lost, and the epoch changes (sync.md §2.16). */
  restore(snapshot: Snapshot): void {
    this.records = new Map(snapshot.records);
    this.log = [...snapshot.log];
    this.seq = snapshot.seq;
    this.epochCounter += 1;
    this.epoch = `epoch-${this.epochCounter}`;
  }

  fetch = async (input: RequestInfo | URL, init?: RequestInit): Promise<Response> => {
    if (this.offline) throw new TypeError('fetch failed');
    const url = new URL(typeof input === 'string' ? input : input instanceof URL ? input.href : input.url);
    const headers = new Headers(init?.headers);
    const date: Record<string, string> = this.serverClock ? { date: new Date(this.serverClock()).toUTCString() } : {};
    const json = (status: number, body: unknown, extra: Record<string, string> = {}) =>
      new Response(JSON.stringify(body), { status, headers: { 'content-type': 'application/json', ...date, ...extra } });
    if (this.fail503 > 0) {
      this.fail503 -= 1;
      return json(503, { error: 'unavailable', message: 'Try later' }, { 'retry-after': '2' });
    }
    if (headers.get(PROTOCOL_HEADER) !== String(PROTOCOL_VERSION)) {
      return json(426, { error: 'protocol-mismatch', message: 'Update the app' });
    }
    const token = headers.get('authorization')?.replace(/^Bearer /, '');
    if (!token || !this.tokens.has(token)) return json(401, { error: 'unauthorized', message: 'Unknown device' });
    const path = url.pathname.replace(/^\/api\/v1/, '');
    if (init?.method === 'POST' && path === '/sync/push') return this.push(JSON.parse(String(init.body)), json);
    if ((init?.method ?? 'GET') === 'GET' && path === '/sync/pull') {
      const after = Number(url.searchParams.get('after'));
      const limit = Number(url.searchParams.get('limit'));
      this.pulls.push(after);
      const rest = this.log.filter((e) => e.serverSeq > after);
      const entries = rest.slice(0, limit);
      const last = entries[entries.length - 1];
      return json(200, { serverEpoch: this.epoch, entries, next: last ? last.serverSeq : after, hasMore: rest.length > entries.length });
    }
    return json(404, { error: 'not-found', message: path });
  };

  private async push(body: unknown, json: (status: number, body: unknown) => Response): Promise<Response> {
    const request = PushRequest.safeParse(body);
    if (!request.success) return json(400, { error: 'bad-request', message: 'Bad push body' });
    this.pushes.push({
      batchId: request.data.batchId,
      ids: request.data.records.map((r) => String((r as { id?: unknown }).id)),
    });
    this.inFlightPushes += 1;
    this.maxInFlightPushes = Math.max(this.maxInFlightPushes, this.inFlightPushes);
    try {
      if (this.pushDelayMs > 0) await new Promise((r) => setTimeout(r, this.pushDelayMs));
      const results: PushResult[] = request.data.records.map((raw) => {
        const parsed = DeviceRecord.safeParse(raw);
        const id = String((raw as { id?: unknown }).id);
        if (!parsed.success) return { id, status: 'rejected', reason: 'invalid record' };
        const reason = this.rejectRecord(parsed.data);
        if (reason) return { id, status: 'rejected', reason };
        const held = this.dedup ? this.records.get(id) : undefined;
        if (held) {
          return held.json === canonical(parsed.data)
            ? { id, status: 'duplicate', serverSeq: held.serverSeq }
            : { id, status: 'conflict', reason: 'A different record with this id is stored.' };
        }
        const serverSeq = this.append({ kind: 'record', id, body: parsed.data });
        this.records.set(id, { json: canonical(parsed.data), serverSeq });
        return { id, status: 'stored', serverSeq };
      });
      // Committed. Now maybe lose the answer on the way back.
      if (this.dropResponsesAfterCommit > 0) {
        this.dropResponsesAfterCommit -= 1;
        throw new TypeError('network connection lost');
      }
      return json(200, { serverEpoch: this.epoch, results });
    } finally {
      this.inFlightPushes -= 1;
    }
  }
}

export const BASE_URL = 'http://sync.test/api/v1';

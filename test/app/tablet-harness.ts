/**
 * A tablet for end-to-end tests of the app layer: createPlumblineApp on a fresh fake IndexedDB, with the
 * real api client and sync engine talking to the real sync server (src/server on a temporary SQLite file,
 * through fastify's inject). The server team's fixtures give the site, people and PINs
 * (test/server/fixtures.ts). Call useServerPerTest() at the top of a test file.
 */
import { afterEach, beforeEach, expect } from 'vitest';
import type { Sample } from '../../src/schema';
import { createPlumblineApp, type PlumblineApp, type SmallStorage, type SyncPort } from '../../src/app/create-app';
import { getDeviceRecord, saveDeviceRecord, type AppDb } from '../../src/store';
import { createAdminApi } from '../../src/sync/admin-api';
import { createApiClient } from '../../src/sync/api-client';
import { createRecordIdGenerator } from '../../src/sync/ids';
import { createSyncEngine } from '../../src/sync/sync-engine';
import { issueEnrolmentCode } from '../../src/server/routes/admin-enrolment-codes';
import { api, enrolDevice, SITE, startTestServer, testUuid, type TestServer } from '../server/fixtures';
import { closeAll, freshDb } from '../store/helpers';
import { BASELINE } from './helpers';

export const BASE = 'http://tablet.test/api/v1';
export const HOUR = 3_600_000;

let server: TestServer;
const open: Tablet[] = [];

/**
 * A fresh server per test (tablets pull every record of the site, so tests must not share one); after
 * each test, waits for the tablets' sync runs, stops them and closes their databases.
 */
export function useServerPerTest(): () => TestServer {
  beforeEach(async () => {
    server = await startTestServer();
  });
  afterEach(async () => {
    for (const t of open.splice(0)) {
      await t.settle();
      t.app.stop();
    }
    closeAll();
    await server.close();
  });
  return () => server;
}

/** A Map behind the sessionStorage / localStorage surface. */
export function memoryStorage(): SmallStorage & { map: Map<string, string> } {
  const map = new Map<string, string>();
  return { map, getItem: (k) => map.get(k) ?? null, setItem: (k, v) => void map.set(k, v), removeItem: (k) => void map.delete(k) };
}

export interface Tablet {
  app: PlumblineApp;
  db: AppDb;
  /** The tablet's clock (ms); tests move it. */
  clock: { t: number };
  /** Set online = false and every request fails as if the network were down. */
  net: { online: boolean };
  session: ReturnType<typeof memoryStorage>;
  /** Waits for every sync run the app started, and for the set-up reloads they trigger. */
  settle(): Promise<void>;
}


/** fetch over fastify.inject, with a switch to take the network away. */
function injectFetch(net: { online: boolean }): typeof fetch {
  return (async (input: string, init?: RequestInit) => {
    if (!net.online) throw new TypeError('fetch failed');
    const url = new URL(input);
    const res = await server.app.inject({
      method: (init?.method ?? 'GET') as 'GET' | 'POST',
      url: url.pathname + url.search,
      headers: init?.headers as Record<string, string>,
      ...(init?.body !== undefined ? { payload: String(init.body) } : {}),
    });
    const headers = new Headers();
    for (const [k, v] of Object.entries(res.headers)) if (v !== undefined) headers.set(k, String(v));
    // A 204 answer may carry no body at all (the Response constructor refuses even an empty one).
    return new Response(res.statusCode === 204 ? null : res.body, { status: res.statusCode, headers });
  }) as unknown as typeof fetch;
}

/** A tablet app on its own fake IndexedDB (or on `db`, to model a restart). */
export async function tablet(opts: { db?: AppDb; session?: ReturnType<typeof memoryStorage> } = {}): Promise<Tablet> {
  const db = opts.db ?? (await freshDb());
  const clock = { t: server.now().getTime() };
  const net = { online: true };
  const api = createApiClient({ baseUrl: BASE, fetch: injectFetch(net), now: () => clock.t });
  const inflight: Promise<unknown>[] = [];
  const track = <T>(p: Promise<T>): Promise<T> => {
    inflight.push(p);
    return p;
  };
  const createSync = (): SyncPort => {
    const engine = createSyncEngine({ db, api, now: () => clock.t, random: () => 0.5, locks: null, windowTarget: null, documentTarget: null });
    // No timers: runs happen only when the app asks, so each test can wait for all of them.
    return {
      syncNow: () => track(engine.syncNow()),
      start: () => void track(engine.syncNow({ ignoreBackoff: true })),
      stop: () => engine.stop(),
      getStatus: () => engine.getStatus(),
      subscribe: (l) => engine.subscribe(l),
    };
  };
  const ids = createRecordIdGenerator(() => clock.t);
  const session = opts.session ?? memoryStorage();
  const adminApi = createAdminApi({ baseUrl: BASE, fetch: injectFetch(net), now: () => clock.t });
  const app = createPlumblineApp({ db, api, adminApi, createSync, now: () => clock.t, newId: ids, session, prefs: memoryStorage() });
  // The app also starts work it does not return (the reload after a sync run, open(), selectStation()):
  // settle waits until no sync run is pending and the state has been quiet for a while.
  let changes = 0;
  app.subscribe(() => void changes++);
  const settle = async () => {
    for (let seen = -1, seenChanges = -1; seen !== inflight.length || seenChanges !== changes; ) {
      seen = inflight.length;
      await Promise.allSettled(inflight);
      seenChanges = changes;
      await new Promise((r) => setTimeout(r, 25));
    }
  };
  const t = { app, db, clock, net, session, settle };
  open.push(t);
  return t;
}

export async function enrolled(): Promise<Tablet> {
  const t = await tablet();
  await t.app.start();
  const { code } = await issueEnrolmentCode(server.store, SITE, 'p-adm', server.now());
  expect(await t.app.actions.enrol(code, 'Press 4 tablet')).toBe(true);
  await t.settle();
  return t;
}

export async function signedIn(login = 'odile', pin = '1234'): Promise<Tablet> {
  const t = await enrolled();
  expect(await t.app.actions.signIn(login, pin)).toBe(true);
  return t;
}

/**
 * Twenty in-control lengths saved as if recorded on this tablet over the last 20 hours, then a sync run
 * (after which the app re-reads what it shows). Records only reach IndexedDB through the app or a sync.
 */
export async function seedBaseline(t: Tablet): Promise<string[]> {
  const deviceId = t.app.getState().device!.deviceId;
  const ids = createRecordIdGenerator(() => t.clock.t - 21 * HOUR);
  const saved: string[] = [];
  for (const [i, v] of BASELINE.entries()) {
    const id = ids();
    await saveDeviceRecord(t.db, {
      kind: 'sample', id, characteristicId: 'ch-len', takenAt: new Date(t.clock.t - (20 - i) * HOUR).toISOString(),
      recordedBy: 'p-op', deviceId, values: [v],
    }, t.clock.t); // the outbox row is due by the tablet's clock, as the app's own saves are
    saved.push(id);
  }
  await t.app.actions.syncNow();
  await t.settle();
  return saved;
}

/** Seeds the baseline, signs in and records a length far above the limits. */
export async function withSignal(login = 'odile', pin = '1234') {
  const t = await enrolled();
  const baseline = await seedBaseline(t);
  expect(await t.app.actions.signIn(login, pin)).toBe(true);
  expect(await t.app.actions.record('ch-len', { values: [11] })).toBe(true);
  const prompt = t.app.getState().prompt!;
  expect(prompt).toBeDefined();
  return { t, baseline, prompt };
}

/** Another tablet pushes a sample to the server; this tablet then syncs and shows it. */
export async function fromAnotherTablet(t: Tablet, sample: Partial<Sample> & Pick<Sample, 'characteristicId' | 'takenAt'>): Promise<void> {
  const other = await enrolDevice(server, 'Tablet 2');
  const record: Sample = { kind: 'sample', id: createRecordIdGenerator(() => Date.parse(sample.takenAt))(), recordedBy: 'p-op', deviceId: other.deviceId, ...sample };
  const res = await api(server, 'POST', '/api/v1/sync/push', { device: other.deviceToken, body: { batchId: testUuid(), records: [record] } });
  expect(res.json()).toMatchObject({ results: [{ id: record.id, status: 'stored' }] });
  await t.app.actions.syncNow();
  await t.settle();
  expect(await getDeviceRecord(t.db, record.id)).toBeDefined();
}

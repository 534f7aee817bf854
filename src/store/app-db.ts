import { openDB, type DBSchema, type IDBPDatabase } from 'idb';
import type { Acknowledgement, DeviceRecordKind, Response, Sample, SetupRecord } from '../schema';

/** Where an outbox row is: waiting, in flight, confirmed by the server, or terminal with a reason. */
export type OutboxState = 'pending' | 'sending' | 'acked' | 'rejected' | 'conflict';

/** Version of the outbox row layout, so a later upgrade can migrate rows it does not know (sync.md §2.3). */
export const OUTBOX_ROW_FORMAT = 1;

/** One device record waiting for (or having had) the server's answer. Keyed by the record id. */
export interface OutboxRow {
  id: string;
  format: typeof OUTBOX_ROW_FORMAT;
  kind: DeviceRecordKind;
  state: OutboxState;
  /** Per-device counter allocated in the same transaction as the record. */
  deviceSeq: number;
  createdAt: number;
  /** Sends started (incremented by markSending). */
  attempts: number;
  /** Epoch ms before which the row is not sent again (backoff). */
  nextAttemptAt: number;
  lastAttemptAt?: number;
  /** Last transport error, or the server's reason for a rejection or conflict. */
  lastError?: string;
  serverSeq?: number;
  ackedAt?: number;
  /** The server epoch under which the ack was given (sync.md §2.16). */
  ackedEpoch?: string;
}

/** One set-up entity as last pulled: only the version with the highest serverSeq is kept. */
export type SetupRow = SetupRecord & { serverSeq: number; serverTime: string };

export interface DeviceIdentity {
  deviceId: string;
  deviceToken: string;
  siteId: string;
  deviceName: string;
}

export interface PullState {
  /** Last serverSeq written together with its data. */
  cursor: number;
  /** Epoch the cursor and the acks belong to; null before the first contact. */
  serverEpoch: string | null;
}

export interface SyncStatusRecord {
  lastSuccessAt: number | null;
  lastAttemptAt: number | null;
  lastError: string | null;
}

/** A person who signed in on this tablet while online, kept so they can sign in again offline. */
export interface SignedInPerson {
  personId: string;
  login: string;
  name: string;
  role: 'operator' | 'supervisor' | 'engineer' | 'admin';
  offlineVerifier: { salt: string; hash: string; iterations: number };
  signedInAt: number;
}

/** The meta store holds a few singletons and one row per signed-in person, told apart by key. */
export type MetaRow =
  | { key: 'device'; value: DeviceIdentity }
  | { key: 'deviceSeq'; value: number }
  | { key: 'pull'; value: PullState }
  | { key: 'syncStatus'; value: SyncStatusRecord }
  | { key: `person:${string}`; value: SignedInPerson };

export interface PlumblineDBSchema extends DBSchema {
  samples: { key: string; value: Sample; indexes: { byCharacteristicTakenAt: [string, string] } };
  responses: { key: string; value: Response; indexes: { byCharacteristic: string; bySample: string } };
  acks: { key: string; value: Acknowledgement; indexes: { byCharacteristic: string; byResponse: string } };
  setup: { key: [string, string]; value: SetupRow; indexes: { byKind: string } };
  outbox: { key: string; value: OutboxRow; indexes: { byStateSeq: [string, number] } };
  meta: { key: string; value: MetaRow };
}

export type AppDb = IDBPDatabase<PlumblineDBSchema>;

export const DB_NAME = 'plumbline';
export const DB_VERSION = 1;

/** The object store that holds each kind of device record. */
export const RECORD_STORE = { sample: 'samples', response: 'responses', ack: 'acks' } as const satisfies Record<
  DeviceRecordKind,
  'samples' | 'responses' | 'acks'
>;

/**
 * Schema migrations, additive only (sync.md §2.3): each step creates what its version adds and never
 * deletes a store, so queued records survive every upgrade.
 * @param oldVersion Version of the database before this upgrade (0 for a new database).
 */
export function upgradeAppDb(db: IDBPDatabase<PlumblineDBSchema>, oldVersion: number): void {
  if (oldVersion < 1) {
    const samples = db.createObjectStore('samples', { keyPath: 'id' });
    samples.createIndex('byCharacteristicTakenAt', ['characteristicId', 'takenAt']);
    const responses = db.createObjectStore('responses', { keyPath: 'id' });
    responses.createIndex('byCharacteristic', 'characteristicId');
    responses.createIndex('bySample', 'sampleId');
    const acks = db.createObjectStore('acks', { keyPath: 'id' });
    acks.createIndex('byCharacteristic', 'characteristicId');
    acks.createIndex('byResponse', 'responseId');
    const setup = db.createObjectStore('setup', { keyPath: ['kind', 'id'] });
    setup.createIndex('byKind', 'kind');
    const outbox = db.createObjectStore('outbox', { keyPath: 'id' });
    outbox.createIndex('byStateSeq', ['state', 'deviceSeq']);
    db.createObjectStore('meta', { keyPath: 'key' });
  }
  // Version 2 and later: add `if (oldVersion < 2) { ... }` here; never delete or recreate a store.
}

export interface OpenAppDbHooks {
  /** Another tab wants a newer version; this connection has already closed itself. Prompt a reload. */
  onVersionChange?: () => void;
  /** An older tab keeps the database open; the open keeps waiting. Ask the user to close other tabs. */
  onBlocked?: () => void;
  /** The browser closed the connection abnormally (e.g. WebKit's lost connection): reopen, then reload. */
  onTerminated?: () => void;
}

/**
 * Opens (and upgrades) the app database. The connection closes itself when a newer version asks for it
 * (sync.md §2.4); a `blocked` open keeps waiting rather than failing, so nothing is dropped.
 */
export function openAppDb(name: string = DB_NAME, hooks: OpenAppDbHooks = {}): Promise<AppDb> {
  return openDB<PlumblineDBSchema>(name, DB_VERSION, {
    upgrade(db, oldVersion) {
      upgradeAppDb(db, oldVersion);
    },
    blocked() {
      hooks.onBlocked?.();
    },
    blocking(_current, _next, event) {
      // The event's target is this raw connection. Transactions already started still finish:
      // close() lets them complete before the connection ends.
      (event.target as IDBDatabase).close();
      hooks.onVersionChange?.();
    },
    terminated() {
      hooks.onTerminated?.();
    },
  });
}

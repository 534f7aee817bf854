import type { AppDb, DeviceIdentity, MetaRow, PullState, SignedInPerson, SyncStatusRecord } from './app-db';
import { toWriteError } from './store-error';

async function putMeta(db: AppDb, row: MetaRow, what: string): Promise<void> {
  const tx = db.transaction('meta', 'readwrite', { durability: 'strict' });
  try {
    await Promise.all([tx.store.put(row), tx.done]);
  } catch (e) {
    throw toWriteError(tx.error ?? e, what);
  }
}

export async function getDeviceIdentity(db: AppDb): Promise<DeviceIdentity | undefined> {
  const row = await db.get('meta', 'device');
  return row?.key === 'device' ? row.value : undefined;
}

export async function setDeviceIdentity(db: AppDb, identity: DeviceIdentity): Promise<void> {
  await putMeta(db, { key: 'device', value: identity }, 'The device enrolment');
}

/** Last device sequence number handed out (0 when none). */
export async function getDeviceSeq(db: AppDb): Promise<number> {
  const row = await db.get('meta', 'deviceSeq');
  return row?.key === 'deviceSeq' ? row.value : 0;
}

export async function getPullState(db: AppDb): Promise<PullState> {
  const row = await db.get('meta', 'pull');
  return row?.key === 'pull' ? row.value : { cursor: 0, serverEpoch: null };
}

const EMPTY_STATUS: SyncStatusRecord = { lastSuccessAt: null, lastAttemptAt: null, lastError: null };

export async function getSyncStatusRecord(db: AppDb): Promise<SyncStatusRecord> {
  const row = await db.get('meta', 'syncStatus');
  return row?.key === 'syncStatus' ? row.value : EMPTY_STATUS;
}

export async function setSyncStatusRecord(db: AppDb, status: SyncStatusRecord): Promise<void> {
  await putMeta(db, { key: 'syncStatus', value: status }, 'The sync status');
}

const personKey = (login: string) => `person:${login.toLowerCase()}` as const;

/** Keeps a person who signed in online, with their offline verifier, keyed by login (case-insensitive). */
export async function saveSignedInPerson(db: AppDb, person: SignedInPerson): Promise<void> {
  await putMeta(db, { key: personKey(person.login), value: person }, 'The sign-in');
}

export async function getSignedInPerson(db: AppDb, login: string): Promise<SignedInPerson | undefined> {
  const row = await db.get('meta', personKey(login));
  return row && row.key.startsWith('person:') ? (row.value as SignedInPerson) : undefined;
}

export async function listSignedInPeople(db: AppDb): Promise<SignedInPerson[]> {
  const rows = await db.getAll('meta', IDBKeyRange.bound('person:', 'person:\uffff'));
  return rows.map((r) => r.value as SignedInPerson);
}

export async function removeSignedInPerson(db: AppDb, login: string): Promise<void> {
  const tx = db.transaction('meta', 'readwrite', { durability: 'strict' });
  await Promise.all([tx.store.delete(personKey(login)), tx.done]);
}

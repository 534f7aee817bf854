import { afterEach, describe, expect, it } from 'vitest';
import {
  getDeviceIdentity,
  getSignedInPerson,
  getSyncStatusRecord,
  listSignedInPeople,
  removeSignedInPerson,
  saveSignedInPerson,
  setDeviceIdentity,
  setSyncStatusRecord,
  type SignedInPerson,
} from '../../src/store';
import { closeAll, freshDb } from './helpers';

afterEach(closeAll);

const ann: SignedInPerson = {
  personId: 'p-ann',
  login: 'Ann',
  name: 'Ann Example',
  role: 'operator',
  offlineVerifier: { salt: '00ff', hash: 'ab'.repeat(32), iterations: 100_000 },
  signedInAt: 5,
};

describe('meta store', () => {
  it('keeps the device identity', async () => {
    const db = await freshDb();
    expect(await getDeviceIdentity(db)).toBeUndefined();
    const identity = { deviceId: 'dev-1', deviceToken: 'tok', siteId: 'plant-1', deviceName: 'Tablet 1' };
    await setDeviceIdentity(db, identity);
    expect(await getDeviceIdentity(db)).toEqual(identity);
  });

  it('keeps signed-in people by login, case-insensitively, apart from the singletons', async () => {
    const db = await freshDb();
    await setDeviceIdentity(db, { deviceId: 'dev-1', deviceToken: 'tok', siteId: 'plant-1', deviceName: 'Tablet 1' });
    await saveSignedInPerson(db, ann);
    await saveSignedInPerson(db, { ...ann, personId: 'p-bo', login: 'bo', name: 'Bo' });
    expect(await getSignedInPerson(db, 'ANN')).toEqual(ann);
    expect((await listSignedInPeople(db)).map((p) => p.personId).sort()).toEqual(['p-ann', 'p-bo']);
    await removeSignedInPerson(db, 'ann');
    expect(await getSignedInPerson(db, 'ann')).toBeUndefined();
    expect(await listSignedInPeople(db)).toHaveLength(1);
  });

  it('keeps the sync status record', async () => {
    const db = await freshDb();
    expect(await getSyncStatusRecord(db)).toEqual({ lastSuccessAt: null, lastAttemptAt: null, lastError: null });
    await setSyncStatusRecord(db, { lastSuccessAt: 1, lastAttemptAt: 2, lastError: 'x' });
    expect(await getSyncStatusRecord(db)).toEqual({ lastSuccessAt: 1, lastAttemptAt: 2, lastError: 'x' });
  });
});

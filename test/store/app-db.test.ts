import 'fake-indexeddb/auto';
import { IDBFactory } from 'fake-indexeddb';
import { openDB } from 'idb';
import { afterEach, describe, expect, it } from 'vitest';
import { DB_VERSION, openAppDb, saveDeviceRecord, type AppDb } from '../../src/store';
import { makeSample } from './helpers';

const toClose: { close(): void }[] = [];
afterEach(() => {
  for (const c of toClose.splice(0)) c.close();
});

describe('openAppDb()', () => {
  it('creates every store and index at version 1', async () => {
    globalThis.indexedDB = new IDBFactory();
    const db = await openAppDb('app-db-shape');
    toClose.push(db);
    expect(db.version).toBe(DB_VERSION);
    expect([...db.objectStoreNames].sort()).toEqual(['acks', 'meta', 'outbox', 'responses', 'samples', 'setup']);
    const tx = db.transaction(['samples', 'acks', 'outbox']);
    expect([...tx.objectStore('samples').indexNames]).toEqual(['byCharacteristicTakenAt']);
    expect([...tx.objectStore('acks').indexNames].sort()).toEqual(['byCharacteristic', 'byResponse']);
    expect([...tx.objectStore('outbox').indexNames]).toEqual(['byStateSeq']);
  });

  it('closes itself when a newer version asks, so the upgrade proceeds and the outbox survives', async () => {
    globalThis.indexedDB = new IDBFactory();
    let versionChangeSeen = false;
    const v1: AppDb = await openAppDb('app-db-upgrade', { onVersionChange: () => (versionChangeSeen = true) });
    await saveDeviceRecord(v1, makeSample());
    // A later app version opening the same database with an extra (additive) step.
    let blocked = false;
    const v2 = await openDB('app-db-upgrade', DB_VERSION + 1, {
      upgrade(db) {
        db.createObjectStore('later-store');
      },
      blocked: () => (blocked = true),
    });
    toClose.push(v2);
    expect(versionChangeSeen).toBe(true);
    expect(blocked).toBe(false);
    expect(v2.objectStoreNames.contains('outbox')).toBe(true);
    expect(await v2.count('outbox')).toBe(1);
  });
  // The `blocked` path of openAppDb cannot be reached at DB_VERSION 1 (no older version exists to block it);
  // add that test together with version 2.
});

import 'fake-indexeddb/auto';
import { IDBFactory } from 'fake-indexeddb';
import { openAppDb, type AppDb } from '../../src/store';
import type { Acknowledgement, Response, Sample } from '../../src/schema';
import { createRecordIdGenerator } from '../../src/sync/ids';

let dbCount = 0;
const open: AppDb[] = [];

/** A fresh database on a fresh fake IndexedDB factory (stack.md P6: isolation per test). */
export async function freshDb(): Promise<AppDb> {
  globalThis.indexedDB = new IDBFactory();
  const db = await openAppDb(`plumbline-test-${++dbCount}`);
  open.push(db);
  return db;
}

/** Closes every connection opened by freshDb (call in afterEach, or open/delete will block). */
export function closeAll(): void {
  for (const db of open.splice(0)) db.close();
}

let clock = Date.UTC(2026, 11, 2, 8, 0, 0);
const nextId = createRecordIdGenerator(() => clock++, (b) => {
  for (let i = 0; i < b.length; i++) b[i] = (i * 37 + clock) & 0xff;
});

export const newId = (): string => nextId();

export function makeSample(overrides: Partial<Sample> = {}): Sample {
  return {
    kind: 'sample',
    id: newId(),
    characteristicId: 'bore-dia',
    takenAt: '2026-12-02T08:00:00.000Z',
    recordedBy: 'op-1',
    deviceId: 'tab-1',
    values: [10.01],
    ...overrides,
  };
}

export function makeResponse(sampleId: string, overrides: Partial<Response> = {}): Response {
  return {
    kind: 'response',
    id: newId(),
    characteristicId: 'bore-dia',
    sampleId,
    signals: [{ rule: 'we1', explanation: 'One point beyond 3 sigma', centre: 10, ucl: 10.3, lcl: 9.7, sampleIds: [sampleId] }],
    whatHappened: 'Tool wear',
    causeCategory: 'Machine',
    action: 'Changed the insert',
    respondedBy: 'op-1',
    respondedAt: '2026-12-02T08:05:00.000Z',
    deviceId: 'tab-1',
    ...overrides,
  };
}

export function makeAck(responseId: string, overrides: Partial<Acknowledgement> = {}): Acknowledgement {
  return {
    kind: 'ack',
    id: newId(),
    responseId,
    characteristicId: 'bore-dia',
    by: 'sup-1',
    at: '2026-12-02T09:00:00.000Z',
    deviceId: 'tab-1',
    ...overrides,
  };
}

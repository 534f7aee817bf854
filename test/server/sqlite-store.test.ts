import { createHash } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { contentHash } from '../../src/server/canonical-json';
import { MIGRATIONS } from '../../src/server/store/migrations';
import { applyMigrations, openSqliteStore, type SqliteStore } from '../../src/server/store/sqlite-store';
import { makeSample } from './fixtures';
import { describeServerStoreContract } from './store-contract';

describeServerStoreContract('SQLite', async () => {
  const dir = mkdtempSync(join(tmpdir(), 'plumbline-contract-'));
  const store = openSqliteStore(join(dir, 'store.sqlite'));
  return {
    store,
    dispose: async () => {
      await store.close();
      rmSync(dir, { recursive: true, force: true });
    },
  };
});

let dir: string;
let path: string;
let store: SqliteStore;
beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'plumbline-store-'));
  path = join(dir, 'store.sqlite');
  store = openSqliteStore(path);
});
afterEach(async () => {
  await store.close();
  rmSync(dir, { recursive: true, force: true });
});

const item = (record = makeSample('dev-1')) => ({ record, siteId: 's', contentHash: contentHash(record), deviceId: 'dev-1', personId: 'p', clientTime: record.takenAt });

describe('openSqliteStore()', () => {
  it('runs in WAL mode with synchronous=FULL', () => {
    expect(store.db.pragma('journal_mode', { simple: true })).toBe('wal');
    // source: SQLite PRAGMA synchronous documentation: FULL is 2 — from memory
    expect(store.db.pragma('synchronous', { simple: true })).toBe(2);
  });

  it('applies every migration once and keeps the epoch and data across a reopen', async () => {
    const epoch = await store.getServerEpoch();
    expect(epoch).toMatch(/^[A-Za-z0-9_-]{16}$/);
    await store.insertRecords([item()], '2026-12-01T00:00:00.000Z');
    await store.close();
    store = openSqliteStore(path);
    expect(await store.getServerEpoch()).toBe(epoch);
    expect(applyMigrations(store.db, MIGRATIONS)).toBe(0);
    const versions = store.db.prepare('SELECT version FROM schema_migrations ORDER BY version').all() as { version: number }[];
    expect(versions.map((v) => v.version)).toEqual(MIGRATIONS.map((m) => m.version));
    expect((await store.readLog('s', 0, 10)).length).toBe(1);
  });

  it('gives a fresh database a different epoch', async () => {
    const other = openSqliteStore(join(dir, 'other.sqlite'));
    expect(await other.getServerEpoch()).not.toBe(await store.getServerEpoch());
    await other.close();
  });
});

describe('insertRecords()', () => {
  it('handles a repeat inside one batch: stored, then duplicate or conflict', async () => {
    const a = makeSample('dev-1');
    const changed = { ...a, values: [99] };
    const out = await store.insertRecords([item(a), item(a), item(changed)], '2026-12-01T00:00:00.000Z');
    expect(out.map((o) => o.status)).toEqual(['stored', 'duplicate', 'conflict']);
    expect(out[1]?.serverSeq).toBe(out[0]?.serverSeq);
  });

  it('rolls the whole batch back when the transaction fails, so no serverSeq is used up', async () => {
    const good = item();
    const broken = { ...item(), siteId: null as unknown as string }; // site_id is NOT NULL
    await expect(store.insertRecords([good, broken], '2026-12-01T00:00:00.000Z')).rejects.toThrow();
    expect(await store.readLog('s', 0, 10)).toEqual([]);
    const next = await store.insertRecords([item()], '2026-12-01T00:00:00.000Z');
    expect(next[0]?.serverSeq).toBe(1);
  });
});

describe('contentHash()', () => {
  it('ignores key order and keeps array order', () => {
    expect(contentHash({ a: 1, b: { c: [1, 2], d: 'x' } })).toBe(contentHash({ b: { d: 'x', c: [1, 2] }, a: 1 }));
    expect(contentHash({ c: [1, 2] })).not.toBe(contentHash({ c: [2, 1] }));
  });

  it('is the sha256 of the sorted, compact JSON', () => {
    // source: sha256 of the ASCII text {"a":1,"b":2}, computed from the definition with node:crypto
    expect(contentHash({ b: 2, a: 1 })).toBe(createHash('sha256').update('{"a":1,"b":2}').digest('hex'));
  });
});

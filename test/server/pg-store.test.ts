import { randomInt } from 'node:crypto';
import pg from 'pg';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { contentHash } from '../../src/server/canonical-json';
import { MIGRATIONS } from '../../src/server/store/migrations';
import { applyPgMigrations, openPgStore, type PgStore } from '../../src/server/store/pg-store';
import type { LogRow, RecordToInsert } from '../../src/server/store/server-store';
import { createTestSchema, openTestStore, postgresAvailable, requireDatabaseUrl } from './backends';
import { makeSample } from './fixtures';
import { describeServerStoreContract } from './store-contract';

const run = postgresAvailable();

describe.skipIf(!run)('PostgreSQL', () => {
  describeServerStoreContract('PostgreSQL', () => openTestStore('postgres'));
});

const T = '2026-12-01T08:00:00.000Z';
const SITE = 's';
const item = (record = makeSample('dev-1')): RecordToInsert => ({
  record, siteId: SITE, contentHash: contentHash(record), deviceId: 'dev-1', personId: 'p', clientTime: record.takenAt,
});

/** A pg client working in the test schema (for triggers, locks and checks outside the store). */
async function schemaClient(schema: string): Promise<pg.Client> {
  const client = new pg.Client({ connectionString: requireDatabaseUrl(), options: `-c search_path=${schema}`, application_name: 'plumbline-test-side' });
  await client.connect();
  return client;
}

/** Polls until check() is true (at most 10 s); for waiting on another session's lock state. */
async function until(what: string, check: () => Promise<boolean>): Promise<void> {
  const end = Date.now() + 10_000;
  while (!(await check())) {
    if (Date.now() > end) throw new Error(`timed out waiting until ${what}`);
    await new Promise((r) => setTimeout(r, 10));
  }
}

/**
 * A supervisor's pull loop: reads pages after its cursor and moves the cursor to the last row of
 * each page, exactly as a client does. `seen` is every serverSeq it was given, in order.
 */
class Puller {
  cursor = 0;
  readonly seen: number[] = [];
  private looping: Promise<void> | undefined;
  private stopped = false;
  constructor(private readonly read: (after: number, limit: number) => Promise<number[]>) {}
  /** Pulls in a tight loop until stop(). */
  start(): this {
    this.looping = (async () => {
      while (!this.stopped) await this.pull();
    })();
    return this;
  }
  async stop(): Promise<void> {
    this.stopped = true;
    await this.looping;
  }
  async pull(): Promise<void> {
    for (;;) {
      const page = await this.read(this.cursor, 3);
      this.seen.push(...page);
      this.cursor = page.at(-1) ?? this.cursor;
      if (page.length < 3) return;
    }
  }
}

describe.skipIf(!run)('PgStore', () => {
  let schema: { name: string; drop: () => Promise<void> };
  let store: PgStore;
  let side: pg.Client;
  let looping: Puller[] = [];
  const url = () => requireDatabaseUrl();
  const appName = () => `plumbline-test-${schema.name}`;
  beforeEach(async () => {
    schema = await createTestSchema();
    store = await openPgStore(url(), { schema: schema.name, max: 4, applicationName: appName() });
    side = await schemaClient(schema.name);
  });
  afterEach(async () => {
    await Promise.allSettled(looping.map((p) => p.stop())); // a failed test may leave its loop running
    looping = [];
    await side.end();
    await store.close();
    await schema.drop();
  });

  const pullSeqs = async (after: number, limit: number) => (await store.readLog(SITE, after, limit)).map((r: LogRow) => r.serverSeq);
  const allSeqs = async () => (await side.query<{ s: string }>(`SELECT server_seq AS s FROM log WHERE site_id = $1 ORDER BY server_seq`, [SITE])).rows.map((r) => Number(r.s));

  describe('migrations', () => {
    it('applies every step once, tracked in schema_migrations, and keeps the epoch and data across a reopen', async () => {
      const epoch = await store.getServerEpoch();
      expect(epoch).toMatch(/^[A-Za-z0-9_-]{16}$/);
      await store.insertRecords([item()], T);
      await store.close();
      store = await openPgStore(url(), { schema: schema.name, max: 4 });
      expect(await store.getServerEpoch()).toBe(epoch);
      expect(await applyPgMigrations(store.pool, MIGRATIONS)).toBe(0);
      const { rows } = await side.query<{ version: number }>('SELECT version FROM schema_migrations ORDER BY version');
      expect(rows.map((r) => r.version)).toEqual(MIGRATIONS.map((m) => m.version));
      expect(await store.readLog(SITE, 0, 10)).toHaveLength(1);
    });

    it('runs each step in a transaction: a failing step leaves no trace and is not recorded', async () => {
      const bad = { version: 999, name: 'half a step', statements: ['CREATE TABLE half_made (x INTEGER)', 'SELECT * FROM no_such_table'] };
      await expect(applyPgMigrations(store.pool, [...MIGRATIONS, bad])).rejects.toThrow(/no_such_table/);
      const { rows } = await side.query<{ t: string | null; v: number }>(
        `SELECT to_regclass('half_made')::text AS t, (SELECT MAX(version) FROM schema_migrations) AS v`,
      );
      expect(rows[0]).toEqual({ t: null, v: MIGRATIONS.at(-1)?.version });
    });

    it('lets two servers open the same empty schema at once: each step runs once', async () => {
      const other = await createTestSchema();
      try {
        const [a, b] = await Promise.all([openPgStore(url(), { schema: other.name, max: 2 }), openPgStore(url(), { schema: other.name, max: 2 })]);
        expect(await a.getServerEpoch()).toBe(await b.getServerEpoch());
        const { rows } = await a.pool.query<{ n: string }>('SELECT COUNT(*) AS n FROM schema_migrations');
        expect(Number(rows[0]?.n)).toBe(MIGRATIONS.length);
        await a.close();
        await b.close();
      } finally {
        await other.drop();
      }
    });
  });

  it('refuses a schema that does not exist, or a name that could not be one, by name', async () => {
    await expect(openPgStore(url(), { schema: 't_missing_schema' })).rejects.toThrow('PostgreSQL schema "t_missing_schema" does not exist');
    await expect(openPgStore(url(), { schema: 'x; DROP TABLE log' })).rejects.toThrow(/must be lower-case letters/);
  });

  it('works in its own schema with synchronous_commit=on, whatever the server default', async () => {
    const { rows } = await store.pool.query<{ sc: string; sp: string }>(`SELECT current_setting('synchronous_commit') AS sc, current_schema() AS sp`);
    expect(rows[0]).toEqual({ sc: 'on', sp: schema.name });
  });

  it('returns serverSeq as a number although the column is BIGINT', async () => {
    const [out] = await store.insertRecords([item()], T);
    expect(typeof out?.serverSeq).toBe('number');
    const [row] = await store.readLog(SITE, 0, 1);
    expect(row?.serverSeq).toBe(out?.serverSeq);
  });

  it('rolls the whole batch back on an error, so no serverSeq is used up', async () => {
    const broken = { ...item(), siteId: null as unknown as string }; // site_id is NOT NULL
    await expect(store.insertRecords([item(), broken], T)).rejects.toThrow(/site_id/);
    expect(await store.readLog(SITE, 0, 10)).toEqual([]);
    expect((await store.insertRecords([item()], T))[0]?.serverSeq).toBe(1);
  });

  it('gives a repeat inside a batch no number of its own, so the sequence has no gap', async () => {
    const a = makeSample('dev-1');
    const out = await store.insertRecords([item(a), item(a), item({ ...a, values: [99] }), item()], T);
    expect(out.map((o) => [o.status, o.serverSeq])).toEqual([['stored', 1], ['duplicate', 1], ['conflict', 1], ['stored', 2]]);
    expect(await allSeqs()).toEqual([1, 2]);
  });

  it('lets exactly one of several simultaneous redeems of a code succeed', async () => {
    await store.createEnrolmentCode({ codeHash: 'h', siteId: SITE, createdBy: 'p', createdAt: T, expiresAt: '2026-12-01T09:00:00.000Z' });
    const results = await Promise.all(
      [1, 2, 3, 4].map((i) => store.redeemEnrolmentCode('h', T, { id: `d${i}`, name: `D${i}`, tokenHash: `t${i}`, enrolledAt: T })),
    );
    expect(results.filter((r) => r.ok)).toHaveLength(1);
    expect(results.filter((r) => !r.ok).map((r) => (r.ok ? '' : r.reason))).toEqual(['used', 'used', 'used']);
    expect(await store.listDevices(SITE)).toHaveLength(1);
  });

  describe('commit order (sync.md §1 PostgreSQL caveats, §3.6; scenario S14)', () => {
    // A gate inside the write transaction: an AFTER INSERT trigger on the gated ids waits for an
    // advisory lock that the test holds. The transaction has by then taken its number and written
    // its row, and stays open (uncommitted) until the test opens the gate.
    let gateKey: number;
    beforeEach(async () => {
      gateKey = randomInt(1, 2 ** 30);
      await side.query(`CREATE TABLE gated_ids (id TEXT PRIMARY KEY)`);
      await side.query(`CREATE FUNCTION gate() RETURNS trigger LANGUAGE plpgsql AS $$
        BEGIN
          IF EXISTS (SELECT 1 FROM gated_ids WHERE id = NEW.entity_id) THEN PERFORM pg_advisory_xact_lock(${gateKey}); END IF;
          RETURN NEW;
        END $$`);
      await side.query(`CREATE TRIGGER gate AFTER INSERT ON log FOR EACH ROW EXECUTE FUNCTION gate()`);
      await side.query(`SELECT pg_advisory_lock($1)`, [gateKey]);
    });
    const gateWaiters = async () =>
      Number((await side.query<{ n: string }>(`SELECT COUNT(*) AS n FROM pg_locks WHERE locktype = 'advisory' AND objid = $1 AND NOT granted`, [gateKey])).rows[0]?.n);
    const lockWaiters = async () =>
      Number((await side.query<{ n: string }>(`SELECT COUNT(*) AS n FROM pg_stat_activity WHERE application_name = $1 AND wait_event_type = 'Lock'`, [appName()])).rows[0]?.n);
    const openGate = () => side.query(`SELECT pg_advisory_unlock($1)`, [gateKey]);

    it('never lets a pull skip a row: the push that took its number first also commits first', async () => {
      await store.insertRecords([item(), item()], T); // rows 1, 2 already committed
      const slow = makeSample('dev-1');
      await side.query(`INSERT INTO gated_ids (id) VALUES ($1)`, [slow.id]);
      const puller = new Puller(pullSeqs);
      looping.push(puller.start());

      const first = store.insertRecords([item(slow)], T); // takes 3, then waits at the gate
      await until('the first push waits at the gate', async () => (await gateWaiters()) === 1);
      let secondSettled = false;
      const second = store.insertRecords([item(), item()], T).finally(() => {
        secondSettled = true;
      });
      // With the counter row lock the second push waits; a store without it would commit now.
      await until('the second push waits for the counter row (or has committed)', async () => secondSettled || (await lockWaiters()) === 2);
      await puller.pull();
      const whileFirstOpen = [...puller.seen];
      await openGate();
      const [a, b] = await Promise.all([first, second]);
      await puller.stop();
      await puller.pull();

      // Union of pulls == every row, each once, in order, no gaps.
      expect(puller.seen).toEqual(await allSeqs());
      expect(puller.seen).toEqual([1, 2, 3, 4, 5]);
      expect(a.map((o) => o.serverSeq)).toEqual([3]);
      expect(b.map((o) => o.serverSeq)).toEqual([4, 5]);
      expect(whileFirstOpen).toEqual([1, 2]); // neither push was visible while the first was open
      expect(secondSettled).toBe(true);
    });

    it('control: a bare sequence lets the later number commit first, and the same pull loop skips a row', async () => {
      // The naive design the store avoids (sync.md §1): nextval() outside any lock.
      await side.query(`CREATE TABLE bare_log (seq BIGSERIAL PRIMARY KEY, entity_id TEXT NOT NULL)`);
      await side.query(`CREATE TRIGGER gate AFTER INSERT ON bare_log FOR EACH ROW EXECUTE FUNCTION gate()`);
      await side.query(`INSERT INTO gated_ids (id) VALUES ('slow')`);
      const a = await schemaClient(schema.name);
      const b = await schemaClient(schema.name);
      try {
        const puller = new Puller(async (after, limit) =>
          (await side.query<{ seq: string }>(`SELECT seq FROM bare_log WHERE seq > $1 ORDER BY seq LIMIT $2`, [after, limit])).rows.map((r) => Number(r.seq)),
        );
        await a.query('BEGIN');
        const first = a.query(`INSERT INTO bare_log (entity_id) VALUES ('slow') RETURNING seq`); // takes 1, waits at the gate
        await until('the first insert waits at the gate', async () => (await gateWaiters()) === 1);
        await b.query('BEGIN');
        await b.query(`INSERT INTO bare_log (entity_id) VALUES ('fast')`); // takes 2 and does not wait
        await b.query('COMMIT');
        await puller.pull(); // sees 2, moves its cursor past 1
        await openGate();
        await first;
        await a.query('COMMIT');
        await puller.pull();
        const all = (await side.query<{ seq: string }>(`SELECT seq FROM bare_log ORDER BY seq`)).rows.map((r) => Number(r.seq));
        expect(all).toEqual([1, 2]);
        expect(puller.seen).toEqual([2]); // row 1 was never pulled: the check above would catch it
      } finally {
        await a.end();
        await b.end();
      }
    });

    it('stores a record pushed by two transactions at once once: the second waits, then answers duplicate and uses no number', async () => {
      const x = makeSample('dev-1');
      await side.query(`INSERT INTO gated_ids (id) VALUES ($1)`, [x.id]);
      const first = store.insertRecords([item(x)], T);
      await until('the first push waits at the gate', async () => (await gateWaiters()) === 1);
      const second = store.insertRecords([item(x)], T);
      await until('the second push waits for the counter row', async () => (await lockWaiters()) === 2);
      await openGate();
      const [a, b] = await Promise.all([first, second]);
      expect(a).toEqual([{ id: x.id, status: 'stored', serverSeq: 1 }]);
      expect(b).toEqual([{ id: x.id, status: 'duplicate', serverSeq: 1 }]);
      expect((await store.insertRecords([item()], T))[0]?.serverSeq).toBe(2);
    });
  });

  it('under concurrent pushers (with repeats) a pull loop still sees every row once, in order, with no gap', async () => {
    const puller = new Puller(pullSeqs);
    looping.push(puller.start());
    const stored = new Set<number>();
    await Promise.all(
      Array.from({ length: 6 }, async () => {
        let previous: RecordToInsert[] = [];
        for (let batch = 0; batch < 8; batch++) {
          const fresh = Array.from({ length: 4 }, () => item());
          const out = await store.insertRecords([...fresh, ...previous.slice(0, 1)], T); // the last batch's first record again
          for (const o of out) if (o.status === 'stored') stored.add(o.serverSeq);
          expect(out.slice(4).map((o) => o.status)).toEqual(previous.length ? ['duplicate'] : []);
          previous = fresh;
        }
      }),
    );
    await puller.stop();
    await puller.pull();
    const n = 6 * 8 * 4;
    expect(stored.size).toBe(n);
    expect(puller.seen).toEqual(Array.from({ length: n }, (_, i) => i + 1));
    expect(puller.seen).toEqual(await allSeqs());
  });
});

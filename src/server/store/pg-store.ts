import { randomBytes } from 'node:crypto';
import pg from 'pg';
import type { DeviceRecord, SetupRecord } from '../../schema/index';
import { MIGRATIONS, type Migration } from './migrations';
import type {
  CurrentSetup,
  DeviceRow,
  InsertOutcome,
  LogRow,
  NewDevice,
  NewEnrolmentCode,
  PersonSecrets,
  RecordToInsert,
  RedeemResult,
  ServerStore,
  SessionRow,
  SetupBody,
  SetupKind,
  SiteScopedSetup,
} from './server-store';
import { DEVICE_ACTIVITY_SQL, SEQ_COUNTS_SQL, SEQ_GAPS_SQL, toDeviceActivity, toSeqCoverage, type DeviceActivity, type SeqCoverage } from './server-store';

/** Anything that runs a query: the pool (autocommit) or one client inside a transaction. */
type Queryable = Pick<pg.Pool | pg.PoolClient, 'query'>;

export interface PgStoreOptions {
  /** Schema to work in (sets `search_path` for every connection of the pool); it must exist. Default: the server's search_path. */
  readonly schema?: string;
  /** Most connections the pool opens (default 10). */
  readonly max?: number;
  /** Shown in pg_stat_activity (default "plumbline"). */
  readonly applicationName?: string;
}

const SCHEMA_NAME = /^[a-z_][a-z0-9_]{0,62}$/;

/**
 * Opens a PostgreSQL store on a pool: migrations applied (each in its own transaction, tracked in
 * schema_migrations), the epoch row created once. Every connection runs with
 * `synchronous_commit=on`, so a push is acknowledged only after its commit is flushed (sync.md §3.10).
 */
export async function openPgStore(connectionString: string, options: PgStoreOptions = {}): Promise<PgStore> {
  const settings = ['-c synchronous_commit=on'];
  if (options.schema !== undefined) {
    if (!SCHEMA_NAME.test(options.schema)) throw new Error(`PostgreSQL schema name "${options.schema}" must be lower-case letters, digits and _.`);
    settings.push(`-c search_path=${options.schema}`);
  }
  // pg lets an `options` parameter in the URL replace the one given here; keep both instead.
  const { url, urlOptions } = takeUrlOptions(connectionString);
  if (urlOptions) settings.unshift(urlOptions);
  const pool = new pg.Pool({
    connectionString: url,
    max: options.max ?? 10,
    application_name: options.applicationName ?? 'plumbline',
    options: settings.join(' '),
  });
  // An idle connection that breaks (server restart, network) must not crash the process; the pool drops it.
  pool.on('error', (error) => console.error(`PostgreSQL connection lost: ${error.message}`));
  try {
    if (options.schema !== undefined) {
      const { rowCount } = await pool.query(`SELECT 1 FROM pg_namespace WHERE nspname = $1`, [options.schema]);
      if (rowCount === 0) throw new Error(`PostgreSQL schema "${options.schema}" does not exist; create it first (CREATE SCHEMA ${options.schema}).`);
    }
    await applyPgMigrations(pool, MIGRATIONS);
    await pool.query(`INSERT INTO meta (key, value) VALUES ('server_epoch', $1) ON CONFLICT (key) DO NOTHING`, [randomBytes(12).toString('base64url')]);
  } catch (error) {
    await pool.end();
    throw error;
  }
  return new PgStore(pool);
}

/** Splits `?options=…` off a connection URL (URLs the WHATWG parser rejects are left as they are). */
function takeUrlOptions(connectionString: string): { url: string; urlOptions: string | undefined } {
  let parsed: URL;
  try {
    parsed = new URL(connectionString);
  } catch {
    return { url: connectionString, urlOptions: undefined };
  }
  const urlOptions = parsed.searchParams.get('options') ?? undefined;
  if (urlOptions === undefined) return { url: connectionString, urlOptions };
  parsed.searchParams.delete('options');
  return { url: parsed.toString(), urlOptions };
}

/**
 * Applies the steps newer than the database's version, each in its own transaction. An advisory
 * lock per schema makes two servers starting at once apply each step once. Returns how many ran.
 */
export async function applyPgMigrations(pool: pg.Pool, migrations: readonly Migration[]): Promise<number> {
  let applied = 0;
  for (const step of [...migrations].sort((a, b) => a.version - b.version)) {
    const ran = await inTransaction(pool, async (c) => {
      await c.query(`SELECT pg_advisory_xact_lock(hashtext('plumbline-migrations:' || current_schema()))`);
      await c.query(`CREATE TABLE IF NOT EXISTS schema_migrations (version INTEGER PRIMARY KEY, name TEXT NOT NULL, applied_at TEXT NOT NULL)`);
      const { rows } = await c.query<{ v: number | null }>(`SELECT MAX(version) AS v FROM schema_migrations`);
      if ((rows[0]?.v ?? 0) >= step.version) return false;
      for (const sql of step.statements) await c.query(sql);
      await c.query(`INSERT INTO schema_migrations (version, name, applied_at) VALUES ($1, $2, $3)`, [step.version, step.name, new Date().toISOString()]);
      return true;
    });
    if (ran) applied += 1;
  }
  return applied;
}

/** BEGIN … COMMIT on one pooled connection; ROLLBACK and rethrow on any error. */
async function inTransaction<T>(pool: pg.Pool, work: (client: pg.PoolClient) => Promise<T>): Promise<T> {
  const client = await pool.connect();
  let broken: Error | undefined;
  try {
    await client.query('BEGIN');
    const result = await work(client);
    await client.query('COMMIT');
    return result;
  } catch (error) {
    try {
      await client.query('ROLLBACK');
    } catch (rollbackError) {
      // The connection is unusable: release(error) makes the pool close it instead of reusing it.
      broken = rollbackError instanceof Error ? rollbackError : new Error(String(rollbackError));
    }
    throw error;
  } finally {
    client.release(broken);
  }
}

interface LogDbRow {
  server_seq: string;
  server_time: string;
  entry_kind: string;
  entity_id: string;
  body: string;
}

export class PgStore implements ServerStore {
  constructor(readonly pool: pg.Pool) {}

  async getServerEpoch(): Promise<string> {
    const { rows } = await this.pool.query<{ value: string }>(`SELECT value FROM meta WHERE key = 'server_epoch'`);
    const epoch = rows[0]?.value;
    if (epoch === undefined) throw new Error('The PostgreSQL store has no server_epoch row; it was not opened with openPgStore().');
    return epoch;
  }

  async appendSetup(entries: readonly SiteScopedSetup[], serverTime: string): Promise<number[]> {
    return inTransaction(this.pool, async (c) => {
      const seqs: number[] = [];
      for (const { siteId, record } of entries) {
        const seq = await nextSeq(c);
        const body = JSON.stringify(record.body);
        await c.query(
          `INSERT INTO log (server_seq, server_time, site_id, entry_kind, entity_id, body, content_hash) VALUES ($1, $2, $3, $4, $5, $6, '')`,
          [seq, serverTime, siteId, record.kind, record.id, body],
        );
        await c.query(
          `INSERT INTO setup_current (entry_kind, entity_id, site_id, body, server_seq) VALUES ($1, $2, $3, $4, $5)
           ON CONFLICT (entry_kind, entity_id) DO UPDATE SET site_id = excluded.site_id, body = excluded.body, server_seq = excluded.server_seq`,
          [record.kind, record.id, siteId, body, seq],
        );
        seqs.push(seq);
      }
      return seqs;
    });
  }

  async getSetup<K extends SetupKind>(kind: K, id: string): Promise<CurrentSetup<K> | undefined> {
    const { rows } = await this.pool.query<{ site_id: string; body: string; server_seq: string }>(
      `SELECT site_id, body, server_seq FROM setup_current WHERE entry_kind = $1 AND entity_id = $2`,
      [kind, id],
    );
    const r = rows[0];
    return r && { kind, id, siteId: r.site_id, body: JSON.parse(r.body) as SetupBody<K>, serverSeq: Number(r.server_seq) };
  }

  async listSetup<K extends SetupKind>(siteId: string, kind: K): Promise<CurrentSetup<K>[]> {
    // COLLATE "C": the same byte order as SQLite's default, whatever the database's locale.
    const { rows } = await this.pool.query<{ entity_id: string; body: string; server_seq: string }>(
      `SELECT entity_id, body, server_seq FROM setup_current WHERE site_id = $1 AND entry_kind = $2 ORDER BY entity_id COLLATE "C"`,
      [siteId, kind],
    );
    return rows.map((r) => ({ kind, id: r.entity_id, siteId, body: JSON.parse(r.body) as SetupBody<K>, serverSeq: Number(r.server_seq) }));
  }

  async setPersonSecrets(s: PersonSecrets): Promise<void> {
    await this.pool.query(
      `INSERT INTO person_secrets (person_id, pin_hash, pin_salt, verifier_salt, verifier_hash, verifier_iterations, updated_at)
       VALUES ($1, $2, $3, $4, $5, $6, $7)
       ON CONFLICT (person_id) DO UPDATE SET pin_hash = excluded.pin_hash, pin_salt = excluded.pin_salt,
         verifier_salt = excluded.verifier_salt, verifier_hash = excluded.verifier_hash,
         verifier_iterations = excluded.verifier_iterations, updated_at = excluded.updated_at`,
      [s.personId, s.pinHash, s.pinSalt, s.verifierSalt, s.verifierHash, s.verifierIterations, s.updatedAt],
    );
  }

  async getPersonSecrets(personId: string): Promise<PersonSecrets | undefined> {
    const { rows } = await this.pool.query<{
      person_id: string;
      pin_hash: string;
      pin_salt: string;
      verifier_salt: string;
      verifier_hash: string;
      verifier_iterations: number;
      updated_at: string;
    }>(`SELECT * FROM person_secrets WHERE person_id = $1`, [personId]);
    const r = rows[0];
    return (
      r && {
        personId: r.person_id,
        pinHash: r.pin_hash,
        pinSalt: r.pin_salt,
        verifierSalt: r.verifier_salt,
        verifierHash: r.verifier_hash,
        verifierIterations: r.verifier_iterations,
        updatedAt: r.updated_at,
      }
    );
  }

  async createEnrolmentCode(c: NewEnrolmentCode): Promise<void> {
    await this.pool.query(
      `INSERT INTO enrolment_codes (code_hash, site_id, created_by, created_at, expires_at) VALUES ($1, $2, $3, $4, $5)`,
      [c.codeHash, c.siteId, c.createdBy, c.createdAt, c.expiresAt],
    );
  }

  async redeemEnrolmentCode(codeHash: string, now: string, device: NewDevice): Promise<RedeemResult> {
    return inTransaction(this.pool, async (c): Promise<RedeemResult> => {
      // FOR UPDATE: a second redeem of the same code waits here, then sees used_at set.
      const { rows } = await c.query<{ site_id: string; expires_at: string; used_at: string | null }>(
        `SELECT site_id, expires_at, used_at FROM enrolment_codes WHERE code_hash = $1 FOR UPDATE`,
        [codeHash],
      );
      const code = rows[0];
      if (!code) return { ok: false, reason: 'unknown' };
      if (code.used_at !== null) return { ok: false, reason: 'used' };
      if (Date.parse(code.expires_at) <= Date.parse(now)) return { ok: false, reason: 'expired' };
      await c.query(`UPDATE enrolment_codes SET used_at = $1, used_by_device = $2 WHERE code_hash = $3`, [now, device.id, codeHash]);
      await insertDevice(c, { ...device, siteId: code.site_id });
      return { ok: true, siteId: code.site_id };
    });
  }

  async createDevice(device: NewDevice & { siteId: string }): Promise<void> {
    await insertDevice(this.pool, device);
  }

  async findDeviceByTokenHash(tokenHash: string): Promise<DeviceRow | undefined> {
    const { rows } = await this.pool.query<DeviceDbRow>(`SELECT ${DEVICE_COLUMNS} FROM devices WHERE token_hash = $1`, [tokenHash]);
    return rows[0] && toDeviceRow(rows[0]);
  }

  async getDevice(id: string): Promise<DeviceRow | undefined> {
    const { rows } = await this.pool.query<DeviceDbRow>(`SELECT ${DEVICE_COLUMNS} FROM devices WHERE id = $1`, [id]);
    return rows[0] && toDeviceRow(rows[0]);
  }

  async listDevices(siteId: string): Promise<DeviceRow[]> {
    const { rows } = await this.pool.query<DeviceDbRow>(
      `SELECT ${DEVICE_COLUMNS} FROM devices WHERE site_id = $1 ORDER BY enrolled_at COLLATE "C", id COLLATE "C"`,
      [siteId],
    );
    return rows.map(toDeviceRow);
  }

  async listDeviceActivity(siteId: string): Promise<DeviceActivity[]> {
    const { rows } = await this.pool.query<Parameters<typeof toDeviceActivity>[0]>(DEVICE_ACTIVITY_SQL.replace('?', '$1'), [siteId]);
    return rows.map(toDeviceActivity);
  }

  async noteDeviceSeqs(deviceId: string, seqs: readonly { readonly seq: number; readonly recordId: string }[]): Promise<void> {
    if (seqs.length === 0) return;
    await this.pool.query(
      `INSERT INTO device_seqs (device_id, device_seq, record_id)
       SELECT $1, seq, record_id FROM unnest($2::bigint[], $3::text[]) AS u(seq, record_id) ON CONFLICT DO NOTHING`,
      [deviceId, seqs.map((s) => s.seq), seqs.map((s) => s.recordId)],
    );
  }

  async listSeqCoverage(siteId: string): Promise<SeqCoverage[]> {
    const [counts, gaps] = await Promise.all([
      this.pool.query<Parameters<typeof toSeqCoverage>[0][number]>(SEQ_COUNTS_SQL.replace('?', '$1'), [siteId]),
      this.pool.query<Parameters<typeof toSeqCoverage>[1][number]>(SEQ_GAPS_SQL.replace('?', '$1'), [siteId]),
    ]);
    return toSeqCoverage(counts.rows, gaps.rows);
  }

  async revokeDevice(id: string, at: string): Promise<boolean> {
    const result = await this.pool.query(`UPDATE devices SET revoked_at = COALESCE(revoked_at, $1) WHERE id = $2`, [at, id]);
    return (result.rowCount ?? 0) > 0;
  }

  async reinstateDevice(id: string): Promise<boolean> {
    const result = await this.pool.query(`UPDATE devices SET revoked_at = NULL WHERE id = $1`, [id]);
    return (result.rowCount ?? 0) > 0;
  }

  async createSession(s: SessionRow): Promise<void> {
    await this.pool.query(
      `INSERT INTO sessions (token_hash, person_id, device_id, created_at, expires_at) VALUES ($1, $2, $3, $4, $5)`,
      [s.tokenHash, s.personId, s.deviceId, s.createdAt, s.expiresAt],
    );
  }

  async findSessionByTokenHash(tokenHash: string): Promise<SessionRow | undefined> {
    const { rows } = await this.pool.query<{ person_id: string; device_id: string; created_at: string; expires_at: string }>(
      `SELECT person_id, device_id, created_at, expires_at FROM sessions WHERE token_hash = $1`,
      [tokenHash],
    );
    const r = rows[0];
    return r && { tokenHash, personId: r.person_id, deviceId: r.device_id, createdAt: r.created_at, expiresAt: r.expires_at };
  }

  /**
   * One transaction per batch, a fixed number of statements whatever its size:
   * 1. lock the counter row (`SELECT … FOR UPDATE`). Every writer that assigns serverSeqs takes this
   *    row lock first and keeps it to COMMIT, so writers take numbers one after another and commit
   *    order equals sequence order: a pull cursor can never pass a number that commits later
   *    (sync.md §1 PostgreSQL caveats, §3.6);
   * 2. read which ids are already stored (a record is immutable, so a stored one decides between
   *    duplicate and conflict); a repeat inside the batch is judged against its first occurrence;
   * 3. insert the new records (`INSERT … ON CONFLICT (id) DO NOTHING`) and their log rows with the
   *    next numbers in batch order, in one statement;
   * 4. `UPDATE counters SET value = value + k RETURNING value` for the k numbers used.
   * Repeats take no number, so the sequence has no gaps.
   */
  async insertRecords(items: readonly RecordToInsert[], serverTime: string): Promise<InsertOutcome[]> {
    if (items.length === 0) return [];
    return inTransaction(this.pool, async (c) => {
      const locked = await c.query<{ value: string }>(`SELECT value FROM counters WHERE name = 'log' FOR UPDATE`);
      if (locked.rows[0] === undefined) throw new Error('The counters table has no "log" row.');
      const base = Number(locked.rows[0].value);

      const ids = [...new Set(items.map((i) => i.record.id))];
      const { rows } = await c.query<{ id: string; server_seq: string; content_hash: string }>(
        `SELECT id, server_seq, content_hash FROM device_records WHERE id = ANY($1::text[])`,
        [ids],
      );
      const known = new Map(rows.map((r) => [r.id, { serverSeq: Number(r.server_seq), contentHash: r.content_hash }]));

      const fresh: { item: RecordToInsert; serverSeq: number }[] = [];
      const outcomes = items.map((item): InsertOutcome => {
        const id = item.record.id;
        const stored = known.get(id);
        if (stored) return { id, status: stored.contentHash === item.contentHash ? 'duplicate' : 'conflict', serverSeq: stored.serverSeq };
        const serverSeq = base + fresh.length + 1;
        fresh.push({ item, serverSeq });
        known.set(id, { serverSeq, contentHash: item.contentHash });
        return { id, status: 'stored', serverSeq };
      });
      if (fresh.length === 0) return outcomes;

      const column = <T>(f: (x: (typeof fresh)[number]) => T): T[] => fresh.map(f);
      const inserted = await c.query(
        `WITH input AS (
           SELECT * FROM unnest($1::text[], $2::bigint[], $3::text[], $4::text[], $5::text[], $6::text[], $7::text[], $8::text[])
             AS t (id, server_seq, content_hash, site_id, body, device_id, person_id, client_time)
         ), r AS (
           INSERT INTO device_records (id, server_seq, content_hash)
           SELECT id, server_seq, content_hash FROM input
           ON CONFLICT (id) DO NOTHING
           RETURNING id
         )
         INSERT INTO log (server_seq, server_time, site_id, entry_kind, entity_id, body, content_hash, device_id, person_id, client_time)
         SELECT i.server_seq, $9, i.site_id, 'record', i.id, i.body, i.content_hash, i.device_id, i.person_id, i.client_time
         FROM input i JOIN r ON r.id = i.id
         ORDER BY i.server_seq`,
        [
          column((f) => f.item.record.id),
          column((f) => f.serverSeq),
          column((f) => f.item.contentHash),
          column((f) => f.item.siteId),
          column((f) => JSON.stringify(f.item.record)),
          column((f) => f.item.deviceId),
          column((f) => f.item.personId),
          column((f) => f.item.clientTime),
          serverTime,
        ],
      );
      // Cannot happen while every writer holds the counter lock; if it does, roll the batch back.
      if (inserted.rowCount !== fresh.length) throw new Error(`Stored ${inserted.rowCount} of ${fresh.length} new records: an id was inserted outside the counter lock.`);
      const after = await c.query<{ value: string }>(`UPDATE counters SET value = value + $1 WHERE name = 'log' RETURNING value`, [fresh.length]);
      if (Number(after.rows[0]?.value) !== base + fresh.length) throw new Error('The log counter moved while its row was locked.');
      return outcomes;
    });
  }

  async readLog(siteId: string, after: number, limit: number): Promise<LogRow[]> {
    const { rows } = await this.pool.query<LogDbRow>(
      `SELECT server_seq, server_time, entry_kind, entity_id, body FROM log
       WHERE site_id = $1 AND server_seq > $2 ORDER BY server_seq LIMIT $3`,
      [siteId, after, limit],
    );
    return rows.map(toLogRow);
  }

  async close(): Promise<void> {
    await this.pool.end();
  }
}

/** Next serverSeq; only inside a write transaction: the counter row stays locked until COMMIT or ROLLBACK. */
async function nextSeq(c: Queryable): Promise<number> {
  const { rows } = await c.query<{ value: string }>(`UPDATE counters SET value = value + 1 WHERE name = 'log' RETURNING value`);
  const value = rows[0]?.value;
  if (value === undefined) throw new Error('The counters table has no "log" row.');
  return Number(value);
}

async function insertDevice(c: Queryable, d: NewDevice & { siteId: string }): Promise<void> {
  await c.query(`INSERT INTO devices (id, site_id, name, token_hash, enrolled_at) VALUES ($1, $2, $3, $4, $5)`, [
    d.id,
    d.siteId,
    d.name,
    d.tokenHash,
    d.enrolledAt,
  ]);
}

const DEVICE_COLUMNS = 'id, site_id, name, enrolled_at, revoked_at';

interface DeviceDbRow {
  id: string;
  site_id: string;
  name: string;
  enrolled_at: string;
  revoked_at: string | null;
}

function toDeviceRow(r: DeviceDbRow): DeviceRow {
  return { id: r.id, siteId: r.site_id, name: r.name, enrolledAt: r.enrolled_at, revokedAt: r.revoked_at };
}

function toLogRow(r: LogDbRow): LogRow {
  const base = { serverSeq: Number(r.server_seq), serverTime: r.server_time };
  if (r.entry_kind === 'record') {
    return { ...base, entry: { kind: 'record', id: r.entity_id, body: JSON.parse(r.body) as DeviceRecord } };
  }
  return { ...base, entry: { kind: r.entry_kind, id: r.entity_id, body: JSON.parse(r.body) } as SetupRecord };
}

import Database from 'better-sqlite3';
import { randomBytes } from 'node:crypto';
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

type Db = Database.Database;

/** Opens (creating if needed) a SQLite store: WAL journal, synchronous=FULL, migrations applied. */
export function openSqliteStore(path: string): SqliteStore {
  const db = new Database(path);
  db.pragma('journal_mode = WAL');
  // FULL: a commit is synced to the WAL before the push is acknowledged (sync.md §2.16, §3.10).
  db.pragma('synchronous = FULL');
  db.pragma('busy_timeout = 5000');
  applyMigrations(db, MIGRATIONS);
  db.prepare(`INSERT INTO meta (key, value) VALUES ('server_epoch', ?) ON CONFLICT (key) DO NOTHING`).run(
    randomBytes(12).toString('base64url'),
  );
  return new SqliteStore(db);
}

/** Applies the steps newer than the database's version, each in its own transaction. */
export function applyMigrations(db: Db, migrations: readonly Migration[]): number {
  db.exec(`CREATE TABLE IF NOT EXISTS schema_migrations (version INTEGER PRIMARY KEY, name TEXT NOT NULL, applied_at TEXT NOT NULL)`);
  const row = db.prepare(`SELECT MAX(version) AS v FROM schema_migrations`).get() as { v: number | null };
  const current = row.v ?? 0;
  let applied = 0;
  for (const step of [...migrations].sort((a, b) => a.version - b.version)) {
    if (step.version <= current) continue;
    db.transaction(() => {
      for (const sql of step.statements) db.exec(sql);
      db.prepare(`INSERT INTO schema_migrations (version, name, applied_at) VALUES (?, ?, ?)`).run(
        step.version,
        step.name,
        new Date().toISOString(),
      );
    }).immediate();
    applied += 1;
  }
  return applied;
}

interface LogDbRow {
  server_seq: number;
  server_time: string;
  entry_kind: string;
  entity_id: string;
  body: string;
}

export class SqliteStore implements ServerStore {
  constructor(readonly db: Db) {}

  async getServerEpoch(): Promise<string> {
    const row = this.db.prepare(`SELECT value FROM meta WHERE key = 'server_epoch'`).get() as { value: string };
    return row.value;
  }

  async appendSetup(entries: readonly SiteScopedSetup[], serverTime: string): Promise<number[]> {
    const insertLog = this.db.prepare(
      `INSERT INTO log (server_seq, server_time, site_id, entry_kind, entity_id, body, content_hash) VALUES (?, ?, ?, ?, ?, ?, '')`,
    );
    const upsertCurrent = this.db.prepare(
      `INSERT INTO setup_current (entry_kind, entity_id, site_id, body, server_seq) VALUES (?, ?, ?, ?, ?)
       ON CONFLICT (entry_kind, entity_id) DO UPDATE SET site_id = excluded.site_id, body = excluded.body, server_seq = excluded.server_seq`,
    );
    return this.db
      .transaction(() =>
        entries.map(({ siteId, record }) => {
          const seq = this.nextSeq();
          const body = JSON.stringify(record.body);
          insertLog.run(seq, serverTime, siteId, record.kind, record.id, body);
          upsertCurrent.run(record.kind, record.id, siteId, body, seq);
          return seq;
        }),
      )
      .immediate();
  }

  async getSetup<K extends SetupKind>(kind: K, id: string): Promise<CurrentSetup<K> | undefined> {
    const row = this.db
      .prepare(`SELECT site_id, body, server_seq FROM setup_current WHERE entry_kind = ? AND entity_id = ?`)
      .get(kind, id) as { site_id: string; body: string; server_seq: number } | undefined;
    return row && { kind, id, siteId: row.site_id, body: JSON.parse(row.body) as SetupBody<K>, serverSeq: row.server_seq };
  }

  async listSetup<K extends SetupKind>(siteId: string, kind: K): Promise<CurrentSetup<K>[]> {
    const rows = this.db
      .prepare(`SELECT entity_id, body, server_seq FROM setup_current WHERE site_id = ? AND entry_kind = ? ORDER BY entity_id`)
      .all(siteId, kind) as { entity_id: string; body: string; server_seq: number }[];
    return rows.map((r) => ({ kind, id: r.entity_id, siteId, body: JSON.parse(r.body) as SetupBody<K>, serverSeq: r.server_seq }));
  }

  async setPersonSecrets(s: PersonSecrets): Promise<void> {
    this.db
      .prepare(
        `INSERT INTO person_secrets (person_id, pin_hash, pin_salt, verifier_salt, verifier_hash, verifier_iterations, updated_at)
         VALUES (?, ?, ?, ?, ?, ?, ?)
         ON CONFLICT (person_id) DO UPDATE SET pin_hash = excluded.pin_hash, pin_salt = excluded.pin_salt,
           verifier_salt = excluded.verifier_salt, verifier_hash = excluded.verifier_hash,
           verifier_iterations = excluded.verifier_iterations, updated_at = excluded.updated_at`,
      )
      .run(s.personId, s.pinHash, s.pinSalt, s.verifierSalt, s.verifierHash, s.verifierIterations, s.updatedAt);
  }

  async getPersonSecrets(personId: string): Promise<PersonSecrets | undefined> {
    const r = this.db.prepare(`SELECT * FROM person_secrets WHERE person_id = ?`).get(personId) as
      | {
          person_id: string;
          pin_hash: string;
          pin_salt: string;
          verifier_salt: string;
          verifier_hash: string;
          verifier_iterations: number;
          updated_at: string;
        }
      | undefined;
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
    this.db
      .prepare(`INSERT INTO enrolment_codes (code_hash, site_id, created_by, created_at, expires_at) VALUES (?, ?, ?, ?, ?)`)
      .run(c.codeHash, c.siteId, c.createdBy, c.createdAt, c.expiresAt);
  }

  async redeemEnrolmentCode(codeHash: string, now: string, device: NewDevice): Promise<RedeemResult> {
    return this.db
      .transaction((): RedeemResult => {
        const code = this.db
          .prepare(`SELECT site_id, expires_at, used_at FROM enrolment_codes WHERE code_hash = ?`)
          .get(codeHash) as { site_id: string; expires_at: string; used_at: string | null } | undefined;
        if (!code) return { ok: false, reason: 'unknown' };
        if (code.used_at !== null) return { ok: false, reason: 'used' };
        if (Date.parse(code.expires_at) <= Date.parse(now)) return { ok: false, reason: 'expired' };
        this.db.prepare(`UPDATE enrolment_codes SET used_at = ?, used_by_device = ? WHERE code_hash = ?`).run(now, device.id, codeHash);
        this.insertDevice({ ...device, siteId: code.site_id });
        return { ok: true, siteId: code.site_id };
      })
      .immediate();
  }

  async createDevice(device: NewDevice & { siteId: string }): Promise<void> {
    this.insertDevice(device);
  }

  private insertDevice(d: NewDevice & { siteId: string }): void {
    this.db
      .prepare(`INSERT INTO devices (id, site_id, name, token_hash, enrolled_at) VALUES (?, ?, ?, ?, ?)`)
      .run(d.id, d.siteId, d.name, d.tokenHash, d.enrolledAt);
  }

  async findDeviceByTokenHash(tokenHash: string): Promise<DeviceRow | undefined> {
    const r = this.db.prepare(`SELECT ${DEVICE_COLUMNS} FROM devices WHERE token_hash = ?`).get(tokenHash) as DeviceDbRow | undefined;
    return r && toDeviceRow(r);
  }

  async getDevice(id: string): Promise<DeviceRow | undefined> {
    const r = this.db.prepare(`SELECT ${DEVICE_COLUMNS} FROM devices WHERE id = ?`).get(id) as DeviceDbRow | undefined;
    return r && toDeviceRow(r);
  }

  async listDevices(siteId: string): Promise<DeviceRow[]> {
    const rows = this.db.prepare(`SELECT ${DEVICE_COLUMNS} FROM devices WHERE site_id = ? ORDER BY enrolled_at, id`).all(siteId) as DeviceDbRow[];
    return rows.map(toDeviceRow);
  }

  async listDeviceActivity(siteId: string): Promise<DeviceActivity[]> {
    const rows = this.db.prepare(DEVICE_ACTIVITY_SQL).all(siteId) as Parameters<typeof toDeviceActivity>[0][];
    return rows.map(toDeviceActivity);
  }

  async noteDeviceSeqs(deviceId: string, seqs: readonly { readonly seq: number; readonly recordId: string }[]): Promise<void> {
    const insert = this.db.prepare(`INSERT INTO device_seqs (device_id, device_seq, record_id) VALUES (?, ?, ?) ON CONFLICT DO NOTHING`);
    this.db.transaction(() => {
      for (const s of seqs) insert.run(deviceId, s.seq, s.recordId);
    })();
  }

  async listSeqCoverage(siteId: string): Promise<SeqCoverage[]> {
    const counts = this.db.prepare(SEQ_COUNTS_SQL).all(siteId) as Parameters<typeof toSeqCoverage>[0][number][];
    const gaps = this.db.prepare(SEQ_GAPS_SQL).all(siteId) as Parameters<typeof toSeqCoverage>[1][number][];
    return toSeqCoverage(counts, gaps);
  }

  async revokeDevice(id: string, at: string): Promise<boolean> {
    const result = this.db.prepare(`UPDATE devices SET revoked_at = COALESCE(revoked_at, ?) WHERE id = ?`).run(at, id);
    return result.changes > 0;
  }

  async reinstateDevice(id: string): Promise<boolean> {
    const result = this.db.prepare(`UPDATE devices SET revoked_at = NULL WHERE id = ?`).run(id);
    return result.changes > 0;
  }

  async createSession(s: SessionRow): Promise<void> {
    this.db
      .prepare(`INSERT INTO sessions (token_hash, person_id, device_id, created_at, expires_at) VALUES (?, ?, ?, ?, ?)`)
      .run(s.tokenHash, s.personId, s.deviceId, s.createdAt, s.expiresAt);
  }

  async findSessionByTokenHash(tokenHash: string): Promise<SessionRow | undefined> {
    const r = this.db
      .prepare(`SELECT person_id, device_id, created_at, expires_at FROM sessions WHERE token_hash = ?`)
      .get(tokenHash) as { person_id: string; device_id: string; created_at: string; expires_at: string } | undefined;
    return r && { tokenHash, personId: r.person_id, deviceId: r.device_id, createdAt: r.created_at, expiresAt: r.expires_at };
  }

  async insertRecords(items: readonly RecordToInsert[], serverTime: string): Promise<InsertOutcome[]> {
    const findRecord = this.db.prepare(`SELECT server_seq, content_hash FROM device_records WHERE id = ?`);
    const insertLog = this.db.prepare(
      `INSERT INTO log (server_seq, server_time, site_id, entry_kind, entity_id, body, content_hash, device_id, person_id, client_time)
       VALUES (?, ?, ?, 'record', ?, ?, ?, ?, ?, ?)`,
    );
    const insertRecord = this.db.prepare(`INSERT INTO device_records (id, server_seq, content_hash) VALUES (?, ?, ?)`);
    return this.db
      .transaction(() =>
        items.map((item): InsertOutcome => {
          const id = item.record.id;
          const existing = findRecord.get(id) as { server_seq: number; content_hash: string } | undefined;
          if (existing) {
            const status = existing.content_hash === item.contentHash ? 'duplicate' : 'conflict';
            return { id, status, serverSeq: existing.server_seq };
          }
          const seq = this.nextSeq();
          insertLog.run(seq, serverTime, item.siteId, id, JSON.stringify(item.record), item.contentHash, item.deviceId, item.personId, item.clientTime);
          insertRecord.run(id, seq, item.contentHash);
          return { id, status: 'stored', serverSeq: seq };
        }),
      )
      .immediate();
  }

  async readLog(siteId: string, after: number, limit: number): Promise<LogRow[]> {
    const rows = this.db
      .prepare(
        `SELECT server_seq, server_time, entry_kind, entity_id, body FROM log
         WHERE site_id = ? AND server_seq > ? ORDER BY server_seq LIMIT ?`,
      )
      .all(siteId, after, limit) as LogDbRow[];
    return rows.map(toLogRow);
  }

  async close(): Promise<void> {
    this.db.close();
  }

  /** Next serverSeq; only called inside a write transaction (the counter row serialises writers). */
  private nextSeq(): number {
    const row = this.db.prepare(`UPDATE counters SET value = value + 1 WHERE name = 'log' RETURNING value`).get() as { value: number };
    return row.value;
  }
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
  const base = { serverSeq: r.server_seq, serverTime: r.server_time };
  if (r.entry_kind === 'record') {
    return { ...base, entry: { kind: 'record', id: r.entity_id, body: JSON.parse(r.body) as DeviceRecord } };
  }
  return { ...base, entry: { kind: r.entry_kind, id: r.entity_id, body: JSON.parse(r.body) } as SetupRecord };
}

/**
 * Numbered schema steps shared by both stores (SQLite and PostgreSQL run the same SQL). Steps only
 * add; a step never edits an earlier one. Each store applies the steps newer than its database's
 * version, one transaction per step, and records them in `schema_migrations`.
 *
 * Keep the SQL to what both accept: TEXT, INTEGER, BIGINT, PRIMARY KEY/UNIQUE, CREATE INDEX,
 * plain INSERT. No AUTOINCREMENT/SERIAL (serverSeq comes from the counter row), no SQLite-only
 * pragmas or PostgreSQL-only types; test/server runs the migrations on both back-ends.
 */
export interface Migration {
  readonly version: number;
  readonly name: string;
  readonly statements: readonly string[];
}

export const MIGRATIONS: readonly Migration[] = [
  {
    version: 1,
    name: 'log, set-up, devices, people secrets, sessions, enrolment codes',
    statements: [
      `CREATE TABLE meta (key TEXT PRIMARY KEY, value TEXT NOT NULL)`,
      // One counter row: serverSeq is assigned from it inside the writing transaction, so the
      // sequence follows commit order on every back-end (sync.md §3.6).
      `CREATE TABLE counters (name TEXT PRIMARY KEY, value BIGINT NOT NULL)`,
      `INSERT INTO counters (name, value) VALUES ('log', 0)`,
      `CREATE TABLE log (
         server_seq BIGINT PRIMARY KEY,
         server_time TEXT NOT NULL,
         site_id TEXT NOT NULL,
         entry_kind TEXT NOT NULL,
         entity_id TEXT NOT NULL,
         body TEXT NOT NULL,
         content_hash TEXT NOT NULL,
         device_id TEXT,
         person_id TEXT,
         client_time TEXT
       )`,
      `CREATE INDEX log_site_seq ON log (site_id, server_seq)`,
      // Device records: the record id is the permanent idempotency key.
      `CREATE TABLE device_records (
         id TEXT PRIMARY KEY,
         server_seq BIGINT NOT NULL UNIQUE,
         content_hash TEXT NOT NULL
       )`,
      `CREATE TABLE setup_current (
         entry_kind TEXT NOT NULL,
         entity_id TEXT NOT NULL,
         site_id TEXT NOT NULL,
         body TEXT NOT NULL,
         server_seq BIGINT NOT NULL,
         PRIMARY KEY (entry_kind, entity_id)
       )`,
      `CREATE INDEX setup_current_site ON setup_current (site_id, entry_kind)`,
      `CREATE TABLE person_secrets (
         person_id TEXT PRIMARY KEY,
         pin_hash TEXT NOT NULL,
         pin_salt TEXT NOT NULL,
         verifier_salt TEXT NOT NULL,
         verifier_hash TEXT NOT NULL,
         verifier_iterations INTEGER NOT NULL,
         updated_at TEXT NOT NULL
       )`,
      `CREATE TABLE devices (
         id TEXT PRIMARY KEY,
         site_id TEXT NOT NULL,
         name TEXT NOT NULL,
         token_hash TEXT NOT NULL UNIQUE,
         enrolled_at TEXT NOT NULL,
         revoked_at TEXT
       )`,
      `CREATE TABLE enrolment_codes (
         code_hash TEXT PRIMARY KEY,
         site_id TEXT NOT NULL,
         created_by TEXT NOT NULL,
         created_at TEXT NOT NULL,
         expires_at TEXT NOT NULL,
         used_at TEXT,
         used_by_device TEXT
       )`,
      `CREATE TABLE sessions (
         token_hash TEXT PRIMARY KEY,
         person_id TEXT NOT NULL,
         device_id TEXT NOT NULL,
         created_at TEXT NOT NULL,
         expires_at TEXT NOT NULL
       )`,
    ],
  },
  {
    version: 2,
    name: 'device sequence numbers received',
    statements: [
      // Every (tablet, device sequence) the server has received, whatever became of the record
      // (stored, duplicate, conflict or refused): the numbers it never received are the gaps.
      `CREATE TABLE device_seqs (
         device_id TEXT NOT NULL,
         device_seq BIGINT NOT NULL,
         record_id TEXT NOT NULL,
         PRIMARY KEY (device_id, device_seq)
       )`,
    ],
  },
];

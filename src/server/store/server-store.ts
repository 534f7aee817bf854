import type { DeviceRecord, PushStatus, SetupRecord } from '../../schema/index';

/**
 * Storage behind the sync server. Every method returns a Promise so that a PostgreSQL
 * implementation can share this contract with the (synchronous) SQLite one.
 *
 * The log: one sequence of entries in server order (`serverSeq`, assigned at commit, strictly
 * increasing in commit order), holding both set-up versions and device records. Pulls read it
 * by cursor; nothing in it is ever updated or deleted.
 */
export interface ServerStore {
  /** Random string that identifies this database's history; a restored copy gets a new one. */
  getServerEpoch(): Promise<string>;

  /** Appends new versions of set-up entities to the log in one transaction; returns their serverSeqs in order. */
  appendSetup(entries: readonly SiteScopedSetup[], serverTime: string): Promise<number[]>;
  /** Latest version of one set-up entity, or undefined. */
  getSetup<K extends SetupKind>(kind: K, id: string): Promise<CurrentSetup<K> | undefined>;
  /** Latest versions of every entity of one kind at a site. */
  listSetup<K extends SetupKind>(siteId: string, kind: K): Promise<CurrentSetup<K>[]>;

  /** Stores (or replaces) the secrets of a person: PIN hash and the offline verifier. */
  setPersonSecrets(secrets: PersonSecrets): Promise<void>;
  getPersonSecrets(personId: string): Promise<PersonSecrets | undefined>;

  createEnrolmentCode(code: NewEnrolmentCode): Promise<void>;
  /**
   * Atomically uses a code and creates the device: succeeds only if the code exists, is unused
   * and has not expired at `now`. A used or expired code is reported, never reused.
   */
  redeemEnrolmentCode(codeHash: string, now: string, device: NewDevice): Promise<RedeemResult>;
  findDeviceByTokenHash(tokenHash: string): Promise<DeviceRow | undefined>;
  getDevice(id: string): Promise<DeviceRow | undefined>;
  listDevices(siteId: string): Promise<DeviceRow[]>;
  /** When each tablet of a site last sent records and last had someone sign in (null: never). */
  listDeviceActivity(siteId: string): Promise<DeviceActivity[]>;
  /** Notes the device sequence numbers of a pushed batch (insert-if-absent; a resend changes nothing). */
  noteDeviceSeqs(deviceId: string, seqs: readonly { readonly seq: number; readonly recordId: string }[]): Promise<void>;
  /** Per tablet of the site that sent sequence numbers: how many, the highest, and the numbers below it never received. */
  listSeqCoverage(siteId: string): Promise<SeqCoverage[]>;
  /** Withdraws a device: its token stops working at once. Returns false if there is no such device. */
  revokeDevice(id: string, at: string): Promise<boolean>;
  /** Gives a withdrawn device back: its same token works again (a device in use stays as it is). Returns false if there is no such device. */
  reinstateDevice(id: string): Promise<boolean>;
  /** Registers a device directly (the demo seeder's own device); fails if the id exists. */
  createDevice(device: NewDevice & { siteId: string }): Promise<void>;

  createSession(session: SessionRow): Promise<void>;
  findSessionByTokenHash(tokenHash: string): Promise<SessionRow | undefined>;

  /**
   * Inserts device records in ONE transaction, insert-if-absent by id. For each item:
   * new id → 'stored' with a fresh serverSeq; same id and same content hash → 'duplicate' with the
   * stored serverSeq; same id, different content → 'conflict' (the stored record is kept).
   * The SQLite store reads then inserts, which is safe because SQLite has one writer at a time;
   * the PostgreSQL store uses `INSERT … ON CONFLICT (id) DO NOTHING` and assigns serverSeq from
   * the counter row, locked until COMMIT, so that sequence order is commit order.
   */
  insertRecords(items: readonly RecordToInsert[], serverTime: string): Promise<InsertOutcome[]>;

  /** Log entries of a site with serverSeq > after, in serverSeq order, at most `limit`. */
  readLog(siteId: string, after: number, limit: number): Promise<LogRow[]>;

  close(): Promise<void>;
}

export type SetupKind = SetupRecord['kind'];
export type SetupBody<K extends SetupKind> = Extract<SetupRecord, { kind: K }>['body'];

/** A set-up entry together with the site it belongs to (the log is read per site). */
export interface SiteScopedSetup {
  readonly siteId: string;
  readonly record: SetupRecord;
}

export interface CurrentSetup<K extends SetupKind> {
  readonly kind: K;
  readonly id: string;
  readonly siteId: string;
  readonly body: SetupBody<K>;
  readonly serverSeq: number;
}

export interface PersonSecrets {
  readonly personId: string;
  /** scrypt of the PIN, see pin-hash.ts. */
  readonly pinHash: string;
  readonly pinSalt: string;
  /** PBKDF2-SHA256 of the PIN for offline sign-in on tablets, see pin-hash.ts. */
  readonly verifierSalt: string;
  readonly verifierHash: string;
  readonly verifierIterations: number;
  readonly updatedAt: string;
}

export interface NewEnrolmentCode {
  readonly codeHash: string;
  readonly siteId: string;
  readonly createdBy: string;
  readonly createdAt: string;
  readonly expiresAt: string;
}

export interface NewDevice {
  readonly id: string;
  readonly name: string;
  readonly tokenHash: string;
  readonly enrolledAt: string;
}

export type RedeemResult =
  | { readonly ok: true; readonly siteId: string }
  | { readonly ok: false; readonly reason: 'unknown' | 'used' | 'expired' };

export interface DeviceRow {
  readonly id: string;
  readonly siteId: string;
  readonly name: string;
  readonly enrolledAt: string;
  readonly revokedAt: string | null;
}

export interface DeviceActivity {
  readonly deviceId: string;
  /** Server time of the newest record the tablet sent. */
  readonly lastUploadAt: string | null;
  /** When someone last signed in (online) on the tablet. */
  readonly lastSignInAt: string | null;
}

/** Both back-ends run this (`?` placeholders; the PostgreSQL store numbers them). ISO strings order as text. */
export const DEVICE_ACTIVITY_SQL = `SELECT d.id AS device_id,
  (SELECT MAX(l.server_time) FROM log l WHERE l.site_id = d.site_id AND l.device_id = d.id) AS last_upload,
  (SELECT MAX(s.created_at) FROM sessions s WHERE s.device_id = d.id) AS last_sign_in
  FROM devices d WHERE d.site_id = ?`;

export function toDeviceActivity(r: { device_id: string; last_upload: string | null; last_sign_in: string | null }): DeviceActivity {
  return { deviceId: r.device_id, lastUploadAt: r.last_upload ?? null, lastSignInAt: r.last_sign_in ?? null };
}

/** What a tablet's device sequence numbers tell: records received, the highest number, and the gaps below it. */
export interface SeqCoverage {
  readonly deviceId: string;
  readonly received: number;
  readonly highest: number;
  /** Numbers below `highest` never received, as ranges (at most MAX_GAPS_LISTED of them). */
  readonly gaps: readonly { readonly from: number; readonly to: number }[];
  /** How many numbers the gaps hold in all (also those past the listed ranges). */
  readonly missing: number;
}

export const MAX_GAPS_LISTED = 20;

/** Both back-ends run these (`?` placeholders; the PostgreSQL store numbers them). */
export const SEQ_COUNTS_SQL = `SELECT s.device_id AS device_id, COUNT(*) AS received, MAX(s.device_seq) AS highest
  FROM device_seqs s JOIN devices d ON d.id = s.device_id WHERE d.site_id = ? GROUP BY s.device_id`;
export const SEQ_GAPS_SQL = `SELECT device_id, prev + 1 AS gap_from, device_seq - 1 AS gap_to FROM (
    SELECT s.device_id AS device_id, s.device_seq AS device_seq,
      COALESCE(LAG(s.device_seq) OVER (PARTITION BY s.device_id ORDER BY s.device_seq), 0) AS prev
    FROM device_seqs s JOIN devices d ON d.id = s.device_id WHERE d.site_id = ?
  ) t WHERE device_seq > prev + 1 ORDER BY device_id, gap_from`;

/** The coverage of each tablet from the two queries' rows (numbers may come back as strings from PostgreSQL's BIGINT). */
export function toSeqCoverage(
  counts: readonly { device_id: string; received: number | string; highest: number | string }[],
  gaps: readonly { device_id: string; gap_from: number | string; gap_to: number | string }[],
): SeqCoverage[] {
  return counts.map((c) => {
    const mine = gaps.filter((g) => g.device_id === c.device_id).map((g) => ({ from: Number(g.gap_from), to: Number(g.gap_to) }));
    return {
      deviceId: c.device_id,
      received: Number(c.received),
      highest: Number(c.highest),
      gaps: mine.slice(0, MAX_GAPS_LISTED),
      missing: mine.reduce((n, g) => n + g.to - g.from + 1, 0),
    };
  });
}

export interface SessionRow {
  readonly tokenHash: string;
  readonly personId: string;
  readonly deviceId: string;
  readonly createdAt: string;
  readonly expiresAt: string;
}

export interface RecordToInsert {
  readonly record: DeviceRecord;
  readonly siteId: string;
  /** sha256 of the canonical JSON of `record`. */
  readonly contentHash: string;
  /** Audit: the device that sent it (from the token), the person named in it, the device's clock. */
  readonly deviceId: string;
  readonly personId: string;
  readonly clientTime: string;
}

export interface InsertOutcome {
  readonly id: string;
  readonly status: Extract<PushStatus, 'stored' | 'duplicate' | 'conflict'>;
  /** For 'stored' and 'duplicate': the record's serverSeq; for 'conflict': that of the record kept. */
  readonly serverSeq: number;
}

export type LogRow =
  | { readonly serverSeq: number; readonly serverTime: string; readonly entry: SetupRecord }
  | { readonly serverSeq: number; readonly serverTime: string; readonly entry: { kind: 'record'; id: string; body: DeviceRecord } };


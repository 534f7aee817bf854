import { EntityId, Instant, NonEmptyText, RecordId, z } from './common';
import { DeviceRecord } from './records';
import { CauseList, Characteristic, Line, Person, Phase, Site, Station } from './setup';

/** Sent in every request as the `x-plumbline-protocol` header; a mismatch is answered 426 with a clear message. */
export const PROTOCOL_VERSION = 1;
export const PROTOCOL_HEADER = 'x-plumbline-protocol';
export const MAX_PUSH_RECORDS = 200;
export const MAX_PULL_PAGE = 500;

/** POST /api/v1/enrol: a tablet exchanges a one-time code for a device token. */
export const EnrolRequest = z.object({ code: NonEmptyText(32), deviceName: NonEmptyText(60) });
export type EnrolRequest = z.infer<typeof EnrolRequest>;
export const EnrolResponse = z.object({ deviceId: EntityId, deviceToken: NonEmptyText(200), siteId: EntityId });
export type EnrolResponse = z.infer<typeof EnrolResponse>;

/** POST /api/v1/sign-in (device token required): a person signs in with login and PIN. */
export const SignInRequest = z.object({ login: NonEmptyText(40), pin: z.string().check(z.regex(/^[0-9]{4,12}$/)) });
export type SignInRequest = z.infer<typeof SignInRequest>;
export const SignInResponse = z.object({
  person: Person,
  sessionToken: NonEmptyText(200),
  /** Salted slow hash of the PIN so the same person can sign in on this tablet offline. */
  offlineVerifier: z.object({ salt: NonEmptyText(64), hash: NonEmptyText(128), iterations: z.int().check(z.positive()) }),
});
export type SignInResponse = z.infer<typeof SignInResponse>;

/** POST /api/v1/sync/push: up to MAX_PUSH_RECORDS device records. */
export const PushRequest = z.object({
  batchId: RecordId,
  records: z.array(z.unknown()).check(z.minLength(1), z.maxLength(MAX_PUSH_RECORDS)),
  /**
   * The tablet's sequence number of each record (same order), counting every record it ever made
   * from 1 without gaps: the server lists which numbers it never received (sync.md: a wiped tablet's
   * unsent records show as a gap). Optional: older tablets do not send it.
   */
  deviceSeqs: z.optional(z.array(z.int().check(z.minimum(1)))),
});
export type PushRequest = { batchId: string; records: DeviceRecord[]; deviceSeqs?: number[] };

export const PushStatus = z.enum(['stored', 'duplicate', 'conflict', 'rejected']);
export type PushStatus = z.infer<typeof PushStatus>;
export const PushResult = z.object({
  id: z.string(),
  status: PushStatus,
  serverSeq: z.optional(z.int()),
  reason: z.optional(z.string()),
});
export type PushResult = z.infer<typeof PushResult>;
export const PushResponse = z.object({ serverEpoch: z.string(), results: z.array(PushResult) });
export type PushResponse = z.infer<typeof PushResponse>;

/** Set-up entities travel in the same pull as device records. */
export const SetupRecord = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('site'), id: EntityId, body: Site }),
  z.object({ kind: z.literal('line'), id: EntityId, body: Line }),
  z.object({ kind: z.literal('station'), id: EntityId, body: Station }),
  z.object({ kind: z.literal('characteristic'), id: EntityId, body: Characteristic }),
  z.object({ kind: z.literal('phase'), id: EntityId, body: Phase }),
  z.object({ kind: z.literal('person'), id: EntityId, body: Person }),
  z.object({ kind: z.literal('causes'), id: EntityId, body: CauseList }),
]);
export type SetupRecord = z.infer<typeof SetupRecord>;

/** One entry of the server's log, in server sequence order. */
export const PulledEntry = z.object({
  serverSeq: z.int().check(z.positive()),
  serverTime: Instant,
  entry: z.union([SetupRecord, z.object({ kind: z.literal('record'), id: RecordId, body: DeviceRecord })]),
});
export type PulledEntry = z.infer<typeof PulledEntry>;

/** GET /api/v1/sync/pull?after=<serverSeq>&limit=<n> */
export const PullResponse = z.object({
  serverEpoch: z.string(),
  entries: z.array(PulledEntry),
  /** Cursor for the next page: the last serverSeq in `entries`, or `after` when empty. */
  next: z.int().check(z.minimum(0)),
  hasMore: z.boolean(),
});
export type PullResponse = z.infer<typeof PullResponse>;

/** Every error answer: a stable code and a sentence for a person. */
export const ErrorBody = z.object({ error: z.string(), message: z.string() });
export type ErrorBody = z.infer<typeof ErrorBody>;


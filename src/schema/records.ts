import { EntityId, Instant, NonEmptyText, OptionalText, RecordId, z } from './common';
import { SignalRuleId } from './setup';

/**
 * One subgroup as recorded at the machine. Append-only: a correction is a new Sample whose
 * `supersedes` names the one it replaces, with a reason; nothing is overwritten.
 * Variable charts fill `values`; attribute charts fill `count` (defectives or defects) and
 * `inspected` (items inspected, or area units for a u chart).
 */
export const Sample = z.object({
  kind: z.literal('sample'),
  id: RecordId,
  characteristicId: EntityId,
  takenAt: Instant,
  recordedBy: EntityId,
  deviceId: EntityId,
  values: z.optional(z.array(z.number()).check(z.minLength(1), z.maxLength(25))),
  count: z.optional(z.int().check(z.minimum(0))),
  inspected: z.optional(z.number().check(z.positive())),
  lot: OptionalText(60),
  comment: OptionalText(400),
  supersedes: z.optional(RecordId),
  reason: OptionalText(400),
  /** Excluded from limit calculation (engineer only, with a reason). */
  excluded: z.optional(z.boolean()),
  /** Set when the sample came from a history file (CSV import) rather than from entry at the machine. */
  imported: z.optional(z.object({ file: NonEmptyText(200), line: z.int().check(z.minimum(1)) })),
});
export type Sample = z.infer<typeof Sample>;

/** What fired, kept with the response so history stays true after limits change. */
export const SignalSnapshot = z.object({
  rule: SignalRuleId,
  explanation: NonEmptyText(300),
  phaseId: z.optional(EntityId),
  centre: z.nullable(z.number()),
  ucl: z.nullable(z.number()),
  lcl: z.nullable(z.number()),
  /** Ids of the samples that make up the pattern, the newest last. */
  sampleIds: z.array(RecordId),
});
export type SignalSnapshot = z.infer<typeof SignalSnapshot>;

/** The operator's answer to a signal: what happened, the suspected cause and the action taken. */
export const Response = z.object({
  kind: z.literal('response'),
  id: RecordId,
  characteristicId: EntityId,
  /** The sample at which the signal fired. */
  sampleId: RecordId,
  signals: z.array(SignalSnapshot).check(z.minLength(1)),
  whatHappened: NonEmptyText(400),
  causeCategory: NonEmptyText(60),
  cause: OptionalText(200),
  action: NonEmptyText(400),
  respondedBy: EntityId,
  respondedAt: Instant,
  deviceId: EntityId,
});
export type Response = z.infer<typeof Response>;

/** A supervisor's acknowledgement of a response; the signal is closed once acknowledged. */
export const Acknowledgement = z.object({
  kind: z.literal('ack'),
  id: RecordId,
  responseId: RecordId,
  characteristicId: EntityId,
  by: EntityId,
  at: Instant,
  note: OptionalText(400),
  deviceId: EntityId,
});
export type Acknowledgement = z.infer<typeof Acknowledgement>;

/** Everything a device creates and uploads. */
export const DeviceRecord = z.discriminatedUnion('kind', [Sample, Response, Acknowledgement]);
export type DeviceRecord = z.infer<typeof DeviceRecord>;
export type DeviceRecordKind = DeviceRecord['kind'];


import { EntityId, NonEmptyText, OptionalText, z } from './common';

/** Roles, from least to most set-up power. Checked on the server for every route and in the UI. */
export const Role = z.enum(['operator', 'supervisor', 'engineer', 'admin']);
export type Role = z.infer<typeof Role>;

export const Site = z.object({ id: EntityId, name: NonEmptyText(80) });
export type Site = z.infer<typeof Site>;

export const Line = z.object({ id: EntityId, siteId: EntityId, name: NonEmptyText(80) });
export type Line = z.infer<typeof Line>;

export const Station = z.object({ id: EntityId, lineId: EntityId, name: NonEmptyText(80) });
export type Station = z.infer<typeof Station>;

/**
 * Chart types. Variable charts take measured values (EWMA and CUSUM too: individuals or
 * subgroups, for small sustained shifts); attribute charts take counts.
 */
export const ChartType = z.enum(['xmr', 'xbar-r', 'xbar-s', 'p', 'np', 'c', 'u', 'ewma', 'cusum']);
export type ChartType = z.infer<typeof ChartType>;
export const VARIABLE_CHARTS: readonly ChartType[] = ['xmr', 'xbar-r', 'xbar-s', 'ewma', 'cusum'];
export const isVariableChart = (t: ChartType): boolean => VARIABLE_CHARTS.includes(t);

/** Run-rule identifiers: Western Electric 1–4 ('we1'…'we4') and Nelson 1–8 ('n1'…'n8'). */
export const RuleId = z.enum(['we1', 'we2', 'we3', 'we4', 'n1', 'n2', 'n3', 'n4', 'n5', 'n6', 'n7', 'n8']);
export type RuleId = z.infer<typeof RuleId>;

/** What a signal can name: a run rule, or the EWMA / CUSUM chart's own decision. */
export const SignalRuleId = z.enum(['we1', 'we2', 'we3', 'we4', 'n1', 'n2', 'n3', 'n4', 'n5', 'n6', 'n7', 'n8', 'ewma', 'cusum']);
export type SignalRuleId = z.infer<typeof SignalRuleId>;

export const SpecLimits = z.object({
  lsl: z.optional(z.number()),
  usl: z.optional(z.number()),
  target: z.optional(z.number()),
});
export type SpecLimits = z.infer<typeof SpecLimits>;

/** The six usual cause-and-effect categories (common practice), the default cause list. */
export const DEFAULT_CAUSE_CATEGORIES = ['People', 'Machine', 'Method', 'Material', 'Measurement', 'Environment'] as const;

export const Characteristic = z.object({
  id: EntityId,
  stationId: EntityId,
  name: NonEmptyText(80),
  /** Unit of the measured value ('mm', 'N·m'); for attribute charts the thing counted ('defectives', 'blemishes'). */
  unit: NonEmptyText(24),
  /** Number of decimals the gauge reads (the resolution), 0–6. */
  decimals: z.int().check(z.minimum(0), z.maximum(6)),
  chartType: ChartType,
  /** Values per subgroup for variable charts (1 for XmR); for p/np the usual inspected quantity. */
  subgroupSize: z.int().check(z.minimum(1), z.maximum(10000)),
  /** Sampling interval in minutes: a sample is due this long after the previous one. */
  intervalMinutes: z.int().check(z.minimum(1), z.maximum(60 * 24 * 31)),
  spec: SpecLimits,
  rules: z.array(RuleId),
  /** Steps of the reaction plan, offered as the "action taken" when a rule fires. */
  reactionPlan: z.array(NonEmptyText(200)),
  /** Cause categories offered in the signal prompt; empty means the site default. */
  causeCategories: z.array(NonEmptyText(60)),
  /** A safety-critical characteristic shows the caution wherever it is entered or charted. */
  safetyCritical: z.boolean(),
  /** Subgroups at the start of each phase used to compute its limits (baseline), unless limits are given. */
  baselineSize: z.int().check(z.minimum(2), z.maximum(1000)),
  /** EWMA design: weight λ (0 < λ ≤ 1) and limit width L in sigmas (e.g. λ 0.2, L 2.962: Lucas & Saccucci). */
  ewma: z.optional(z.object({ lambda: z.number().check(z.positive(), z.maximum(1)), L: z.number().check(z.positive()) })),
  /** Tabular CUSUM design: reference value k and decision interval h, in sigmas (e.g. k 0.5, h 4 or 5). */
  cusum: z.optional(z.object({ k: z.number().check(z.minimum(0)), h: z.number().check(z.positive()) })),
});
export type Characteristic = z.infer<typeof Characteristic>;

/** Who changed or withdrew a phase, when, and the note saying why. */
export const PhaseNote = z.object({ at: z.iso.datetime(), by: EntityId, note: NonEmptyText(400) });
export type PhaseNote = z.infer<typeof PhaseNote>;

/** One correction of a phase: the note, and the start, reason and limits it replaced. */
export const PhaseCorrection = z.object({
  at: z.iso.datetime(),
  by: EntityId,
  note: NonEmptyText(400),
  was: z.object({
    startsAt: z.iso.datetime(),
    reason: NonEmptyText(400),
    given: z.optional(z.object({ centre: z.number(), sigma: z.number().check(z.positive()) })),
    baselineCount: z.optional(z.int().check(z.minimum(2), z.maximum(1000))),
  }),
});
export type PhaseCorrection = z.infer<typeof PhaseCorrection>;

/** A phase: limits hold from `startsAt` until the next phase of the same characteristic. */
export const Phase = z.object({
  id: EntityId,
  characteristicId: EntityId,
  /** Ordinal of the phase within its characteristic, 1 for the first. */
  number: z.int().check(z.minimum(1)),
  startsAt: z.iso.datetime(),
  /** The documented process change that started the phase. */
  reason: NonEmptyText(400),
  /** Limits given from an earlier study or a standard (centre and sigma of individual values); otherwise computed from the baseline. */
  given: z.optional(z.object({ centre: z.number(), sigma: z.number().check(z.positive()) })),
  /** Subgroups of this phase's baseline when it differs from the characteristic's baselineSize (absent: baselineSize). */
  baselineCount: z.optional(z.int().check(z.minimum(2), z.maximum(1000))),
  /** Corrections of this phase, oldest first: each a new version of the same id, with who, when, why and what it replaced. */
  corrections: z.optional(z.array(PhaseCorrection).check(z.maxLength(100))),
  /** Set when the phase was withdrawn (started by mistake): the engine leaves it out, the limits history still lists it. */
  withdrawn: z.optional(PhaseNote),
});
export type Phase = z.infer<typeof Phase>;

/** A person as the tablets see them: no secrets travel except the offline verifier (a salted slow hash). */
export const Person = z.object({
  id: EntityId,
  name: NonEmptyText(80),
  login: NonEmptyText(40),
  role: Role,
  active: z.boolean(),
  /**
   * Names the PIN in force (see pinRefOf in admin.ts: from its offline verifier's salt). A tablet whose
   * cached verifier names another PIN does not take it offline: a PIN reset reaches tablets at their next sync.
   */
  pinRef: z.optional(z.string().check(z.regex(/^[0-9a-f]{16}$/))),
});
export type Person = z.infer<typeof Person>;

export const CauseList = z.object({ siteId: EntityId, categories: z.array(NonEmptyText(60)) });
export type CauseList = z.infer<typeof CauseList>;

export const OptionalNote = OptionalText(400);

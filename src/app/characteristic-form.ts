import { Characteristic, isVariableChart, type ChartType, type RuleId } from '../schema';
import { DEFAULT_CUSUM, DEFAULT_EWMA } from './analysis-input';
import { fieldErrorsFrom, readNumber, type FieldErrors } from './form-issues';

/**
 * The characteristic editor's form as typed: numbers stay text until saved, so a half-typed
 * "0," is not lost. `characteristicFromForm` turns it into a schema-valid Characteristic or
 * says, field by field, what is wrong.
 */
export interface CharacteristicForm {
  readonly id: string;
  readonly stationId: string;
  readonly name: string;
  readonly unit: string;
  readonly decimals: string;
  readonly chartType: ChartType;
  readonly subgroupSize: string;
  readonly intervalMinutes: string;
  readonly lsl: string;
  readonly usl: string;
  readonly target: string;
  readonly rules: readonly RuleId[];
  readonly reactionPlan: readonly string[];
  /** Empty: the site's cause list is offered. */
  readonly causeCategories: readonly string[];
  readonly safetyCritical: boolean;
  readonly baselineSize: string;
  readonly ewmaLambda: string;
  readonly ewmaL: string;
  readonly cusumK: string;
  readonly cusumH: string;
}

export type CharacteristicField = Exclude<keyof CharacteristicForm, 'id'>;

/** Rule sets an engineer picks with one press; any subset can be chosen after. */
export const RULE_PRESETS: readonly { readonly name: string; readonly rules: readonly RuleId[] }[] = [
  { name: 'Western Electric 1–4', rules: ['we1', 'we2', 'we3', 'we4'] },
  { name: 'Beyond the limits only', rules: ['we1'] },
  { name: 'Nelson 1–8', rules: ['n1', 'n2', 'n3', 'n4', 'n5', 'n6', 'n7', 'n8'] },
  // Nelson (1984) suggests tests 1–4 as the set for everyday use; 5–6 add sensitivity (from memory).
  { name: 'Nelson 1–4', rules: ['n1', 'n2', 'n3', 'n4'] },
];

/** Charts that ignore run rules: they carry their own decision rule. */
export const hasRunRules = (t: ChartType): boolean => t !== 'ewma' && t !== 'cusum';

/** The subgroup size a chart type starts with (common practice: 5 for X̄-R, 10 for X̄-S, 1 for individuals). */
export function defaultSubgroupSize(t: ChartType): number {
  switch (t) {
    case 'xbar-r': return 5;
    case 'xbar-s': return 10;
    case 'p':
    case 'np': return 50;
    default: return 1;
  }
}

/** A blank form for a new characteristic at a station. */
export function newCharacteristicForm(id: string, stationId: string): CharacteristicForm {
  return {
    id, stationId, name: '', unit: '', decimals: '2', chartType: 'xmr', subgroupSize: '1', intervalMinutes: '60',
    lsl: '', usl: '', target: '', rules: ['we1', 'we2', 'we3', 'we4'], reactionPlan: [''], causeCategories: [],
    safetyCritical: false,
    // 25 subgroups: the usual baseline for trial limits (common practice: 20–25).
    baselineSize: '25',
    // EWMA λ 0.2, L 2.962: in-control ARL about 500 (Lucas & Saccucci 1990, Technometrics 32(1)).
    ewmaLambda: String(DEFAULT_EWMA.lambda), ewmaL: String(DEFAULT_EWMA.L),
    // Tabular CUSUM k 0.5, h 5: the usual design for a 1-sigma shift (Montgomery, Introduction to SQC, CUSUM chapter).
    cusumK: String(DEFAULT_CUSUM.k), cusumH: String(DEFAULT_CUSUM.h),
  };
}

const text = (n: number | undefined): string => (n === undefined ? '' : String(n));

/** The form for editing an existing characteristic. */
export function formFromCharacteristic(ch: Characteristic): CharacteristicForm {
  return {
    id: ch.id, stationId: ch.stationId, name: ch.name, unit: ch.unit, decimals: String(ch.decimals), chartType: ch.chartType,
    subgroupSize: String(ch.subgroupSize), intervalMinutes: String(ch.intervalMinutes),
    lsl: text(ch.spec.lsl), usl: text(ch.spec.usl), target: text(ch.spec.target),
    rules: [...ch.rules], reactionPlan: [...ch.reactionPlan], causeCategories: [...ch.causeCategories],
    safetyCritical: ch.safetyCritical, baselineSize: String(ch.baselineSize),
    ewmaLambda: text(ch.ewma?.lambda ?? DEFAULT_EWMA.lambda), ewmaL: text(ch.ewma?.L ?? DEFAULT_EWMA.L),
    cusumK: text(ch.cusum?.k ?? DEFAULT_CUSUM.k), cusumH: text(ch.cusum?.h ?? DEFAULT_CUSUM.h),
  };
}

/** Switching chart type: the subgroup size follows when it no longer fits the new chart. */
export function withChartType(form: CharacteristicForm, chartType: ChartType): CharacteristicForm {
  const n = Number(form.subgroupSize);
  const fits = chartType === 'xmr' || chartType === 'c' ? n === 1 : chartType === 'xbar-r' || chartType === 'xbar-s' ? n >= 2 && n <= 25 : n >= 1;
  const wasAttribute = !isVariableChart(form.chartType);
  const switchesFamily = wasAttribute === isVariableChart(chartType);
  return { ...form, chartType, subgroupSize: fits && !switchesFamily ? form.subgroupSize : String(defaultSubgroupSize(chartType)) };
}

export type FormResult<T, F extends string> = { readonly ok: true; readonly value: T } | { readonly ok: false; readonly errors: FieldErrors<F> };

/** Checks the form with the Characteristic schema plus the rules between fields; the first problem per field. */
export function characteristicFromForm(form: CharacteristicForm): FormResult<Characteristic, CharacteristicField> {
  const errors: Partial<Record<CharacteristicField, string>> = {};
  const num = (field: CharacteristicField, raw: string, required: boolean): number | undefined => {
    const r = readNumber(raw, required);
    if (!r.ok) errors[field] = r.message;
    return r.ok ? r.value : undefined;
  };
  const decimals = num('decimals', form.decimals, true);
  const subgroupSize = num('subgroupSize', form.subgroupSize, true);
  const intervalMinutes = num('intervalMinutes', form.intervalMinutes, true);
  const lsl = num('lsl', form.lsl, false);
  const usl = num('usl', form.usl, false);
  const target = num('target', form.target, false);
  const baselineSize = num('baselineSize', form.baselineSize, true);
  const t = form.chartType;
  const ewma = t === 'ewma' ? { lambda: num('ewmaLambda', form.ewmaLambda, true), L: num('ewmaL', form.ewmaL, true) } : undefined;
  const cusum = t === 'cusum' ? { k: num('cusumK', form.cusumK, true), h: num('cusumH', form.cusumH, true) } : undefined;

  const candidate = {
    id: form.id, stationId: form.stationId, name: form.name, unit: form.unit, decimals, chartType: t, subgroupSize, intervalMinutes,
    spec: { ...(lsl !== undefined ? { lsl } : {}), ...(usl !== undefined ? { usl } : {}), ...(target !== undefined ? { target } : {}) },
    rules: hasRunRules(t) ? [...form.rules] : [],
    reactionPlan: form.reactionPlan.map((s) => s.trim()).filter((s) => s !== ''),
    causeCategories: form.causeCategories.map((s) => s.trim()).filter((s) => s !== ''),
    safetyCritical: form.safetyCritical, baselineSize,
    ...(ewma ? { ewma } : {}),
    ...(cusum ? { cusum } : {}),
  };
  const parsed = Characteristic.safeParse(candidate);
  if (!parsed.success) Object.assign(errors, { ...fieldErrorsFrom<CharacteristicField>(parsed.error.issues, fieldOfPath), ...errors });

  // Rules between fields, which the schema of one field cannot see.
  if (subgroupSize !== undefined && !errors.subgroupSize) {
    if ((t === 'xmr' || t === 'c') && subgroupSize !== 1) errors.subgroupSize = t === 'xmr' ? 'Individuals charts take one value per subgroup: use 1.' : 'A c chart counts defects on one item: use 1.';
    if ((t === 'xbar-r' || t === 'xbar-s') && (subgroupSize < 2 || subgroupSize > 25)) errors.subgroupSize = 'X̄ charts need 2 to 25 values per subgroup.';
    if ((t === 'ewma' || t === 'cusum') && subgroupSize > 25) errors.subgroupSize = 'At most 25 values per subgroup.';
  }
  if (lsl !== undefined && usl !== undefined && !errors.lsl && !errors.usl && !(lsl < usl)) errors.usl = 'The upper limit must be above the lower limit.';
  if (target !== undefined && !errors.target) {
    if ((lsl !== undefined && target < lsl) || (usl !== undefined && target > usl)) errors.target = 'The target must lie within the specification limits.';
  }
  if (decimals !== undefined && !errors.decimals) {
    for (const [field, v] of [['lsl', lsl], ['usl', usl], ['target', target]] as const) {
      if (v !== undefined && !errors[field] && decimalsOf(v) > decimals) errors[field] = `More decimals than the gauge reads (${decimals}).`;
    }
  }
  if (hasRunRules(t) && form.rules.length === 0) errors.rules = 'Choose at least one rule, or the chart can never signal.';
  if (candidate.reactionPlan.length === 0 && !errors.reactionPlan) errors.reactionPlan = 'Give at least one step: operators choose the action taken from this list.';
  if (new Set(candidate.causeCategories.map((c) => c.toLowerCase())).size !== candidate.causeCategories.length) errors.causeCategories = 'Each cause category once.';
  if (!form.stationId) errors.stationId = 'Choose the station where this is measured.';

  if (Object.keys(errors).length || !parsed.success) return { ok: false, errors };
  return { ok: true, value: parsed.data };
}

function decimalsOf(v: number): number {
  const s = String(v);
  if (s.includes('e')) return 0;
  return s.split('.')[1]?.length ?? 0;
}

/** Where a schema issue belongs on the form. */
function fieldOfPath(path: readonly PropertyKey[]): CharacteristicField | undefined {
  const [head, sub] = path;
  if (head === 'spec') return sub === 'lsl' || sub === 'usl' || sub === 'target' ? sub : 'lsl';
  if (head === 'ewma') return sub === 'L' ? 'ewmaL' : 'ewmaLambda';
  if (head === 'cusum') return sub === 'h' ? 'cusumH' : 'cusumK';
  if (head === 'id') return 'name';
  const known: readonly string[] = ['stationId', 'name', 'unit', 'decimals', 'chartType', 'subgroupSize', 'intervalMinutes', 'rules', 'reactionPlan', 'causeCategories', 'safetyCritical', 'baselineSize'];
  return typeof head === 'string' && known.includes(head) ? (head as CharacteristicField) : undefined;
}

/**
 * What an engineer should know before saving a change to a characteristic with history: limits
 * computed for one chart type or subgroup size do not fit another, so a new phase should start.
 */
export function changeNeedsNewPhase(before: Characteristic | undefined, after: Pick<CharacteristicForm, 'chartType' | 'subgroupSize'>, pointCount: number): string | undefined {
  if (!before || pointCount === 0) return undefined;
  const changed: string[] = [];
  if (before.chartType !== after.chartType) changed.push('chart type');
  if (String(before.subgroupSize) !== after.subgroupSize.trim()) changed.push('subgroup size');
  if (!changed.length) return undefined;
  return `You are changing the ${changed.join(' and ')} of a characteristic with ${pointCount} point${pointCount === 1 ? '' : 's'} on its chart. ` +
    'Limits from the old set-up do not fit the new one: after saving, start a new phase (with the reason for the change) so the new limits are computed from new data.';
}

/**
 * A readable id for a new line, station or characteristic from its name ("Seat bore Ø" → "seat-bore"),
 * with -2, -3… when the set-up already has it. Ids never change afterwards, even when the name does.
 */
export function entityIdFor(name: string, taken: ReadonlySet<string>, prefix = ''): string {
  const slug = name.normalize('NFKD').replace(/[\u0300-\u036f]/g, '').toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 40);
  const base = prefix ? `${prefix}-${slug || 'new'}` : slug || 'characteristic';
  let id = base;
  for (let i = 2; taken.has(id); i++) id = `${base}-${i}`;
  return id;
}

/**
 * A chart-type change the recorded history cannot follow: one characteristic has one kind of data
 * (measurements or counts), and an individuals chart cannot plot subgroups of several values. Such a
 * change would leave the whole chart undrawable, so the editor refuses it and says what to do instead.
 */
export function historyConflict(before: Characteristic | undefined, chartType: ChartType, samples: readonly { readonly values?: readonly number[] }[]): string | undefined {
  if (!before || samples.length === 0 || before.chartType === chartType) return undefined;
  if (isVariableChart(before.chartType) !== isVariableChart(chartType)) {
    return isVariableChart(before.chartType)
      ? 'The samples on this chart are measurements; a count chart cannot plot them. Set up a new characteristic for the counts and keep this one for its history.'
      : 'The samples on this chart are counts; a measurement chart cannot plot them. Set up a new characteristic for the measurements and keep this one for its history.';
  }
  if (chartType === 'xmr' && samples.some((s) => (s.values?.length ?? 0) > 1)) {
    return 'The samples on this chart hold several values each; an individuals chart takes one value per sample. Keep an X̄ chart (or EWMA / CUSUM), or set up a new characteristic.';
  }
  return undefined;
}

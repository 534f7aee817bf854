import { describeIssues, isVariableChart, Sample, type Characteristic } from '../schema';
import { entryProblem } from './entry-check';
import type { MappedRow } from './import-mapping';
import { valuesPerSubgroup } from './import-mapping';
import { combineTime, parseImportTime, tabletLocalTime, type DateOrder, type LocalTime } from './import-time';
import { looksLikeTypo } from './number-entry';
import { uuidFromName } from './sha256';

/**
 * ready: will be imported. check: readable, but the typo guard or the gauge resolution flags it: imported
 * only if the engineer says so. problem: cannot be imported as it stands. already: the chart holds it.
 */
export type RowStatus = 'ready' | 'check' | 'problem' | 'already';

export interface CheckedRow {
  readonly line: number;
  readonly status: RowStatus;
  /** What is wrong or doubtful, in sentences for the engineer (empty for a ready row). */
  readonly problems: readonly string[];
  /** The sample as it will be recorded (ready, check and already rows). */
  readonly sample?: Sample;
}

export interface ImportContext {
  readonly characteristic: Characteristic;
  /** The samples the chart holds now (corrections applied): duplicates are found against them. */
  readonly existing: readonly Sample[];
  /** Centre and within-subgroup sigma of the current phase, for the typo guard (none on an empty chart). */
  readonly guard?: { readonly centre: number; readonly sigma: number };
  readonly decimal: ',' | '.';
  readonly dateOrder: DateOrder;
  readonly now: number;
  /** Who imports, on which tablet: the samples are recorded in their name. */
  readonly recordedBy: string;
  readonly deviceId: string;
  /** The file's name, kept with each sample as where it came from. */
  readonly fileName: string;
  readonly localTime?: LocalTime;
}

/** A timestamp may run ahead of the tablet clock by this much before it counts as "in the future". */
export const FUTURE_TOLERANCE_MS = 5 * 60_000;
/** Earlier timestamps are taken for a slip in the year (2062 typed as 1062): our choice, far before any tablet record. */
export const EARLIEST_MS = Date.UTC(1990, 0, 1);

type Parsed = { ok: true; value: number } | { ok: false; message: string };

const NUMBER = { '.': /^[-+]?(\d+(\.\d*)?|\.\d+)$/, ',': /^[-+]?(\d+(,\d*)?|,\d+)$/ } as const;
const OTHER_MARK = { '.': /^[-+]?\d+,\d+$/, ',': /^[-+]?\d+\.\d+$/ } as const;

/** A number as the chosen decimal mark writes it; the other mark is a problem that names the choice. */
export function readImportNumber(text: string, decimal: ',' | '.'): Parsed {
  const t = text.trim().replace('−', '-');
  const other = decimal === ',' ? '.' : ',';
  if (OTHER_MARK[decimal].test(t)) {
    return { ok: false, message: `“${text}” is written with a decimal ${other === ',' ? 'comma' : 'point'}, but the file is read with a decimal ${decimal === ',' ? 'comma' : 'point'}: change the decimal mark above if the whole file uses it.` };
  }
  if (!NUMBER[decimal].test(t)) return { ok: false, message: `“${text}” is not a number.` };
  const value = Number(t.replace(decimal, '.'));
  return Number.isFinite(value) ? { ok: true, value } : { ok: false, message: `“${text}” is not a number.` };
}

function decimalsOf(text: string, decimal: ',' | '.'): number {
  const i = text.indexOf(decimal);
  return i < 0 ? 0 : text.length - i - 1;
}

/** The content that names an imported sample: the same row content always gives the same id. */
function identity(characteristicId: string, s: Pick<Sample, 'takenAt' | 'values' | 'count' | 'inspected' | 'lot' | 'comment' | 'excluded' | 'reason'>): string {
  return JSON.stringify(['plumbline-import-1', characteristicId, s.takenAt, s.values ?? null, s.count ?? null, s.inspected ?? null,
    s.lot ?? null, s.comment ?? null, s.excluded === true, s.excluded ? s.reason ?? null : null]);
}

/** Time and what was measured: two samples with the same are the same sample recorded twice. */
function sameReading(s: Pick<Sample, 'takenAt' | 'values' | 'count' | 'inspected'>): string {
  return JSON.stringify([Date.parse(s.takenAt), s.values ?? null, s.count ?? null, s.inspected ?? null]);
}

const TRUE = /^(true|yes|y|1|x)$/i;
const FALSE = /^(false|no|n|0)?$/i;

/**
 * Reads and checks every mapped row against the characteristic, the chart's current samples and the
 * tablet clock, and builds the sample each readable row becomes. Every row comes back, with its line
 * number and status: nothing is dropped. Pure.
 */
export function checkImportRows(rows: readonly MappedRow[], ctx: ImportContext): CheckedRow[] {
  return rows.map(createRowChecker(ctx));
}

/**
 * The checker behind checkImportRows, one row at a time in file order (it remembers the rows before, to
 * find repeats), so that a screen can check a big file in slices between paints.
 */
export function createRowChecker(ctx: ImportContext): (row: MappedRow) => CheckedRow {
  const ch = ctx.characteristic;
  // The ids on the chart and those they replaced: an export read back after a correction is still known.
  const existingIds = new Set(ctx.existing.flatMap((s) => (s.supersedes ? [s.id, s.supersedes] : [s.id])));
  const existingReadings = new Map(ctx.existing.map((s) => [sameReading(s), s] as const));
  const seenInFile = new Map<string, number>();
  const variable = isVariableChart(ch.chartType);
  const perSubgroup = valuesPerSubgroup(ch);
  const localTime = ctx.localTime;
  const timeOptions = { dateOrder: ctx.dateOrder, ...(localTime ? { localTime } : {}) };

  return (row: MappedRow): CheckedRow => {
    const problems: string[] = [];
    const doubts: string[] = [];
    if (row.cellCount > row.width && row.width > 0) {
      problems.push(`The row has ${row.cellCount} fields but the file has ${row.width} columns${ctx.decimal === ',' ? ' (a decimal comma in a comma-separated file must be inside quotes)' : ''}.`);
    }

    // When it was taken.
    let takenMs: number | undefined;
    if (row.takenAt !== undefined || (row.date === undefined && row.timeOfDay === undefined)) {
      const t = parseImportTime(row.takenAt ?? '', timeOptions);
      if (t.kind === 'instant') takenMs = t.ms;
      else if (t.kind === 'bad') problems.push(t.message);
      else problems.push(`“${row.takenAt}” has a ${t.kind === 'date' ? 'date but no time of day' : 'time of day but no date'}.`);
    } else {
      const d = parseImportTime(row.date ?? '', timeOptions);
      const c = parseImportTime(row.timeOfDay ?? '', timeOptions);
      if (d.kind !== 'date') problems.push(row.date === undefined ? 'The date is missing.' : `“${row.date}” is not a date.`);
      if (c.kind !== 'clock') problems.push(row.timeOfDay === undefined ? 'The time of day is missing.' : `“${row.timeOfDay}” is not a time of day.`);
      if (d.kind === 'date' && c.kind === 'clock') takenMs = combineTime(d, c, undefined, localTime ?? tabletLocalTime);
    }
    if (takenMs !== undefined && takenMs > ctx.now + FUTURE_TOLERANCE_MS) {
      problems.push(`${new Date(takenMs).toISOString().slice(0, 16).replace('T', ' ')} UTC lies in the future.`);
    } else if (takenMs !== undefined && takenMs < EARLIEST_MS) {
      problems.push(`${new Date(takenMs).toISOString().slice(0, 10)} is before ${new Date(EARLIEST_MS).getUTCFullYear()}: check the year.`);
    }

    // What was measured or counted.
    let values: number[] | undefined;
    let count: number | undefined;
    let inspected: number | undefined;
    if (variable) {
      values = [];
      for (const text of row.values) {
        const n = readImportNumber(text, ctx.decimal);
        if (!n.ok) problems.push(n.message);
        else {
          values.push(n.value);
          if (decimalsOf(text.trim(), ctx.decimal) > ch.decimals) doubts.push(`“${text}” has more decimals than the gauge reads (${ch.decimals}).`);
        }
      }
      if (row.values.length !== perSubgroup) {
        problems.push(row.values.length === 0
          ? 'The measured value is missing.'
          : `${row.values.length} value${row.values.length === 1 ? '' : 's'}, but a subgroup of ${ch.name} has ${perSubgroup}.`);
      }
      if (ctx.guard && values.length) {
        const { centre, sigma } = ctx.guard;
        const odd = values.filter((v) => looksLikeTypo(v, centre, sigma));
        if (odd.length) doubts.push(`${odd.join(', ')} ${ch.unit} is far from the usual values (around ${centre.toFixed(ch.decimals)}): check the reading.`);
      }
    } else {
      if (row.count === undefined) problems.push('The count is missing.');
      else {
        const n = readImportNumber(row.count, ctx.decimal);
        if (!n.ok) problems.push(n.message);
        else if (!Number.isInteger(n.value) || n.value < 0) problems.push(`The count “${row.count}” is not a whole number of 0 or more.`);
        else count = n.value;
      }
      if (ch.chartType !== 'c') {
        if (row.inspected === undefined) problems.push('The quantity inspected is missing.');
        else {
          const n = readImportNumber(row.inspected, ctx.decimal);
          if (!n.ok) problems.push(n.message);
          else if (!(n.value > 0)) problems.push(`The quantity inspected “${row.inspected}” must be more than 0.`);
          else if (ch.chartType !== 'u' && !Number.isInteger(n.value)) problems.push(`The quantity inspected “${row.inspected}” is not a whole number.`);
          else inspected = n.value;
        }
      }
      if (count !== undefined && (inspected !== undefined || ch.chartType === 'c')) {
        const p = entryProblem(ch, { count, ...(inspected !== undefined ? { inspected } : {}) });
        if (p) problems.push(p);
      }
    }

    const excluded = row.excluded === undefined ? false : TRUE.test(row.excluded) ? true : FALSE.test(row.excluded) ? false : undefined;
    if (excluded === undefined) problems.push(`“${row.excluded}” in the left-out column is neither true nor false.`);
    if (excluded && !row.reason) problems.push('The point is left out of the limits but no reason is given.');
    if (row.lot !== undefined && row.lot.length > 60) problems.push(`The lot has ${row.lot.length} characters; at most 60 are kept.`);
    if (row.comment !== undefined && row.comment.length > 400) problems.push(`The comment has ${row.comment.length} characters; at most 400 are kept.`);

    if (problems.length || takenMs === undefined) return { line: row.line, status: 'problem', problems };

    const content = {
      takenAt: new Date(takenMs).toISOString(),
      ...(values ? { values } : {}),
      ...(count !== undefined ? { count } : {}),
      ...(inspected !== undefined ? { inspected } : {}),
      ...(row.lot ? { lot: row.lot } : {}),
      ...(row.comment ? { comment: row.comment } : {}),
      ...(excluded ? { excluded: true, reason: row.reason } : {}),
    };
    const candidate = {
      kind: 'sample' as const, id: uuidFromName(identity(ch.id, content)), characteristicId: ch.id,
      recordedBy: ctx.recordedBy, deviceId: ctx.deviceId, ...content,
      imported: { file: ctx.fileName.slice(0, 200) || 'pasted text', line: row.line },
    };
    const parsed = Sample.safeParse(candidate);
    if (!parsed.success) return { line: row.line, status: 'problem', problems: [describeIssues(parsed.error)] };
    const sample = parsed.data;

    const reading = sameReading(sample);
    const twin = existingReadings.get(reading);
    if (existingIds.has(sample.id) || (row.sampleId !== undefined && existingIds.has(row.sampleId))) {
      return { line: row.line, status: 'already', problems: ['Already on the chart (imported before).'], sample };
    }
    if (twin) {
      return { line: row.line, status: 'already', problems: [`The chart already holds a sample with this time and ${variable ? 'these values' : 'this count'}.`], sample };
    }
    const earlier = seenInFile.get(reading);
    if (earlier !== undefined) return { line: row.line, status: 'problem', problems: [`Repeats line ${earlier} (same time and ${variable ? 'values' : 'count'}).`] };
    seenInFile.set(reading, row.line);
    return doubts.length ? { line: row.line, status: 'check', problems: doubts, sample } : { line: row.line, status: 'ready', problems: [], sample };
  };
}

export interface ImportSummary {
  readonly ready: number;
  readonly check: number;
  readonly problem: number;
  readonly already: number;
}

export function summarizeImport(rows: readonly CheckedRow[]): ImportSummary {
  const s = { ready: 0, check: 0, problem: 0, already: 0 };
  for (const r of rows) s[r.status] += 1;
  return s;
}

/** The samples to record: the ready rows, and the flagged ones when the engineer accepts them. */
export function samplesToImport(rows: readonly CheckedRow[], includeFlagged: boolean): Sample[] {
  return rows.filter((r) => r.status === 'ready' || (includeFlagged && r.status === 'check')).map((r) => r.sample!);
}

/**
 * The decimal mark the file's numbers most likely use: comma when some number has a comma and none has
 * a point, else point. The engineer can change it.
 */
export function guessDecimal(rows: readonly MappedRow[]): ',' | '.' {
  let comma = 0;
  let point = 0;
  for (const r of rows.slice(0, 500)) {
    for (const t of [...r.values, r.count, r.inspected]) {
      if (t === undefined) continue;
      if (/^[-+]?\d+,\d+$/.test(t)) comma++;
      else if (/^[-+]?\d+\.\d+$/.test(t)) point++;
    }
  }
  return comma > 0 && point === 0 ? ',' : '.';
}

/** The typo guard of the chart as it stands: centre and within-subgroup sigma of its current phase. */
export function typoGuardOf(phases: readonly { readonly centre: number | null; readonly sigmaWithin: number | null }[]): { centre: number; sigma: number } | undefined {
  const phase = phases[phases.length - 1];
  return phase && phase.centre !== null && phase.sigmaWithin !== null && phase.sigmaWithin > 0 ? { centre: phase.centre, sigma: phase.sigmaWithin } : undefined;
}

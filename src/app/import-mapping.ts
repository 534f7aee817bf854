import { isVariableChart, type Characteristic } from '../schema';
import type { CsvRow, CsvTable } from './import-table';
import { parseImportTime } from './import-time';

/** What a column of the file holds. Columns marked 'ignore' are not read. */
export type ColumnRole =
  | 'takenAt' // date and time in one cell
  | 'date' // the date alone, with a 'timeOfDay' column beside it
  | 'timeOfDay'
  | 'value' // one measured value of the subgroup; value columns are read left to right
  | 'count'
  | 'inspected'
  | 'lot'
  | 'comment'
  | 'excluded'
  | 'reason'
  | 'sampleId'
  | 'ignore';

export const COLUMN_ROLE_LABELS: Readonly<Record<ColumnRole, string>> = {
  takenAt: 'Date and time',
  date: 'Date',
  timeOfDay: 'Time of day',
  value: 'Measured value',
  count: 'Count',
  inspected: 'Quantity inspected',
  lot: 'Lot or batch',
  comment: 'Comment',
  excluded: 'Left out of limits (true/false)',
  reason: 'Reason for leaving out',
  sampleId: 'Sample id (Plumbline export)',
  ignore: 'Not imported',
};

/** 'export': the file is our own history export; 'plain': a layout typed by hand or from another system. */
export type FileLayout = 'export' | 'plain';

export interface ColumnMapping {
  /** The first row names the columns (it is not data). */
  readonly hasHeader: boolean;
  /** One role per column of the file. */
  readonly roles: readonly ColumnRole[];
}

/** The first columns of our own export (src/app/export-csv.ts), which mark a file as one. */
const EXPORT_HEAD = ['point', 'sample_id', 'taken_at', 'characteristic', 'unit'];

const EXPORT_ROLES: Readonly<Record<string, ColumnRole>> = {
  sample_id: 'sampleId', taken_at: 'takenAt', count: 'count', inspected: 'inspected', lot: 'lot', comment: 'comment',
  excluded: 'excluded', correction_or_exclusion_reason: 'reason',
  // Where a sample once came from is not read back: the import records the file being imported now.
  // Re-imported samples keep their ids all the same (import-check.ts), so nothing is recorded twice.
  imported_from: 'ignore',
};

/** Header words of a hand-typed layout, compared without case, spaces, dashes or underscores. */
const NAME_ROLES: readonly (readonly [RegExp, ColumnRole])[] = [
  [/^(takenat|timestamp|datetime|dateandtime|datetimetaken|sampledat|taken)$/, 'takenAt'],
  [/^(date|day|sampledate)$/, 'date'],
  [/^(time|timeofday|hour|clock)$/, 'timeOfDay'],
  [/^(value|val|x|reading|measurement|measured|result|v|m)\d*$/, 'value'],
  [/^(count|defects|defectives|nonconforming|nonconformities|rejects|reject|nc|found)$/, 'count'],
  [/^(inspected|n|samplesize|size|quantity|qty|qtyinspected|units|unitsinspected|itemsinspected)$/, 'inspected'],
  [/^(lot|batch|lotno|lotnumber|batchno|batchnumber)$/, 'lot'],
  [/^(comment|comments|note|notes|remark|remarks)$/, 'comment'],
  [/^excluded$/, 'excluded'],
  [/^(reason|exclusionreason)$/, 'reason'],
];

const squash = (s: string) => s.trim().toLowerCase().replace(/[\s_\-./()#]+/g, '');

/** Whether the header row is that of our own export. */
export function isExportHeader(cells: readonly string[]): boolean {
  return EXPORT_HEAD.every((name, i) => cells[i]?.trim() === name);
}

function exportMapping(header: readonly string[]): ColumnMapping {
  return {
    hasHeader: true,
    roles: header.map((h) => {
      const name = h.trim();
      if (/^value_\d+$/.test(name)) return 'value';
      return EXPORT_ROLES[name] ?? 'ignore';
    }),
  };
}

function roleByName(name: string): ColumnRole | undefined {
  const s = squash(name);
  return NAME_ROLES.find(([re]) => re.test(s))?.[1];
}

/** The values a chart needs per row, as columns in order, for a file with no header row. */
function positionalRoles(width: number, ch: Characteristic): ColumnRole[] {
  const needed: ColumnRole[] = isVariableChart(ch.chartType)
    ? Array.from({ length: valuesPerSubgroup(ch) }, () => 'value' as const)
    : ch.chartType === 'c' ? ['count'] : ['count', 'inspected'];
  const order: ColumnRole[] = ['takenAt', ...needed, 'lot', 'comment'];
  return Array.from({ length: width }, (_, i) => order[i] ?? 'ignore');
}

/** How many values one subgroup of this characteristic holds (1 for individuals). */
export function valuesPerSubgroup(ch: Characteristic): number {
  return ch.chartType === 'xmr' ? 1 : ch.subgroupSize;
}

/**
 * The layout of the file and a first mapping of its columns: exact for our own export; guessed from the
 * header words (or, with no header, from the column order: time, values or count and inspected, lot,
 * comment) for a plain layout, for the engineer to confirm.
 */
export function guessMapping(table: CsvTable, ch: Characteristic): { layout: FileLayout; mapping: ColumnMapping } {
  const first = table.rows[0];
  if (!first) return { layout: 'plain', mapping: { hasHeader: false, roles: [] } };
  if (isExportHeader(first.cells)) return { layout: 'export', mapping: exportMapping(first.cells) };
  const firstIsData = first.cells.some((c) => parseImportTime(c, { dateOrder: 'dmy' }).kind === 'instant');
  if (firstIsData) return { layout: 'plain', mapping: { hasHeader: false, roles: positionalRoles(usualWidth(table.rows), ch) } };
  const width = first.cells.length;
  const sample = table.rows[1];
  const roles = Array.from({ length: width }, (_, i): ColumnRole => {
    const byName = roleByName(first.cells[i] ?? '') ?? 'ignore';
    if (byName !== 'takenAt' && byName !== 'date' && byName !== 'timeOfDay') return byName;
    // A column called "time" or "date" may hold the whole timestamp: look at the first data cell.
    const kind = sample ? parseImportTime(sample.cells[i] ?? '', { dateOrder: 'dmy' }).kind : undefined;
    return kind === 'instant' ? 'takenAt' : kind === 'date' ? 'date' : kind === 'clock' ? 'timeOfDay' : byName;
  });
  return { layout: 'plain', mapping: { hasHeader: true, roles: fillNumbers(fitToChart(roles, ch), sample?.cells ?? [], ch) } };
}

/**
 * Columns whose header says nothing we know ("Torque", "Ø bore") but whose first value is a number are
 * taken, left to right, for what the chart still lacks: the measured values, or the count and quantity;
 * likewise a column holding a date and time when none is named for it.
 */
function fillNumbers(guessed: ColumnRole[], firstData: readonly string[], ch: Characteristic): ColumnRole[] {
  // With no column named for the time, the first unknown one that holds a date and time is it.
  const timeAt = guessed.some((r) => r === 'takenAt' || r === 'date') ? -1
    : guessed.findIndex((r, i) => r === 'ignore' && parseImportTime(firstData[i] ?? '', { dateOrder: 'dmy' }).kind === 'instant');
  const roles = guessed.map((r, i) => (i === timeAt ? 'takenAt' : r));
  const wanted: ColumnRole[] = isVariableChart(ch.chartType)
    ? Array.from({ length: Math.max(0, valuesPerSubgroup(ch) - roles.filter((r) => r === 'value').length) }, () => 'value' as const)
    : (['count', 'inspected'] as const).filter((r) => !roles.includes(r) && !(r === 'inspected' && ch.chartType === 'c'));
  return roles.map((r, i) => (r === 'ignore' && wanted.length && /^[-+]?\d+([.,]\d+)?$/.test(firstData[i]?.trim() ?? '') ? wanted.shift()! : r));
}

/** Count columns mean nothing to a measured chart, value columns nothing to a counted one. */
function fitToChart(roles: ColumnRole[], ch: Characteristic): ColumnRole[] {
  const variable = isVariableChart(ch.chartType);
  return roles.map((r) => (variable && (r === 'count' || r === 'inspected')) || (!variable && r === 'value') ? 'ignore' : r);
}

/** Why the mapping cannot be used for this characteristic (empty when it can). */
export function mappingProblems(mapping: ColumnMapping, ch: Characteristic): string[] {
  const has = (r: ColumnRole) => mapping.roles.includes(r);
  const count = (r: ColumnRole) => mapping.roles.filter((x) => x === r).length;
  const problems: string[] = [];
  if (!has('takenAt') && !(has('date') && has('timeOfDay'))) problems.push('Choose the column with the date and time (or a date column and a time-of-day column).');
  if (has('takenAt') && (has('date') || has('timeOfDay'))) problems.push('Use either one date-and-time column or a date and a time-of-day column, not both.');
  for (const r of ['takenAt', 'date', 'timeOfDay', 'count', 'inspected', 'lot', 'comment', 'excluded', 'reason', 'sampleId'] as const) {
    if (count(r) > 1) problems.push(`Only one column can be “${COLUMN_ROLE_LABELS[r]}”.`);
  }
  if (isVariableChart(ch.chartType)) {
    if (!has('value')) problems.push(`Choose the column${valuesPerSubgroup(ch) > 1 ? 's' : ''} with the measured value${valuesPerSubgroup(ch) > 1 ? 's' : ''}.`);
  } else {
    if (!has('count')) problems.push('Choose the column with the count.');
    if (ch.chartType !== 'c' && !has('inspected')) problems.push('Choose the column with the quantity inspected.');
  }
  return problems;
}

/** One data row with its cells sorted by role (texts as in the file, not yet read). */
export interface MappedRow {
  readonly line: number;
  /** Fields in the file's row, against `width`, the number of columns mapped. */
  readonly cellCount: number;
  readonly width: number;
  readonly takenAt?: string;
  readonly date?: string;
  readonly timeOfDay?: string;
  /** Non-empty value cells, left to right. */
  readonly values: readonly string[];
  readonly count?: string;
  readonly inspected?: string;
  readonly lot?: string;
  readonly comment?: string;
  readonly excluded?: string;
  readonly reason?: string;
  readonly sampleId?: string;
}

/** The field count most rows have. */
function usualWidth(rows: readonly CsvRow[]): number {
  const tally = new Map<number, number>();
  for (const r of rows.slice(0, 200)) tally.set(r.cells.length, (tally.get(r.cells.length) ?? 0) + 1);
  return [...tally].sort((a, b) => b[1] - a[1] || a[0] - b[0])[0]?.[0] ?? 0;
}

/** Applies the mapping: the data rows (the header row left out) with their cells by role. Pure. */
export function mapRows(table: CsvTable, mapping: ColumnMapping): MappedRow[] {
  const data: readonly CsvRow[] = mapping.hasHeader ? table.rows.slice(1) : table.rows;
  const width = mapping.hasHeader ? table.rows[0]?.cells.length ?? 0 : usualWidth(data);
  return data.map((row) => {
    const out: { -readonly [K in keyof MappedRow]: MappedRow[K] } = { line: row.line, cellCount: row.cells.length, width, values: [] };
    const values: string[] = [];
    mapping.roles.forEach((role, i) => {
      const cell = (row.cells[i] ?? '').trim();
      if (role === 'ignore') return;
      if (role === 'value') {
        if (cell !== '') values.push(cell);
        return;
      }
      if (cell !== '') out[role] = cell;
    });
    out.values = values;
    return out;
  });
}

/**
 * Remarks on an export from another characteristic: where it came from, and a unit that differs from
 * this characteristic's (a mm file into a µm chart would be nonsense). Empty for a plain layout.
 */
export function exportNotes(table: CsvTable, ch: Characteristic): { notes: string[]; cautions: string[] } {
  const header = table.rows[0]?.cells.map((c) => c.trim()) ?? [];
  if (!isExportHeader(header)) return { notes: [], cautions: [] };
  const distinct = (name: string) => {
    const i = header.indexOf(name);
    return [...new Set(table.rows.slice(1).map((r) => r.cells[i]?.trim() ?? '').filter((v) => v !== ''))];
  };
  const from = distinct('characteristic').filter((id) => id !== ch.id);
  const units = distinct('unit').filter((u) => u !== ch.unit);
  return {
    notes: from.length ? [`This file was exported from ${from.map((f) => `“${f}”`).join(', ')}; its samples will be recorded for ${ch.name}.`] : [],
    cautions: units.length ? [`The file's unit is ${units.map((u) => `“${u}”`).join(', ')}, but ${ch.name} is measured in “${ch.unit}”. Check that this is the right characteristic.`] : [],
  };
}

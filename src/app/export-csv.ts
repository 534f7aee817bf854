import type { CharacteristicView } from './app-state';
import { importedFromText } from './imported-from';

/** One field as RFC 4180 wants it: quoted when it holds a comma, a quote or a line break; quotes doubled. */
export function csvField(value: string | number | boolean | undefined | null): string {
  if (value === undefined || value === null) return '';
  const s = String(value);
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/**
 * The characteristic's history as CSV (RFC 4180, CRLF line ends, a header row): one row per point as
 * charted (corrections applied), with the limits in force there, the rules that fired and the answer.
 * Values of a subgroup go in value_1 … value_n. The last column, imported_from, names the file and line a
 * sample imported from history came from ("sheet.csv, line 12"; empty for samples entered here). The CSV
 * import reads the file back as our own export (import-mapping.ts) and ignores that column: a sample
 * imported again is recorded as coming from the file then imported. Pure: the screen turns the text into a download.
 */
export function historyToCsv(view: CharacteristicView, personName: (id: string) => string): string {
  const ch = view.characteristic;
  const n = Math.max(1, ...view.series.samples.map((s) => s.values?.length ?? 0));
  const valueCols = Array.from({ length: n }, (_, i) => `value_${i + 1}`);
  const header = ['point', 'sample_id', 'taken_at', 'characteristic', 'unit', ...valueCols, 'count', 'inspected', 'plotted', 'centre', 'lcl', 'ucl',
    'rules_fired', 'lot', 'comment', 'recorded_by', 'excluded', 'correction_or_exclusion_reason', 'supersedes',
    'what_happened', 'cause_category', 'cause', 'action', 'answered_by', 'signed_off_by', 'imported_from'];
  const groupAt = new Map(view.groups.map((g) => [g.index, g]));
  const rows = view.series.samples.map((s, i) => {
    const p = view.analysis.points[i];
    const rules = view.analysis.signals.filter((x) => x.index === i).map((x) => x.rule).join(' ');
    const g = groupAt.get(i);
    return [
      i + 1, s.id, s.takenAt, ch.id, ch.unit,
      ...valueCols.map((_, k) => s.values?.[k]),
      s.count, s.inspected, p?.value, p?.centre, p?.lcl, p?.ucl, rules, s.lot, s.comment, personName(s.recordedBy),
      s.excluded === true, s.reason, s.supersedes,
      g?.response?.whatHappened, g?.response?.causeCategory, g?.response?.cause, g?.response?.action,
      g?.response ? personName(g.response.respondedBy) : undefined, g?.ack ? personName(g.ack.by) : undefined,
      s.imported ? importedFromText(s.imported) : undefined,
    ].map(csvField).join(',');
  });
  return [header.join(','), ...rows].join('\r\n') + '\r\n';
}

import type { CsvDelimiter } from '../../app/import-table';
import type { DateOrder } from '../../app/import-time';

export const DELIMITER_NAMES: Readonly<Record<CsvDelimiter, string>> = { ',': 'comma', ';': 'semicolon', '\t': 'tab' };

/** How the text is split and its numbers and dates are read; each choice starts from what the file suggests. */
export function ReadingOptions({ detected, delimiter, decimal, dateOrder, onDelimiter, onDecimal, onDateOrder }: {
  detected: CsvDelimiter; delimiter: CsvDelimiter | 'auto'; decimal: ',' | '.'; dateOrder: DateOrder;
  onDelimiter: (d: CsvDelimiter | 'auto') => void; onDecimal: (d: ',' | '.') => void; onDateOrder: (d: DateOrder) => void;
}) {
  return (
    <div class="import-options">
      <label class="entry-field">
        <span class="hint">Fields separated by</span>
        <select class="text-input" value={delimiter} onChange={(e) => onDelimiter((e.target as HTMLSelectElement).value as CsvDelimiter | 'auto')}>
          <option value="auto">Detect ({DELIMITER_NAMES[detected]})</option>
          <option value=",">Comma</option>
          <option value=";">Semicolon</option>
          <option value={'\t'}>Tab</option>
        </select>
      </label>
      <label class="entry-field">
        <span class="hint">Decimal mark in the numbers</span>
        <select class="text-input" value={decimal} data-testid="decimal-mark" onChange={(e) => onDecimal((e.target as HTMLSelectElement).value as ',' | '.')}>
          <option value=".">Point (10.25)</option>
          <option value=",">Comma (10,25)</option>
        </select>
      </label>
      <label class="entry-field">
        <span class="hint">Dates written with slashes</span>
        <select class="text-input" value={dateOrder} onChange={(e) => onDateOrder((e.target as HTMLSelectElement).value as DateOrder)}>
          <option value="dmy">Day first (31/12/2026)</option>
          <option value="mdy">Month first (12/31/2026)</option>
        </select>
      </label>
    </div>
  );
}

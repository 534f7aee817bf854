import { describe, expect, it } from 'vitest';
import { buildCharacteristicView } from '../../src/app/build-view';
import { csvField, historyToCsv } from '../../src/app/export-csv';
import { BASELINE, individuals, makeCharacteristic, makeResponse, T0 } from './helpers';

/** A small reader for the test: RFC 4180 records (quoted fields may hold commas, quotes and line breaks). */
function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let field = '';
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i]!;
    if (quoted) {
      if (c === '"' && text[i + 1] === '"') { field += '"'; i++; }
      else if (c === '"') quoted = false;
      else field += c;
    } else if (c === '"') quoted = true;
    else if (c === ',') { row.push(field); field = ''; }
    else if (c === '\r' && text[i + 1] === '\n') { row.push(field); rows.push(row); row = []; field = ''; i++; }
    else field += c;
  }
  return rows;
}

describe('historyToCsv()', () => {
  it('quotes fields as RFC 4180 says', () => {
    expect(csvField('plain')).toBe('plain');
    expect(csvField('a, b')).toBe('"a, b"');
    expect(csvField('he said "hold"')).toBe('"he said ""hold"""');
    expect(csvField('two\nlines')).toBe('"two\nlines"');
    expect(csvField(undefined)).toBe('');
  });

  it('writes one row per charted point with limits, rules and the answer, and reads back the same', () => {
    const samples = individuals([...BASELINE, 11]);
    samples[3] = { ...samples[3]!, comment: 'Chip on the jaw, "small", cleaned' };
    const response = makeResponse(samples[20]!.id, { whatHappened: 'Bar end, last 20 cm', causeCategory: 'Material', action: 'New bar', respondedBy: 'p-op' });
    const view = buildCharacteristicView(makeCharacteristic(), [], samples, [response], [], T0);
    const rows = parseCsv(historyToCsv(view, (id) => (id === 'p-op' ? 'Odile' : id)));
    const [header, ...data] = rows;
    expect(data).toHaveLength(21);
    const col = (name: string) => header!.indexOf(name);
    expect(data[3]![col('comment')]).toBe('Chip on the jaw, "small", cleaned');
    expect(Number(data[20]![col('value_1')])).toBe(11);
    expect(data[20]![col('rules_fired')]).toContain('we1');
    expect(data[20]![col('what_happened')]).toBe('Bar end, last 20 cm');
    expect(data[20]![col('answered_by')]).toBe('Odile');
    expect(Number(data[0]![col('ucl')])).toBeCloseTo(view.analysis.points[0]!.ucl!, 10);
  });

  it('ends with imported_from: the file and line of an imported sample, quoted as RFC 4180 says; empty for one entered here', () => {
    const samples = individuals(BASELINE.slice(0, 3));
    samples[0] = { ...samples[0]!, imported: { file: 'line 4 "old", 2025.csv', line: 12 } };
    samples[1] = { ...samples[1]!, imported: { file: 'paper.csv', line: 3 } };
    const csv = historyToCsv(buildCharacteristicView(makeCharacteristic(), [], samples, [], [], T0), (id) => id);
    const [header, ...data] = parseCsv(csv);
    expect(header![header!.length - 1]).toBe('imported_from');
    expect(data.map((r) => r[r.length - 1])).toEqual(['line 4 "old", 2025.csv, line 12', 'paper.csv, line 3', '']);
    // Every row has as many fields as the header.
    expect(data.every((r) => r.length === header!.length)).toBe(true);
    expect(csv.split('\r\n')[1]!.endsWith(',"line 4 ""old"", 2025.csv, line 12"')).toBe(true);
    expect(csv.split('\r\n')[3]!.endsWith(',')).toBe(true);
  });
});

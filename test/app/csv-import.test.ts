import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { buildCharacteristicView } from '../../src/app/build-view';
import { historyToCsv } from '../../src/app/export-csv';
import { checkImportRows, guessDecimal, readImportNumber, samplesToImport, summarizeImport, typoGuardOf, type ImportContext } from '../../src/app/import-check';
import { guessMapping, mapRows, mappingProblems, type ColumnMapping } from '../../src/app/import-mapping';
import { signalsAtImported } from '../../src/app/import-signals';
import { decodeCsvBytes, readCsvTable } from '../../src/app/import-table';
import { parseImportTime, type LocalTime } from '../../src/app/import-time';
import { sha256, toHex, uuidFromName } from '../../src/app/sha256';
import { Sample, type Characteristic } from '../../src/schema';
import { BASELINE, individuals, iso, makeCharacteristic, MINUTE, sampleAt, T0 } from './helpers';

/** Local times read as UTC, so the tests do not depend on the machine's time zone. */
const utcLocal: LocalTime = (y, mo, d, h, mi, s, ms) => Date.UTC(y, mo - 1, d, h, mi, s, ms);

function context(ch: Characteristic, overrides: Partial<ImportContext> = {}): ImportContext {
  return {
    characteristic: ch, existing: [], decimal: '.', dateOrder: 'dmy', now: T0 + 48 * 60 * MINUTE,
    recordedBy: 'p-eng', deviceId: 'tab-1', fileName: 'sheet.csv', localTime: utcLocal, ...overrides,
  };
}

/** Text → table → mapping (guessed unless given) → checked rows. */
function importText(text: string, ch: Characteristic, overrides: Partial<ImportContext> = {}, mapping?: ColumnMapping) {
  const table = readCsvTable(text);
  const guessed = guessMapping(table, ch);
  const used = mapping ?? guessed.mapping;
  const rows = mapRows(table, used);
  return { table, layout: guessed.layout, mapping: used, rows, checked: checkImportRows(rows, context(ch, overrides)) };
}

const XBAR = makeCharacteristic({ id: 'ch-fill', name: 'Fill weight', unit: 'g', decimals: 1, chartType: 'xbar-r', subgroupSize: 3 });

describe('sha256() and uuidFromName()', () => {
  it('gives the FIPS 180-4 example digests', () => {
    // source: NIST FIPS 180-4 example computations (SHA256.pdf, "abc" and the 448-bit two-block message); empty string: common practice
    expect(toHex(sha256('abc'))).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    expect(toHex(sha256('abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq'))).toBe('248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1');
    expect(toHex(sha256(''))).toBe('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855');
  });

  it('agrees with node:crypto on UTF-8 text of every block length', () => {
    for (let n = 0; n < 140; n += 7) {
      const text = 'µ-Ø'.repeat(n) + n;
      expect(toHex(sha256(text))).toBe(createHash('sha256').update(text, 'utf8').digest('hex'));
    }
  });

  it('makes a version 8, variant 10 UUID the record schema accepts', () => {
    const id = uuidFromName('row');
    expect(id).toMatch(/^[0-9a-f]{8}-[0-9a-f]{4}-8[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/);
    expect(uuidFromName('row')).toBe(id);
    expect(uuidFromName('row2')).not.toBe(id);
  });
});

describe('readCsvTable()', () => {
  it('reads RFC 4180 quoting: delimiters, doubled quotes and line breaks inside quotes, with line numbers', () => {
    const text = 'taken_at,value,comment\r\n2026-12-01 08:00,10.1,"Jaw 2, cleaned"\r\n2026-12-01 09:00,10.2,"He said ""hold"""\r\n\r\n2026-12-01 10:00,10.0,"two\r\nlines"\r\n2026-12-01 11:00,9.9,\r\n';
    const t = readCsvTable(text);
    expect(t.delimiter).toBe(',');
    expect(t.rows.map((r) => r.line)).toEqual([1, 2, 3, 5, 7]);
    expect(t.rows[1]!.cells[2]).toBe('Jaw 2, cleaned');
    expect(t.rows[2]!.cells[2]).toBe('He said "hold"');
    expect(t.rows[3]!.cells[2]).toBe('two\r\nlines');
    expect(t.rows[4]!.cells).toEqual(['2026-12-01 11:00', '9.9', '']);
  });

  it('detects semicolons and tabs, drops a byte order mark, and reports an unclosed quote with its line', () => {
    expect(readCsvTable('\ufeffdate;value\n01.12.2026 08:00;"10,5"\n').rows[1]!.cells).toEqual(['01.12.2026 08:00', '10,5']);
    expect(readCsvTable('a\tb\n1\t2\n').delimiter).toBe('\t');
    const bad = readCsvTable('time,value\n2026-12-01 08:00,"10.1\n');
    expect(bad.problems).toHaveLength(1);
    expect(bad.problems[0]!.line).toBe(2);
  });
});

describe('decodeCsvBytes()', () => {
  it('reads UTF-8, falls back to Windows-1252 for bytes that are not UTF-8, and honours a UTF-16 byte order mark', () => {
    const text = 'Messwert;Prüfer;µm\n';
    expect(decodeCsvBytes(new TextEncoder().encode(text))).toEqual({ text, encoding: 'UTF-8' });
    // source: Windows-1252 code chart (ü = 0xFC, µ = 0xB5), as written by Node's 'latin1' encoding for these characters
    expect(decodeCsvBytes(new Uint8Array(Buffer.from(text, 'latin1')))).toEqual({ text, encoding: 'Windows-1252' });
    const utf16 = new Uint8Array([0xff, 0xfe, ...Buffer.from(text, 'utf16le')]);
    expect(decodeCsvBytes(utf16)).toEqual({ text, encoding: 'UTF-16' });
  });
});

describe('parseImportTime()', () => {
  const o = { dateOrder: 'dmy' as const, localTime: utcLocal };
  it('reads ISO with zone or offset, local ISO, dotted and slashed dates', () => {
    expect(parseImportTime('2026-12-01T08:15:00.000Z', o)).toEqual({ kind: 'instant', ms: Date.UTC(2026, 11, 1, 8, 15) });
    expect(parseImportTime('2026-12-01T09:15:00+01:00', o)).toEqual({ kind: 'instant', ms: Date.UTC(2026, 11, 1, 8, 15) });
    expect(parseImportTime('2026-12-01 08:15', o)).toEqual({ kind: 'instant', ms: Date.UTC(2026, 11, 1, 8, 15) });
    expect(parseImportTime('01.12.2026 08:15:30', o)).toEqual({ kind: 'instant', ms: Date.UTC(2026, 11, 1, 8, 15, 30) });
    expect(parseImportTime('02/03/2026 08:15', o)).toEqual({ kind: 'instant', ms: Date.UTC(2026, 2, 2, 8, 15) });
    expect(parseImportTime('02/03/2026 08:15', { ...o, dateOrder: 'mdy' })).toEqual({ kind: 'instant', ms: Date.UTC(2026, 1, 3, 8, 15) });
  });
  it('tells a date alone, a time alone and what it cannot read', () => {
    expect(parseImportTime('2026-12-01', o).kind).toBe('date');
    expect(parseImportTime('8:15', o).kind).toBe('clock');
    expect(parseImportTime('31.02.2026 08:00', o).kind).toBe('bad');
    expect(parseImportTime('yesterday', o).kind).toBe('bad');
    expect(parseImportTime('2026-12-01 25:00', o).kind).toBe('bad');
  });
});

describe('readImportNumber()', () => {
  it('reads the chosen decimal mark and names the other one', () => {
    expect(readImportNumber('10.25', '.')).toEqual({ ok: true, value: 10.25 });
    expect(readImportNumber('10,25', ',')).toEqual({ ok: true, value: 10.25 });
    expect(readImportNumber('-0,5', ',')).toEqual({ ok: true, value: -0.5 });
    const comma = readImportNumber('10,25', '.');
    expect(comma.ok).toBe(false);
    expect(!comma.ok && comma.message).toContain('decimal comma');
    expect(readImportNumber('1.234,5', ',').ok).toBe(false);
    expect(readImportNumber('abc', '.').ok).toBe(false);
  });
});

describe('round trip with historyToCsv()', () => {
  it('our own export, imported into an empty characteristic, gives the same samples', () => {
    const samples = Array.from({ length: 25 }, (_, i) =>
      sampleAt(i * 60, { characteristicId: 'ch-fill', values: [500 + (i % 3), 500.5, 499.5 + (i % 2)] }));
    samples[2] = { ...samples[2]!, lot: 'L-7, "blue"', comment: 'Nozzle wiped;\nrestarted' };
    samples[5] = { ...samples[5]!, excluded: true, reason: 'Scale not levelled' };
    const exported = historyToCsv(buildCharacteristicView(XBAR, [], samples, [], [], T0), (id) => id);

    const target = { ...XBAR, id: 'ch-fill-2' };
    const { layout, checked } = importText(exported, target);
    expect(layout).toBe('export');
    expect(summarizeImport(checked)).toEqual({ ready: 25, check: 0, problem: 0, already: 0 });
    const imported = samplesToImport(checked, false);
    const essence = (s: Sample) => ({ takenAt: s.takenAt, values: s.values, lot: s.lot, comment: s.comment, excluded: s.excluded, reason: s.excluded ? s.reason : undefined });
    expect(imported.map(essence)).toEqual(samples.map(essence));
    expect(imported.every((s) => s.characteristicId === 'ch-fill-2' && s.recordedBy === 'p-eng' && s.imported?.file === 'sheet.csv')).toBe(true);
    expect(imported.map((s) => s.imported!.line)).toEqual(Array.from({ length: 25 }, (_, i) => (i > 2 ? i + 3 : i + 2)));
  });

  it('round-trips counts of an attribute chart', () => {
    const p = makeCharacteristic({ id: 'ch-p', name: 'Seal leaks', unit: 'leaking', decimals: 0, chartType: 'p', subgroupSize: 50 });
    const samples = Array.from({ length: 5 }, (_, i) => sampleAt(i * 60, { characteristicId: 'ch-p', values: undefined, count: i, inspected: 50 - i }));
    const exported = historyToCsv(buildCharacteristicView(p, [], samples, [], [], T0), (id) => id);
    const imported = samplesToImport(importText(exported, { ...p, id: 'ch-p2' }).checked, false);
    expect(imported.map((s) => [s.takenAt, s.count, s.inspected, s.values])).toEqual(samples.map((s) => [s.takenAt, s.count, s.inspected, undefined]));
  });

  it('knows an exported sample that was corrected after the export', () => {
    const ch = makeCharacteristic();
    const samples = individuals(BASELINE.slice(0, 3));
    const exported = historyToCsv(buildCharacteristicView(ch, [], samples, [], [], T0), (id) => id);
    const corrected = { ...samples[1]!, id: '0190a000-0000-7000-8000-000000000001', values: [10.3], supersedes: samples[1]!.id, reason: 'Misread' };
    const { checked } = importText(exported, ch, { existing: [samples[0]!, corrected, samples[2]!] });
    expect(checked.map((r) => r.status)).toEqual(['already', 'already', 'already']);
  });

  it('finds every row of the same export already on its own chart', () => {
    const samples = individuals(BASELINE, { characteristicId: 'ch-bore' });
    const ch = makeCharacteristic();
    const exported = historyToCsv(buildCharacteristicView(ch, [], samples, [], [], T0), (id) => id);
    const { checked } = importText(exported, ch, { existing: samples });
    expect(summarizeImport(checked).already).toBe(20);
  });

  it('an export holding imported samples says where each came from, and importing it back records nothing twice', () => {
    const ch = makeCharacteristic({ id: 'ch-bore' });
    const plain = 'time,value,comment\n2026-12-01 08:00,10.01,a\n2026-12-01 09:00,10.02,"b, with a comma"\n2026-12-01 10:00,9.98,\n';
    const first = samplesToImport(importText(plain, ch, { fileName: 'old gauge.csv' }).checked, false);
    expect(first).toHaveLength(3);
    // Two samples entered here after the imported history.
    const entered = [sampleAt(48 * 60 + 10, { characteristicId: 'ch-bore', values: [10.0] }), sampleAt(48 * 60 + 20, { characteristicId: 'ch-bore', values: [10.03] })];
    const onChart = [...first, ...entered];
    const exported = historyToCsv(buildCharacteristicView(ch, [], onChart, [], [], T0), (id) => id);
    const table = readCsvTable(exported);
    expect(table.rows[0]!.cells.at(-1)).toBe('imported_from');
    expect(table.rows.slice(1).map((r) => r.cells.at(-1))).toEqual(['old gauge.csv, line 2', 'old gauge.csv, line 3', 'old gauge.csv, line 4', '', '']);

    // Still our own export: the new column is read as nothing.
    const later = { now: T0 + 72 * 60 * MINUTE };
    const same = importText(exported, ch, { ...later, existing: onChart, fileName: 'ch-bore-history.csv' });
    expect(same.layout).toBe('export');
    expect(same.mapping.roles.at(-1)).toBe('ignore');
    // Back into its own chart: every row is already there, the imported ones too.
    expect(summarizeImport(same.checked)).toEqual({ ready: 0, check: 0, problem: 0, already: 5 });
    // Into its own chart on a tablet that has not received the imported samples yet: they come back with the ids
    // they already have (so the sync stores each once); the entered ones are known by their sample_id.
    const fresh = importText(exported, ch, { ...later, existing: entered, fileName: 'ch-bore-history.csv' });
    expect(fresh.checked.map((r) => r.status)).toEqual(['ready', 'ready', 'ready', 'already', 'already']);
    expect(samplesToImport(fresh.checked, false).map((s) => s.id)).toEqual(first.map((s) => s.id));

    // Into another characteristic: the same samples, recorded as coming from the export, line by line; a second import adds nothing.
    const other = { ...ch, id: 'ch-bore-2' };
    const moved = samplesToImport(importText(exported, other, { ...later, fileName: 'ch-bore-history.csv' }).checked, false);
    const essence = (s: Sample) => ({ takenAt: s.takenAt, values: s.values, comment: s.comment });
    expect(moved.map(essence)).toEqual(onChart.map(essence));
    expect(moved.map((s) => s.imported)).toEqual([2, 3, 4, 5, 6].map((line) => ({ file: 'ch-bore-history.csv', line })));
    const again = importText(exported, other, { ...later, existing: moved });
    expect(summarizeImport(again.checked)).toEqual({ ready: 0, check: 0, problem: 0, already: 5 });
  });
});

describe('a plain layout typed in a spreadsheet', () => {
  it('guesses the columns from the header words', () => {
    const text = 'Date;Time;Reading 1;Reading 2;Reading 3;Batch;Notes\n01.12.2026;08:00;"500,1";"500,4";"499,8";B12;\n';
    const table = readCsvTable(text);
    const { layout, mapping } = guessMapping(table, XBAR);
    expect(layout).toBe('plain');
    expect(mapping).toEqual({ hasHeader: true, roles: ['date', 'timeOfDay', 'value', 'value', 'value', 'lot', 'comment'] });
    const rows = mapRows(table, mapping);
    expect(guessDecimal(rows)).toBe(',');
    const [row] = checkImportRows(rows, context(XBAR, { decimal: ',' }));
    expect(row!.status).toBe('ready');
    expect(row!.sample).toMatchObject({ takenAt: iso(Date.UTC(2026, 11, 1, 8)), values: [500.1, 500.4, 499.8], lot: 'B12' });
  });

  it('reads a "time" column holding whole timestamps as the date and time', () => {
    const { mapping } = importText('Time,Value\n2026-12-01 08:00,10.1\n', makeCharacteristic());
    expect(mapping.roles).toEqual(['takenAt', 'value']);
  });

  it('takes an unknown header over a number for the value the chart still lacks', () => {
    expect(importText('Taken,Torque,Batch,Notes\n2026-12-01 08:00,25.1,B-1,\n', makeCharacteristic()).mapping.roles).toEqual(['takenAt', 'value', 'lot', 'comment']);
    const p = makeCharacteristic({ chartType: 'p', subgroupSize: 50 });
    expect(importText('when,rejects,of\n2026-12-01 08:00,3,50\n', p).mapping.roles).toEqual(['takenAt', 'count', 'inspected']);
  });

  it('takes a file with no header row in column order: time, values, lot, comment', () => {
    const { mapping, checked } = importText('2026-12-01 08:00,500.1,500.2,500.3,L1,ok\n', XBAR);
    expect(mapping).toEqual({ hasHeader: false, roles: ['takenAt', 'value', 'value', 'value', 'lot', 'comment'] });
    expect(checked[0]!.status).toBe('ready');
  });

  it('says which columns are still missing from the mapping', () => {
    expect(mappingProblems({ hasHeader: true, roles: ['value', 'lot'] }, XBAR).join(' ')).toMatch(/date and time/);
    const p = makeCharacteristic({ chartType: 'p', subgroupSize: 50 });
    expect(mappingProblems({ hasHeader: true, roles: ['takenAt', 'count'] }, p)).toEqual(['Choose the column with the quantity inspected.']);
    expect(mappingProblems({ hasHeader: true, roles: ['takenAt', 'value'] }, makeCharacteristic())).toEqual([]);
  });
});

describe('row problems', () => {
  const ch = makeCharacteristic();
  const at = (i: number) => `2026-12-01 ${String(8 + i).padStart(2, '0')}:00`;

  it('lists every bad row with its line number and says why; good rows stay ready', () => {
    const existing = [sampleAt(-60, { values: [10.05] })]; // T0 - 1 h = 2026-12-02 07:00 UTC
    const lines = [
      'time,value,lot,comment',
      `${at(0)},10.01,,`, // 2 ready
      `${at(1)},ten,,`, // 3 not a number
      `${at(2)},"10,02",,`, // 4 decimal comma while reading points
      `01/13/2026 08:00,10.00,,`, // 5 no 13th month (day first)
      `2027-06-01 08:00,10.00,,`, // 6 in the future
      `2026-12-02 07:00,10.05,,`, // 7 already on the chart
      `${at(0)},10.01,,`, // 8 repeats line 2
      `${at(3)},,,`, // 9 value missing
      `2026-12-01,10.00,,`, // 10 a date without a time
      `${at(4)},10.0,${'L'.repeat(61)},`, // 11 lot too long
      `1026-12-01 08:00,10.00,,`, // 12 a slip in the year
    ];
    const { checked } = importText(lines.join('\n'), ch, { existing });
    const byLine = new Map(checked.map((r) => [r.line, r]));
    expect(checked.map((r) => r.line)).toEqual([2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12]);
    expect(byLine.get(2)!.status).toBe('ready');
    const problem = (line: number) => { const r = byLine.get(line)!; expect(r.status, `line ${line}`).not.toBe('ready'); return r.problems.join(' '); };
    expect(problem(3)).toMatch(/“ten” is not a number/);
    expect(problem(4)).toMatch(/decimal comma/);
    expect(problem(5)).toMatch(/not a date and time/);
    expect(problem(6)).toMatch(/future/);
    expect(byLine.get(7)!.status).toBe('already');
    expect(problem(8)).toMatch(/Repeats line 2/);
    expect(problem(9)).toMatch(/value is missing/);
    expect(problem(10)).toMatch(/date but no time/);
    expect(problem(11)).toMatch(/lot has 61 characters/);
    expect(problem(12)).toBe('1026-12-01 is before 1990: check the year.');
  });

  it('counts the values against the subgroup size', () => {
    const { checked } = importText('time,v1,v2,v3\n2026-12-01 08:00,500.1,500.2,\n2026-12-01 09:00,500.1,500.2,500.3\n', XBAR);
    expect(checked[0]!.status).toBe('problem');
    expect(checked[0]!.problems[0]).toBe('2 values, but a subgroup of Fill weight has 3.');
    expect(checked[1]!.status).toBe('ready');
  });

  it('catches a decimal comma that split a comma-separated row', () => {
    const { checked } = importText('time,value\n2026-12-01 08:00,10,02\n', ch, { decimal: ',' });
    expect(checked[0]!.problems.join(' ')).toMatch(/3 fields but the file has 2 columns.*inside quotes/);
  });

  it('flags values beyond the typo guard and finer than the gauge for a check, imported only when accepted', () => {
    const guard = { centre: 10, sigma: 0.05 };
    const { checked } = importText('time,value\n2026-12-01 08:00,10.02\n2026-12-01 09:00,100.2\n2026-12-01 10:00,10.015\n', ch, { guard });
    expect(checked.map((r) => r.status)).toEqual(['ready', 'check', 'check']);
    expect(checked[1]!.problems[0]).toMatch(/far from the usual values/);
    expect(checked[2]!.problems[0]).toMatch(/more decimals than the gauge reads \(2\)/);
    expect(samplesToImport(checked, false)).toHaveLength(1);
    expect(samplesToImport(checked, true)).toHaveLength(3);
  });

  it('takes the typo guard from the current phase of the chart', () => {
    const view = buildCharacteristicView(ch, [], individuals(BASELINE), [], [], T0);
    const guard = typoGuardOf(view.analysis.phases)!;
    expect(guard.centre).toBeCloseTo(BASELINE.reduce((a, b) => a + b, 0) / BASELINE.length, 10);
    expect(guard.sigma).toBeGreaterThan(0);
    expect(typoGuardOf([])).toBeUndefined();
  });

  it('checks counts and quantities of attribute charts', () => {
    const p = makeCharacteristic({ name: 'Seal leaks', chartType: 'p', subgroupSize: 50, decimals: 0 });
    const { checked } = importText('time,count,inspected\n2026-12-01 08:00,3,50\n2026-12-01 09:00,2.5,50\n2026-12-01 10:00,60,50\n2026-12-01 11:00,1,0\n2026-12-01 12:00,,50\n', p);
    expect(checked.map((r) => r.status)).toEqual(['ready', 'problem', 'problem', 'problem', 'problem']);
    expect(checked[1]!.problems[0]).toMatch(/not a whole number/);
    expect(checked[2]!.problems[0]).toMatch(/More nonconforming items \(60\) than items inspected \(50\)/);
    expect(checked[3]!.problems[0]).toMatch(/more than 0/);
    expect(checked[4]!.problems[0]).toMatch(/count is missing/);
  });

  it('wants a reason with a point left out of the limits', () => {
    const mapping: ColumnMapping = { hasHeader: true, roles: ['takenAt', 'value', 'excluded', 'reason'] };
    const { checked } = importText('t,v,x,r\n2026-12-01 08:00,10,true,\n2026-12-01 09:00,10,yes,Gauge dropped\n2026-12-01 10:00,10,maybe,\n', ch, {}, mapping);
    expect(checked.map((r) => r.status)).toEqual(['problem', 'ready', 'problem']);
    expect(checked[1]!.sample).toMatchObject({ excluded: true, reason: 'Gauge dropped' });
  });
});

describe('stable ids', () => {
  const ch = makeCharacteristic();
  const file = 'time,value,comment\n2026-12-01 08:00,10.01,a\n2026-12-01 09:00,10.02,b\n2026-12-01 10:00,bad,c\n';
  const ids = (text: string, c = ch) => importText(text, c).checked.map((r) => r.sample?.id);

  it('gives each row the same id every time the file is read, on any tablet', () => {
    expect(ids(file)).toEqual(ids(file));
    const other = importText(file, ch, { recordedBy: 'p-other', deviceId: 'tab-9', fileName: 'renamed.csv' }).checked.map((r) => r.sample?.id);
    expect(other).toEqual(ids(file));
  });

  it('keeps the ids of good rows when another row is fixed, removed or moved', () => {
    const [a, b] = ids(file);
    expect(ids(file.replace('bad', '10.03')).slice(0, 2)).toEqual([a, b]);
    expect(ids('time,value,comment\n2026-12-01 09:00,10.02,b\n2026-12-01 08:00,10.01,a\n')).toEqual([b, a]);
  });

  it('differs between characteristics and between different rows', () => {
    const [a, b] = ids(file);
    expect(a).not.toBe(b);
    expect(ids(file, { ...ch, id: 'ch-other' })[0]).not.toBe(a);
  });

  it('makes a second import of the same file add nothing', () => {
    const first = samplesToImport(importText(file, ch).checked, false);
    const again = importText(file, ch, { existing: first }).checked;
    expect(summarizeImport(again)).toEqual({ ready: 0, check: 0, problem: 1, already: 2 });
  });

  it('validates every built sample with the record schema', () => {
    for (const s of samplesToImport(importText(file, ch).checked, true)) expect(Sample.safeParse(s).success).toBe(true);
  });
});

describe('signalsAtImported()', () => {
  it('counts the signals that would begin at imported points, not at points already there', () => {
    const ch = makeCharacteristic();
    const existing = individuals(BASELINE);
    // A point far beyond the 3-sigma limit fires Western Electric rule 1 (Western Electric, Statistical Quality Control Handbook, 1956).
    const imported = [sampleAt(20 * 60, { values: [11] }), sampleAt(21 * 60, { values: [10] })];
    expect(signalsAtImported(ch, [], existing, imported)).toBe(1);
    expect(signalsAtImported(ch, [], existing, imported.slice(1))).toBe(0);
    expect(signalsAtImported(ch, [], [...existing, imported[0]!], imported.slice(1))).toBe(0);
  });
});

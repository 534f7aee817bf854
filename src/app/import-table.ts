import Papa from 'papaparse';

/** One record of the file with the line it starts on (1-based, as an editor shows it). */
export interface CsvRow {
  readonly line: number;
  readonly cells: readonly string[];
}

export type CsvDelimiter = ',' | ';' | '\t';

export interface CsvTable {
  readonly rows: readonly CsvRow[];
  readonly delimiter: CsvDelimiter;
  /** Problems of the file's structure (an unclosed quote), each with the line it starts on. */
  readonly problems: readonly { readonly line: number; readonly message: string }[];
}

const DELIMITERS: readonly CsvDelimiter[] = [',', ';', '\t'];

/**
 * Reads CSV text (RFC 4180: quoted fields may hold delimiters, quotes and line breaks) into rows with
 * their line numbers. The delimiter is detected unless given (comma, semicolon or tab: spreadsheets
 * set to a decimal comma write semicolons). Blank lines are not rows. Pure.
 */
export function readCsvTable(text: string, delimiter?: CsvDelimiter): CsvTable {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text; // a spreadsheet's byte order mark
  const rows: CsvRow[] = [];
  const problems: { line: number; message: string }[] = [];
  // Line numbers: count line breaks up to where each row starts (papaparse gives the cursor after each row).
  let counted = 0;
  let line = 1;
  const lineAt = (offset: number) => {
    for (; counted < offset && counted < body.length; counted++) {
      const c = body.charCodeAt(counted);
      if (c === 10 || (c === 13 && body.charCodeAt(counted + 1) !== 10)) line++;
    }
    return line;
  };
  let start = 0;
  const used = delimiter ?? detectDelimiter(body);
  Papa.parse<string[]>(body, {
    delimiter: used,
    skipEmptyLines: false,
    step(result) {
      const rowLine = lineAt(start);
      start = result.meta.cursor;
      const cells = result.data;
      for (const e of result.errors) {
        if (e.type === 'Quotes') problems.push({ line: rowLine, message: `Line ${rowLine}: a quoted field is not closed (${e.message}).` });
      }
      if (cells.every((c) => c.trim() === '')) return;
      rows.push({ line: rowLine, cells });
    },
  });
  return { rows, delimiter: used, problems };
}

/**
 * The delimiter that splits the first lines most evenly into more than one field (quotes respected):
 * the share of lines with the usual field count first, then the field count. Comma when none splits.
 */
export function detectDelimiter(text: string): CsvDelimiter {
  let best: { d: CsvDelimiter; share: number; fields: number } = { d: ',', share: 0, fields: 1 };
  for (const d of DELIMITERS) {
    const lines = Papa.parse<string[]>(text, { delimiter: d, preview: 20, skipEmptyLines: 'greedy' }).data;
    if (!lines.length) continue;
    const tally = new Map<number, number>();
    for (const l of lines) tally.set(l.length, (tally.get(l.length) ?? 0) + 1);
    const [fields, often] = [...tally].sort((a, b) => b[1] - a[1] || b[0] - a[0])[0]!;
    const share = often / lines.length;
    if (fields > 1 && (share > best.share || (share === best.share && fields > best.fields))) best = { d, share, fields };
  }
  return best.d;
}

export type TextEncodingName = 'UTF-8' | 'UTF-16' | 'Windows-1252';

/**
 * A file's bytes as text: UTF-16 when it starts with a UTF-16 byte order mark (a spreadsheet's "Unicode
 * text"), UTF-8 when the bytes are valid UTF-8, else Windows-1252 (what older spreadsheets on Windows
 * write, so "µm" and "Prüfer" come out right instead of as replacement characters).
 */
export function decodeCsvBytes(bytes: Uint8Array): { text: string; encoding: TextEncodingName } {
  if (bytes[0] === 0xff && bytes[1] === 0xfe) return { text: new TextDecoder('utf-16le').decode(bytes), encoding: 'UTF-16' };
  if (bytes[0] === 0xfe && bytes[1] === 0xff) return { text: new TextDecoder('utf-16be').decode(bytes), encoding: 'UTF-16' };
  try {
    return { text: new TextDecoder('utf-8', { fatal: true }).decode(bytes), encoding: 'UTF-8' };
  } catch {
    return { text: new TextDecoder('windows-1252').decode(bytes), encoding: 'Windows-1252' };
  }
}

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
  let used: string = delimiter ?? ',';
  Papa.parse<string[]>(body, {
    delimiter: delimiter ?? '',
    delimitersToGuess: [...DELIMITERS],
    skipEmptyLines: false,
    step(result) {
      const rowLine = lineAt(start);
      start = result.meta.cursor;
      used = result.meta.delimiter;
      const cells = result.data;
      for (const e of result.errors) {
        if (e.type === 'Quotes') problems.push({ line: rowLine, message: `Line ${rowLine}: a quoted field is not closed (${e.message}).` });
      }
      if (cells.every((c) => c.trim() === '')) return;
      rows.push({ line: rowLine, cells });
    },
  });
  return { rows, delimiter: (DELIMITERS as readonly string[]).includes(used) ? (used as CsvDelimiter) : ',', problems };
}

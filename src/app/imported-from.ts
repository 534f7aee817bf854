import type { Sample } from '../schema';

/**
 * Where an imported sample came from, as the history export and the printed report write it:
 * "sheet.csv, line 12" (the line the row starts on in that file). Pure.
 */
export function importedFromText(imported: NonNullable<Sample['imported']>): string {
  return `${imported.file}, line ${imported.line}`;
}

import { isVariableChart, type Characteristic } from '../schema';
import type { EntryInput } from './app-state';

/**
 * Why an entry cannot be a sample of this characteristic's chart, or undefined when it can. The server
 * refuses the same (src/server/check-record.ts); checking before the save keeps such a sample off the
 * tablet, where the engine could not chart it.
 */
export function entryProblem(ch: Characteristic, entry: EntryInput): string | undefined {
  if (isVariableChart(ch.chartType)) {
    return entry.values?.length ? undefined : `${ch.name} is measured: enter the measured value.`;
  }
  if (entry.count === undefined) return `${ch.name} is counted: enter the count.`;
  if (ch.chartType === 'c') return undefined;
  if (entry.inspected === undefined) return `${ch.name}: enter the quantity inspected with the count.`;
  if ((ch.chartType === 'p' || ch.chartType === 'np') && entry.count > entry.inspected) {
    return `More nonconforming items (${entry.count}) than items inspected (${entry.inspected}).`;
  }
  return undefined;
}

/** Day first (31/12/2026) or month first (12/31/2026) for dates written with slashes. */
export type DateOrder = 'dmy' | 'mdy';

/** Local wall-clock time to an instant (ms): the tablet's time zone unless a test gives another. */
export type LocalTime = (year: number, month: number, day: number, hour: number, minute: number, second: number, ms: number) => number;

export const tabletLocalTime: LocalTime = (y, mo, d, h, mi, s, ms) => new Date(y, mo - 1, d, h, mi, s, ms).getTime();

export interface TimeReadOptions {
  readonly dateOrder: DateOrder;
  readonly localTime?: LocalTime;
}

export type ReadTime =
  | { readonly kind: 'instant'; readonly ms: number }
  | { readonly kind: 'date'; readonly year: number; readonly month: number; readonly day: number }
  | { readonly kind: 'clock'; readonly hour: number; readonly minute: number; readonly second: number; readonly ms: number }
  | { readonly kind: 'bad'; readonly message: string };

const ISO_DATE = /^(\d{4})-(\d{1,2})-(\d{1,2})$/;
const DOT_DATE = /^(\d{1,2})\.(\d{1,2})\.(\d{4})$/;
const SLASH_DATE = /^(\d{1,2})\/(\d{1,2})\/(\d{4})$/;
const CLOCK = /^(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?$/;
const ZONE = /^(?:Z|[+-]\d{2}:?\d{2})$/i;

function daysIn(year: number, month: number): number {
  return new Date(Date.UTC(year, month, 0)).getUTCDate();
}

function readDate(text: string, order: DateOrder): Extract<ReadTime, { kind: 'date' }> | undefined {
  let m = ISO_DATE.exec(text);
  let y: number, mo: number, d: number;
  if (m) [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
  else if ((m = DOT_DATE.exec(text))) [d, mo, y] = [Number(m[1]), Number(m[2]), Number(m[3])];
  else if ((m = SLASH_DATE.exec(text))) [d, mo, y] = order === 'dmy' ? [Number(m[1]), Number(m[2]), Number(m[3])] : [Number(m[2]), Number(m[1]), Number(m[3])];
  else return undefined;
  if (mo < 1 || mo > 12 || d < 1 || d > daysIn(y, mo)) return undefined;
  return { kind: 'date', year: y, month: mo, day: d };
}

function readClock(text: string): Extract<ReadTime, { kind: 'clock' }> | undefined {
  const m = CLOCK.exec(text);
  if (!m) return undefined;
  const [hour, minute, second] = [Number(m[1]), Number(m[2]), Number(m[3] ?? 0)];
  if (hour > 23 || minute > 59 || second > 59) return undefined;
  return { kind: 'clock', hour, minute, second, ms: Number((m[4] ?? '0').padEnd(3, '0').slice(0, 3)) };
}

function zoneOffsetMinutes(zone: string): number {
  if (/^z$/i.test(zone)) return 0;
  const m = /^([+-])(\d{2}):?(\d{2})$/.exec(zone)!;
  return (m[1] === '-' ? -1 : 1) * (Number(m[2]) * 60 + Number(m[3]));
}

/** Date and clock time as one instant: UTC with the zone given, else local time. */
export function combineTime(date: Extract<ReadTime, { kind: 'date' }>, clock: Extract<ReadTime, { kind: 'clock' }>, zone: string | undefined, localTime: LocalTime): number {
  if (zone !== undefined) {
    return Date.UTC(date.year, date.month - 1, date.day, clock.hour, clock.minute, clock.second, clock.ms) - zoneOffsetMinutes(zone) * 60_000;
  }
  return localTime(date.year, date.month, date.day, clock.hour, clock.minute, clock.second, clock.ms);
}

/**
 * Reads a timestamp cell: ISO 8601 (2026-03-01T08:15:00Z, with an offset, or without a zone as local
 * time, "T" or a space between date and time), 01.03.2026 08:15, or 01/03/2026 08:15 (day or month
 * first as chosen). A cell with a date alone or a time alone says so, for a date column beside a time
 * column. Pure apart from `localTime`.
 */
export function parseImportTime(cell: string, options: TimeReadOptions): ReadTime {
  const text = cell.trim();
  if (text === '') return { kind: 'bad', message: 'The date and time are missing.' };
  const localTime = options.localTime ?? tabletLocalTime;
  const onlyDate = readDate(text, options.dateOrder);
  if (onlyDate) return onlyDate;
  const onlyClock = readClock(text);
  if (onlyClock) return onlyClock;
  // Date, then "T" or spaces, then the clock time, then perhaps a zone (Z, +01:00, -0500).
  const m = /^(\S+?)(?:T|\s+)(\d{1,2}:\d{2}(?::\d{2}(?:[.,]\d{1,9})?)?)\s*(Z|[+-]\d{2}:?\d{2})?$/i.exec(text);
  const date = m ? readDate(m[1]!, options.dateOrder) : undefined;
  const clock = m ? readClock(m[2]!) : undefined;
  if (!m || !date || !clock || (m[3] !== undefined && !ZONE.test(m[3]))) {
    return { kind: 'bad', message: `“${text}” is not a date and time this import can read (e.g. 2026-03-01 08:15 or 01.03.2026 08:15).` };
  }
  return { kind: 'instant', ms: combineTime(date, clock, m[3], localTime) };
}

import type { AdminDevice } from '../schema';

/** What the admin's tablet list says of a tablet's record numbers (see AdminDevice.records). */
export interface CoverageNote {
  readonly text: string;
  /** Some numbers below the highest never reached the server. */
  readonly missing: boolean;
}

const span = (g: { from: number; to: number }) => (g.from === g.to ? `${g.from}` : `${g.from}–${g.to}`);

/**
 * "Records 1–120 received" when nothing is missing; otherwise which numbers never arrived — still
 * waiting on the tablet (sent later), or lost if the tablet was wiped before it could send them.
 * Undefined for a tablet that never sent numbers.
 */
export function coverageNote(records: AdminDevice['records']): CoverageNote | undefined {
  if (!records || records.highest === 0) return undefined;
  const n = (x: number) => x.toLocaleString('en-GB');
  if (records.missing === 0) return { text: `Records 1–${n(records.highest)} received`, missing: false };
  const listed = records.gaps.map(span).join(', ');
  const more = records.gaps.reduce((k, g) => k + g.to - g.from + 1, 0) < records.missing ? ', …' : '';
  return {
    text: `${n(records.received)} of ${n(records.highest)} received; not received: ${listed}${more} (${n(records.missing)}) — still waiting on the tablet, or lost if it was reset`,
    missing: true,
  };
}

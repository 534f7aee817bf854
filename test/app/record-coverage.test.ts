import { describe, expect, it } from 'vitest';
import { coverageNote } from '../../src/app/record-coverage';

describe('coverageNote()', () => {
  it('says nothing for a tablet that never sent numbered records', () => {
    expect(coverageNote(undefined)).toBeUndefined();
    expect(coverageNote({ received: 0, highest: 0, missing: 0, gaps: [] })).toBeUndefined();
  });

  it('says the whole run arrived when nothing is missing', () => {
    expect(coverageNote({ received: 1200, highest: 1200, missing: 0, gaps: [] })).toEqual({ text: 'Records 1–1,200 received', missing: false });
  });

  it('lists the numbers that never arrived, single numbers and ranges, with their count', () => {
    const note = coverageNote({ received: 95, highest: 100, missing: 5, gaps: [{ from: 7, to: 7 }, { from: 57, to: 60 }] });
    expect(note?.missing).toBe(true);
    expect(note?.text).toBe('95 of 100 received; not received: 7, 57–60 (5) — still waiting on the tablet, or lost if it was reset');
  });

  it('marks a list cut short (the server lists the first 20 ranges, and counts them all)', () => {
    const gaps = Array.from({ length: 20 }, (_, i) => ({ from: 2 * i + 2, to: 2 * i + 2 }));
    expect(coverageNote({ received: 80, highest: 120, missing: 40, gaps })?.text).toMatch(/38, 40, … \(40\)/);
  });
});

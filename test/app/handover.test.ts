import { describe, expect, it } from 'vitest';
import { buildCharacteristicView } from '../../src/app/build-view';
import { summarizeShift } from '../../src/app/handover';
import { BASELINE, individuals, makeAck, makeCharacteristic, makeResponse } from './helpers';

const HOUR = 3_600_000;

describe('summarizeShift()', () => {
  // The helpers' individuals() take one value an hour from T0 (see test/app/helpers.ts).
  const ch = makeCharacteristic({ intervalMinutes: 60 });
  const samples = individuals([...BASELINE, 11, 10, 10.05, 11.2]);
  const first = samples[0]!;
  const start = Date.parse(first.takenAt);
  const answered = makeResponse(samples[20]!.id, { whatHappened: 'Bar end', causeCategory: 'Material', action: 'Swapped the bar' });
  const view = buildCharacteristicView(ch, [], samples, [answered], [], start + 25 * HOUR);

  it('counts the samples of the period against the interval and the signals by state', () => {
    // The last 8 hours of the 24 samples: samples 16..23.
    const from = start + 16 * HOUR;
    const h = summarizeShift([view], from, from + 8 * HOUR);
    const row = h.rows[0]!;
    expect(row.samples).toBe(8);
    expect(row.expected).toBe(8);
    const groups = view.groups.filter((g) => g.index >= 16);
    expect(row.unanswered + row.awaitingSignOff + row.signedOff).toBe(groups.length);
    expect(row.awaitingSignOff).toBe(1);
    expect(row.notes).toEqual([{ at: answered.respondedAt, text: 'Bar end — Material; action: Swapped the bar' }]);
    expect(h.totals).toMatchObject({ samples: 8, awaitingSignOff: 1 });
  });

  it('leaves out what happened before the period', () => {
    const h = summarizeShift([view], start + 22 * HOUR, start + 30 * HOUR);
    expect(h.rows[0]!.samples).toBe(2);
    expect(h.rows[0]!.awaitingSignOff).toBe(0);
    expect(h.rows[0]!.notes).toEqual([]);
  });

  it('a signed-off signal counts as signed off', () => {
    const closed = buildCharacteristicView(ch, [], samples, [answered], [makeAck(answered.id)], start + 25 * HOUR);
    const h = summarizeShift([closed], start, start + 30 * HOUR);
    expect(h.rows[0]!.signedOff).toBe(1);
    expect(h.rows[0]!.awaitingSignOff).toBe(0);
  });
});

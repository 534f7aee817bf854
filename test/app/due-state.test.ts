import { describe, expect, it } from 'vitest';
import { dueStatus, formatSpan } from '../../src/app/due-state';
import { iso, makeCharacteristic, MINUTE, T0 } from './helpers';

const hourly = makeCharacteristic({ intervalMinutes: 60 }); // grace: max(5, 6) = 6 min
const every20 = makeCharacteristic({ intervalMinutes: 20 }); // grace: max(5, 2) = 5 min
const daily = makeCharacteristic({ intervalMinutes: 24 * 60 }); // grace: 144 min
const last = iso(T0);
const at = (minutes: number) => T0 + minutes * MINUTE;

describe('dueStatus', () => {
  it('is not-started before the first sample', () => {
    expect(dueStatus(hourly, undefined, at(0))).toEqual({ kind: 'not-started', dueAt: null, minutes: 0 });
  });

  it('is waiting while the interval runs, with the minutes left', () => {
    expect(dueStatus(hourly, last, at(1))).toEqual({ kind: 'waiting', dueAt: at(60), minutes: 59 });
    expect(dueStatus(hourly, last, at(59))).toEqual({ kind: 'waiting', dueAt: at(60), minutes: 1 });
  });

  it('is due from the due time to the end of the grace (10% of the interval)', () => {
    expect(dueStatus(hourly, last, at(60))).toEqual({ kind: 'due', dueAt: at(60), minutes: 0 });
    expect(dueStatus(hourly, last, at(66))).toEqual({ kind: 'due', dueAt: at(60), minutes: -6 });
    expect(dueStatus(hourly, last, at(67))).toEqual({ kind: 'late', dueAt: at(60), minutes: -7 });
  });

  it('gives at least 5 minutes of grace on short intervals', () => {
    expect(dueStatus(every20, last, at(25)).kind).toBe('due');
    expect(dueStatus(every20, last, at(26)).kind).toBe('late');
  });

  it('scales the grace with long intervals', () => {
    expect(dueStatus(daily, last, at(24 * 60 + 144)).kind).toBe('due');
    expect(dueStatus(daily, last, at(24 * 60 + 145))).toMatchObject({ kind: 'late', minutes: -145 });
  });

  it('counts in whole minutes, rounded to the nearest', () => {
    // 31 s before the due time rounds to 1 minute left; 29 s before rounds to 0, which already reads as due.
    expect(dueStatus(hourly, last, at(60) - 31_000).kind).toBe('waiting');
    expect(dueStatus(hourly, last, at(60) - 29_000)).toMatchObject({ kind: 'due', minutes: 0 });
    // 6 min 29 s late rounds to 6: still within the grace; 6 min 31 s rounds to 7: late.
    expect(dueStatus(hourly, last, at(66) + 29_000).kind).toBe('due');
    expect(dueStatus(hourly, last, at(66) + 31_000).kind).toBe('late');
  });

  it('a last sample in the future (tablet clock behind) reads as waiting', () => {
    expect(dueStatus(hourly, iso(at(30)), at(0))).toMatchObject({ kind: 'waiting', minutes: 90 });
  });
});

describe('formatSpan', () => {
  it('minutes below an hour', () => {
    expect(formatSpan(0)).toBe('0 min');
    expect(formatSpan(12)).toBe('12 min');
    expect(formatSpan(59)).toBe('59 min');
  });

  it('hours and zero-padded minutes up to two days', () => {
    expect(formatSpan(60)).toBe('1 h 00 min');
    expect(formatSpan(65)).toBe('1 h 05 min');
    expect(formatSpan(47 * 60 + 59)).toBe('47 h 59 min');
  });

  it('days and hours from two days on', () => {
    expect(formatSpan(48 * 60)).toBe('2 d 0 h');
    expect(formatSpan(51 * 60 + 59)).toBe('2 d 3 h');
    expect(formatSpan(10 * 24 * 60 + 5 * 60)).toBe('10 d 5 h');
  });

  it('ignores the sign and rounds to whole minutes', () => {
    expect(formatSpan(-12)).toBe('12 min');
    expect(formatSpan(-65)).toBe('1 h 05 min');
    expect(formatSpan(12.4)).toBe('12 min');
    expect(formatSpan(59.6)).toBe('1 h 00 min');
  });
});

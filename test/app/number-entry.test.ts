import { describe, expect, it } from 'vitest';
import { decimalSeparatorFor, formatValue, looksLikeTypo, parseEntry } from '../../src/app/number-entry';

describe('decimalSeparatorFor', () => {
  it('comma for locales that write one, point for the others (CLDR data through Intl)', () => {
    expect(decimalSeparatorFor('de-DE')).toBe(',');
    expect(decimalSeparatorFor('fr-FR')).toBe(',');
    expect(decimalSeparatorFor('en-GB')).toBe('.');
    expect(decimalSeparatorFor('en-US')).toBe('.');
  });
});

describe('parseEntry', () => {
  it('reads a point or a comma as the decimal separator', () => {
    expect(parseEntry('10.25', 2)).toEqual({ ok: true, value: 10.25 });
    expect(parseEntry('10,25', 2)).toEqual({ ok: true, value: 10.25 });
    expect(parseEntry('7', 2)).toEqual({ ok: true, value: 7 });
    expect(parseEntry('0,5', 1)).toEqual({ ok: true, value: 0.5 });
  });

  it('accepts fewer decimals than the gauge reads', () => {
    expect(parseEntry('10.2', 3)).toEqual({ ok: true, value: 10.2 });
  });

  it('ignores surrounding spaces', () => {
    expect(parseEntry('  10,5 ', 1)).toEqual({ ok: true, value: 10.5 });
  });

  it('reads a minus, including the typographic minus sign', () => {
    expect(parseEntry('-0.5', 1)).toEqual({ ok: true, value: -0.5 });
    expect(parseEntry('−0,5', 1)).toEqual({ ok: true, value: -0.5 });
    expect(parseEntry('-3', 0)).toEqual({ ok: true, value: -3 });
  });

  it('refuses more decimals than the gauge reads, saying how many', () => {
    expect(parseEntry('10.255', 2)).toEqual({ ok: false, message: 'This gauge reads to 2 decimals; “10.255” has 3.' });
    expect(parseEntry('1,25', 1)).toEqual({ ok: false, message: 'This gauge reads to 1 decimal; “1,25” has 2.' });
    expect(parseEntry('3,5', 0)).toMatchObject({ ok: false, message: expect.stringContaining('0 decimals') });
  });

  it('asks for a value when there is none', () => {
    expect(parseEntry('', 2)).toEqual({ ok: false, message: 'Enter a value.' });
    expect(parseEntry('   ', 2)).toEqual({ ok: false, message: 'Enter a value.' });
    expect(parseEntry('-', 2)).toEqual({ ok: false, message: 'Enter a value.' });
  });

  it('refuses junk with the text quoted back', () => {
    for (const junk of ['abc', '1,234.5', '1.2.3', '12a', '1e3', '+5', '--5', '5-', '.5', '5.', 'NaN', 'Infinity', '0x10']) {
      const r = parseEntry(junk, 3);
      expect(r, junk).toEqual({ ok: false, message: `“${junk}” is not a number.` });
    }
  });
});

describe('formatValue', () => {
  it('fixes the decimals and writes the locale’s separator', () => {
    expect(formatValue(10.256, 2, ',')).toBe('10,26');
    expect(formatValue(10.256, 2, '.')).toBe('10.26');
    expect(formatValue(-0.5, 1, ',')).toBe('-0,5');
    expect(formatValue(7, 0, ',')).toBe('7');
    expect(formatValue(7, 3, '.')).toBe('7.000');
  });

  it('round-trips through parseEntry', () => {
    for (const sep of [',', '.'] as const) {
      const r = parseEntry(formatValue(12.345, 3, sep), 3);
      expect(r).toEqual({ ok: true, value: 12.345 });
    }
  });
});

describe('looksLikeTypo (k = 6 sigma by default)', () => {
  it('flags values more than 6 sigma from the centre, on either side', () => {
    expect(looksLikeTypo(10.61, 10, 0.1)).toBe(true);
    expect(looksLikeTypo(9.39, 10, 0.1)).toBe(true);
    expect(looksLikeTypo(102.5, 10.25, 0.05)).toBe(true); // a missing decimal point
  });

  it('lets genuine signals through: beyond 3 sigma but within 6', () => {
    expect(looksLikeTypo(10.4, 10, 0.1)).toBe(false);
    expect(looksLikeTypo(10.59, 10, 0.1)).toBe(false);
    expect(looksLikeTypo(9.41, 10, 0.1)).toBe(false);
  });

  it('takes another k', () => {
    expect(looksLikeTypo(10.45, 10, 0.1, 4)).toBe(true);
    expect(looksLikeTypo(10.35, 10, 0.1, 4)).toBe(false);
  });

  it('says nothing without a usable centre and sigma', () => {
    expect(looksLikeTypo(1000, 10, 0)).toBe(false);
    expect(looksLikeTypo(1000, 10, -1)).toBe(false);
    expect(looksLikeTypo(1000, 10, Number.NaN)).toBe(false);
    expect(looksLikeTypo(1000, Number.NaN, 0.1)).toBe(false);
  });
});

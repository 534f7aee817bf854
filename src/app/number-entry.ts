/** The decimal separator a locale writes ("," for de-DE, "." for en-GB). */
export function decimalSeparatorFor(locale: string): ',' | '.' {
  const parts = new Intl.NumberFormat(locale).formatToParts(1.5);
  return parts.find((p) => p.type === 'decimal')?.value === ',' ? ',' : '.';
}

export type ParsedNumber = { ok: true; value: number } | { ok: false; message: string };

/**
 * Reads a typed value. Accepts the locale's separator and, to be forgiving with gauges that
 * type a point, the other one too when there is no ambiguity (one separator, no grouping).
 */
export function parseEntry(text: string, decimals: number): ParsedNumber {
  // Only surrounding spaces are dropped: "10 5" is two numbers, not 105.
  const t = text.trim().replace('−', '-');
  if (t === '' || t === '-') return { ok: false, message: 'Enter a value.' };
  if (!/^-?\d+([.,]\d+)?$/.test(t)) return { ok: false, message: `“${text}” is not a number.` };
  const value = Number(t.replace(',', '.'));
  if (!Number.isFinite(value)) return { ok: false, message: `“${text}” is not a number.` };
  const frac = t.split(/[.,]/)[1] ?? '';
  if (frac.length > decimals) {
    return { ok: false, message: `This gauge reads to ${decimals} decimal${decimals === 1 ? '' : 's'}; “${text}” has ${frac.length}.` };
  }
  return { ok: true, value };
}

export function formatValue(value: number, decimals: number, separator: ',' | '.'): string {
  const s = value.toFixed(decimals);
  return separator === ',' ? s.replace('.', ',') : s;
}

/**
 * Typo guard: a value more than `k` process sigmas from the centre is probably a slip of the
 * finger (a missing decimal point, a swapped digit). The operator confirms or corrects it.
 * k = 6 is our choice: far beyond the 3-sigma limits, so genuine signals rarely hit it.
 */
export function looksLikeTypo(value: number, centre: number, sigma: number, k = 6): boolean {
  if (!(sigma > 0) || !Number.isFinite(centre)) return false;
  return Math.abs(value - centre) > k * sigma;
}

import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { chiSquareCdf, chiSquareQuantile, lnGamma, normalCdf, normalPdf, normalQuantile } from '../../src/engine';

// Cross-check of the engine's own distribution functions against jStat 1.9.6 (an independent
// implementation, dev dependency only) and against published values.

describe('normal distribution', () => {
  it('agrees with jStat over −8..8', () => {
    for (let x = -8; x <= 8; x += 0.137) {
      expect(normalCdf(x)).toBeCloseTo(jStat.normal.cdf(x, 0, 1), 12);
      expect(normalPdf(x)).toBeCloseTo(jStat.normal.pdf(x, 0, 1), 14);
    }
  });

  it('keeps relative accuracy in the far tail (ppm of a 6-sigma process), where jStat does not', () => {
    // Φ(−x) = φ(x)·R(x), Mills' ratio by Laplace's continued fraction x+1/(x+2/(x+3/…)),
    // 400 terms evaluated backwards: computed from the definition, independent of both libraries.
    const tail = (x: number) => {
      let f = x;
      for (let k = 400; k >= 1; k--) f = x + k / f;
      return Math.exp(-0.5 * x * x) / Math.sqrt(2 * Math.PI) / f;
    };
    for (const x of [5, 6, 7, 8, 10, 20]) expect(Math.abs(normalCdf(-x) - tail(x)) / tail(x)).toBeLessThan(1e-8);
    expect(Math.abs(jStat.normal.cdf(-6, 0, 1) - tail(6)) / tail(6)).toBeLessThan(1e-8); // jStat too, down to 6σ
  });

  it('matches the published values', () => {
    // source: spc-reference §7 [C]; 2Φ(−3) = 0.0027 in Montgomery, Introduction to SQC, §5 (from memory)
    expect(normalCdf(-3)).toBeCloseTo(0.001349898, 9);
    expect(2 * normalCdf(-3)).toBeCloseTo(0.0026997961, 10);
  });

  it('quantile agrees with jStat and the published table', () => {
    for (let p = 0.0005; p < 1; p += 0.0137) expect(normalQuantile(p)).toBeCloseTo(jStat.normal.inv(p, 0, 1), 8);
    // source: standard normal quantiles, spc-reference §7 [C]
    const table: [number, number][] = [[0.9, 1.281552], [0.95, 1.644854], [0.975, 1.959964], [0.99, 2.326348], [0.995, 2.575829], [0.99865, 2.999977], [0.999, 3.090232], [0.9995, 3.290527]];
    for (const [p, z] of table) expect(normalQuantile(p)).toBeCloseTo(z, 6);
    expect(normalQuantile(1e-12)).toBeCloseTo(-7.034484, 5);
    expect(normalQuantile(0)).toBe(-Infinity);
    expect(normalQuantile(1.5)).toBeNaN();
  });
});

describe('chi-square distribution', () => {
  it('cdf agrees with jStat', () => {
    for (const df of [1, 2, 5, 9, 19, 49, 99, 124]) {
      for (let x = 0.05; x < 3 * df + 20; x += df / 7 + 0.3) expect(chiSquareCdf(x, df)).toBeCloseTo(jStat.chisquare.cdf(x, df), 10);
    }
  });

  it('quantile agrees with jStat and the published table', () => {
    for (const df of [1, 4, 19, 24, 99]) for (const q of [0.005, 0.025, 0.05, 0.5, 0.95, 0.975, 0.995]) expect(chiSquareQuantile(q, df)).toBeCloseTo(jStat.chisquare.inv(q, df), 6);
    // source: chi-square quantile table, spc-reference §7 [C]
    const table: [number, number, number, number, number][] = [
      [9, 2.7004, 3.3251, 16.919, 19.0228],
      [19, 8.9065, 10.117, 30.1435, 32.8523],
      [24, 12.4012, 13.8484, 36.415, 39.3641],
      [29, 16.0471, 17.7084, 42.557, 45.7223],
      [49, 31.5549, 33.9303, 66.3386, 70.2224],
      [99, 73.3611, 77.0463, 123.2252, 128.422],
    ];
    for (const [df, a, b, c, d] of table) {
      expect(chiSquareQuantile(0.025, df)).toBeCloseTo(a, 3);
      expect(chiSquareQuantile(0.05, df)).toBeCloseTo(b, 3);
      expect(chiSquareQuantile(0.95, df)).toBeCloseTo(c, 3);
      expect(chiSquareQuantile(0.975, df)).toBeCloseTo(d, 3);
    }
  });

  it('ln Γ agrees with jStat', () => {
    for (let x = 0.1; x < 200; x *= 1.37) expect(Math.abs(lnGamma(x) - jStat.gammaln(x))).toBeLessThan(1e-12 * Math.max(1, Math.abs(jStat.gammaln(x))));
  });
});

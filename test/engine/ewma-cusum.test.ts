import { describe, expect, it } from 'vitest';
import { analyze } from '../../src/engine';
import { CONCENTRATION, NIST_EWMA } from './fixtures/concentration';

const individuals = (xs: readonly number[]) => xs.map((x) => ({ values: [x] }));

describe('analyze() EWMA', () => {
  // source: NIST/SEMATECH e-Handbook of Statistical Methods §6.3.2.4: EWMA0 = 50, s = 2.0539,
  // λ = 0.3, k = 3; EWMA values and UCL 52.5884 / LCL 47.4115 as printed (the LCL is truncated, so
  // compared at ±1e-4). Time-varying limits computed from the definition (spc-reference §6.1 [C]).
  const printed = [50.6, 49.52, 50.56, 50.18, 50.16, 49.21, 49.75, 49.85, 50.26, 50.33, 50.11, 49.36, 49.52, 50.05, 49.38, 49.92, 50.73, 51.23, 51.94, 51.99];
  const phases = [{ start: 0, given: { centre: 50, sigma: 2.0539 } }];

  it('reproduces the NIST EWMA values and asymptotic limits, with no signal', () => {
    const a = analyze({ chart: 'ewma', subgroups: individuals(NIST_EWMA), phases, ewma: { lambda: 0.3, L: 3, limits: 'asymptotic' } });
    a.points.forEach((p, i) => {
      expect(Math.abs(p.value - printed[i]!)).toBeLessThanOrEqual(0.005 + 1e-9);
      expect(p.observed).toBe(NIST_EWMA[i]);
    });
    expect(Math.abs(a.points[0]!.ucl! - 52.5884)).toBeLessThanOrEqual(1e-4);
    expect(Math.abs(a.points[0]!.lcl! - 47.4115)).toBeLessThanOrEqual(1e-4);
    expect(a.points[19]!.ucl).toBe(a.points[0]!.ucl);
    expect(a.signals).toEqual([]);
  });

  it('narrows the exact time-varying limits towards the asymptote', () => {
    const a = analyze({ chart: 'ewma', subgroups: individuals(NIST_EWMA), phases, ewma: { lambda: 0.3, L: 3 } });
    [51.8485, 52.2564, 52.4314, 52.5127, 52.5516].forEach((u, i) => expect(a.points[i]!.ucl!).toBeCloseTo(u, 4));
    expect(a.points[19]!.ucl!).toBeCloseTo(52.588432, 4);
  });

  it('signals a sustained shift with rule "ewma"', () => {
    const xs = [...Array.from({ length: 10 }, () => 0), ...Array.from({ length: 10 }, () => 1.5)];
    const a = analyze({ chart: 'ewma', subgroups: individuals(xs), phases: [{ start: 0, given: { centre: 0, sigma: 1 } }], ewma: { lambda: 0.2, L: 3 } });
    const first = a.signals[0]!;
    expect(first).toMatchObject({ rule: 'ewma', side: 'above', explanation: 'EWMA above its upper control limit' });
    expect(first.index).toBeGreaterThanOrEqual(10);
  });
});

describe('analyze() tabular CUSUM', () => {
  // source: Montgomery & Runger, Applied Statistics and Probability for Engineers, 3rd ed.,
  // Example 16-6 and Table 16-8: μ0 = 99, K = 1, H = 10 (σ = 1 so k = 1, h = 10).
  const sH = [2.0, 0, 0, 0, 2.0, 0.5, 0, 0, 0, 0, 1.3, 0, 1.1, 0, 0, 0, 0.3, 1.7, 0, 1.0];
  const sL = [0, 3.2, 2.9, 2.5, 0, 0, 0, 0.3, 0, 0, 0, 0, 0, 0, 1.0, 2.3, 0, 0, 0.8, 0];

  it('reproduces the upper and lower sums of Table 16-8 and gives no signal', () => {
    const a = analyze({ chart: 'cusum', subgroups: individuals(CONCENTRATION), phases: [{ start: 0, given: { centre: 99, sigma: 1 } }], cusum: { k: 1, h: 10 } });
    a.points.forEach((p, i) => {
      expect(p.cusum!.upper).toBeCloseTo(sH[i]!, 9);
      expect(p.cusum!.lower).toBeCloseTo(sL[i]!, 9);
      expect(p.cusum!.limit).toBe(10);
      expect(p.value).toBe(CONCENTRATION[i]);
      expect(p.ucl).toBeNull();
    });
    expect(a.signals).toEqual([]);
  });

  it('signals above H and estimates when the shift began and the new mean', () => {
    // μ0 + K + C⁺/N⁺ (Montgomery, Introduction to SQC, §9.1, from memory): a 1.5σ step from point 5.
    const xs = [0, 0, 0, 0, 0, 1.5, 1.5, 1.5, 1.5, 1.5];
    const a = analyze({ chart: 'cusum', subgroups: individuals(xs), phases: [{ start: 0, given: { centre: 0, sigma: 1 } }], cusum: { k: 0.5, h: 4 } });
    expect(a.signals).toHaveLength(1);
    const s = a.signals[0]!;
    expect(s).toMatchObject({ rule: 'cusum', index: 9, side: 'above', shiftStart: 5 });
    expect(s.shiftEstimate!).toBeCloseTo(1.5, 12);
    expect(s.explanation).toBe('Upper CUSUM beyond its decision limit: the mean appears to have risen to about 1.5 since point 6');
  });

  it('signals a downward shift on the lower sum', () => {
    const xs = [0, 0, -2, -2, -2];
    const a = analyze({ chart: 'cusum', subgroups: individuals(xs), phases: [{ start: 0, given: { centre: 0, sigma: 1 } }], cusum: { k: 0.5, h: 4 } });
    expect(a.signals.map((s) => [s.index, s.side, s.shiftStart])).toEqual([[4, 'below', 2]]);
    expect(a.signals[0]!.shiftEstimate!).toBeCloseTo(-2, 12);
  });

  it('estimates μ0 and sigma from a baseline of subgroups (σ of the mean = σ/√n)', () => {
    const subgroups = [[1, 2, 3], [2, 3, 4], [1, 3, 2], [2, 2, 5]].map((values) => ({ values }));
    const a = analyze({ chart: 'cusum', subgroups, cusum: { k: 0.5, h: 5 } });
    expect(a.phases[0]!.sigmaMethod).toBe('r-bar');
    expect(a.points[0]!.sigma!).toBeCloseTo(a.phases[0]!.sigmaWithin! / Math.sqrt(3), 12);
  });
});

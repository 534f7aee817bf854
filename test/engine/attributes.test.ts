import { describe, expect, it } from 'vitest';
import { analyze } from '../../src/engine';
import { expectPrinted } from './fixtures/printed';

// source: NIST/SEMATECH e-Handbook of Statistical Methods, §6.3.3.2, p-chart example: 30 wafers of
// 50 chips (data from memory; p̄ = 0.2313 confirmed in published copies). Limits printed 0.4102 /
// 0.0524 (from memory); exact values computed from p̄ ± 3√(p̄(1−p̄)/n) (spc-reference §6.4 [C]).
const WAFERS = [
  0.24, 0.3, 0.16, 0.2, 0.08, 0.14, 0.32, 0.18, 0.28, 0.2, 0.1, 0.12, 0.34, 0.24, 0.44, 0.16, 0.2, 0.1, 0.26, 0.22, 0.4, 0.36, 0.48,
  0.3, 0.18, 0.24, 0.14, 0.26, 0.18, 0.12,
].map((p) => ({ count: Math.round(p * 50), size: 50 }));

describe('analyze() p chart', () => {
  const a = analyze({ chart: 'p', subgroups: WAFERS, rules: ['we1'] });
  it('reproduces the NIST limits and finds samples 15 and 23 above the UCL', () => {
    const p = a.points[0]!;
    expect(p.centre!).toBeCloseTo(0.231333, 6);
    expect(p.ucl!).toBeCloseTo(0.410239, 6);
    expect(p.lcl!).toBeCloseTo(0.052428, 6);
    expectPrinted(p.ucl, 0.4102, 4);
    expectPrinted(p.lcl, 0.0524, 4);
    expect(a.signals.map((s) => s.index + 1)).toEqual([15, 23]);
    expect(a.phases[0]!.sigmaMethod).toBe('binomial');
    expect(a.points[0]!.companion).toBeUndefined();
  });

  it('gives limits per point when the sample size varies', () => {
    const b = analyze({ chart: 'p', subgroups: [{ count: 10, size: 100 }, { count: 2, size: 25 }, { count: 30, size: 400 }] });
    const pbar = 42 / 525; // ΣD/Σn
    const half = (n: number) => 3 * Math.sqrt((pbar * (1 - pbar)) / n);
    expect(b.points[0]!.ucl!).toBeCloseTo(pbar + half(100), 12);
    expect(b.points[1]!.ucl!).toBeCloseTo(pbar + half(25), 12);
    expect(b.points[1]!.lcl).toBe(0); // truncated at zero
    expect(b.points[2]!.lcl!).toBeCloseTo(pbar - half(400), 12);
    expect(b.points[1]!.value).toBeCloseTo(0.08, 12);
  });
});

describe('analyze() np chart', () => {
  it('reproduces the NIST wafer data as counts', () => {
    // np̄ ± 3√(np̄(1−p̄)): CL 11.567, UCL 20.512, LCL 2.621 (spc-reference §6.4 [C])
    const a = analyze({ chart: 'np', subgroups: WAFERS });
    expect(a.points[0]!.centre!).toBeCloseTo(11.5667, 4);
    expect(a.points[0]!.ucl!).toBeCloseTo(20.512, 3);
    expect(a.points[0]!.lcl!).toBeCloseTo(2.621, 3);
    expect(a.points[14]!.value).toBe(22);
  });
});

describe('analyze() c chart', () => {
  it('uses c̄ ± 3√c̄ with the LCL truncated at zero', () => {
    // computed from the definition (Poisson basis: NIST/SEMATECH e-Handbook §6.3.3.1)
    const counts = [3, 5, 2, 4, 6, 1, 3, 4, 2, 5, 14];
    const a = analyze({ chart: 'c', subgroups: counts.map((count) => ({ count })), phases: [{ start: 0, baselineCount: 10 }], rules: ['we1'] });
    const cbar = 35 / 10;
    expect(a.points[0]!.centre!).toBeCloseTo(cbar, 12);
    expect(a.points[0]!.ucl!).toBeCloseTo(cbar + 3 * Math.sqrt(cbar), 12);
    expect(a.points[0]!.lcl).toBe(0);
    expect(a.signals.map((s) => [s.index, s.side])).toEqual([[10, 'above']]);
  });

  it('warns when the baseline has no defects', () => {
    const a = analyze({ chart: 'c', subgroups: [{ count: 0 }, { count: 0 }] });
    expect(a.warnings[0]).toMatch(/centre line is 0/);
    expect(a.points[0]!.ucl).toBeNull();
  });
});

describe('analyze() u chart', () => {
  it('gives ū ± 3√(ū/aᵢ) per point for varying inspection units', () => {
    const subgroups = [{ count: 12, size: 2 }, { count: 5, size: 1 }, { count: 20, size: 3.5 }];
    const a = analyze({ chart: 'u', subgroups });
    const ubar = 37 / 6.5; // Σc/Σa
    subgroups.forEach((s, i) => {
      expect(a.points[i]!.value).toBeCloseTo(s.count / s.size, 12);
      expect(a.points[i]!.ucl!).toBeCloseTo(ubar + 3 * Math.sqrt(ubar / s.size), 12);
      expect(a.points[i]!.sigma!).toBeCloseTo(Math.sqrt(ubar / s.size), 12);
    });
  });
});

import { describe, expect, it } from 'vitest';
import { analyze, chartConstants } from '../../src/engine';
import { expectPrinted } from './fixtures/printed';
import { PISTON_RINGS } from './fixtures/piston-rings';

const subgroups = PISTON_RINGS.map((values) => ({ values }));

describe('analyze() X̄-R', () => {
  // source: Montgomery, Introduction to SQC, Example 6.1 (piston rings, Table 6.3): x̿ = 74.001,
  // R̄ = 0.023, X̄ limits 73.988 / 74.014, R chart UCL 0.049, LCL 0 (from memory); the exact values
  // with full-precision A2, D4 are computed from the definition (spc-reference §6.6 [C]).
  const a = analyze({ chart: 'xbar-r', subgroups });
  const p0 = a.points[0]!;

  it('computes the grand mean and the limits of the book at its printed precision', () => {
    expectPrinted(p0.centre, 74.001, 3);
    expectPrinted(p0.lcl, 73.988, 3);
    expectPrinted(p0.ucl, 74.014, 3);
    expectPrinted(p0.companion?.centre, 0.023, 3);
    expectPrinted(p0.companion?.ucl, 0.049, 3);
    expect(p0.companion?.lcl).toBe(0);
  });

  it('computes the exact values with full-precision constants', () => {
    expect(p0.centre!).toBeCloseTo(74.001176, 6);
    expect(p0.companion!.centre!).toBeCloseTo(0.02324, 6);
    expect(p0.lcl!).toBeCloseTo(73.987771, 6);
    expect(p0.ucl!).toBeCloseTo(74.014581, 6);
    expect(p0.companion!.ucl!).toBeCloseTo(0.049141, 6);
    expect(a.phases[0]!.sigmaWithin!).toBeCloseTo(0.0099917, 7); // R̄/d2
    expect(a.phases[0]!.sigmaMethod).toBe('r-bar');
  });

  it('finds every subgroup in control (the book: "no indication of an out-of-control condition")', () => {
    expect(a.signals).toEqual([]);
    expect(a.warnings).toEqual([]);
    expect(a.phases[0]).toMatchObject({ baselineCount: 25, provisional: false, source: 'baseline', start: 0, end: 25 });
  });

  it('plots subgroup means and ranges', () => {
    expect(p0.value).toBeCloseTo((74.03 + 74.002 + 74.019 + 73.992 + 74.008) / 5, 12);
    expect(p0.companion!.value).toBeCloseTo(74.03 - 73.992, 12);
  });

  it('applies frozen baseline limits to later subgroups', () => {
    const later = [...subgroups, { values: [74.05, 74.06, 74.04, 74.05, 74.07] }];
    const b = analyze({ chart: 'xbar-r', subgroups: later, phases: [{ start: 0, baselineCount: 25 }] });
    expect(b.points[25]!.ucl).toBe(p0.ucl);
    expect(b.signals.map((s) => [s.rule, s.index, s.side])).toEqual([['we1', 25, 'above']]);
    expect(b.signals[0]!.explanation).toBe('1 point above the upper control limit');
  });
});

describe('analyze() X̄-R with unequal subgroup sizes', () => {
  it('estimates sigma as the mean of Rᵢ/d2(nᵢ) and sets limits per point', () => {
    // σ̂ = mean of Rᵢ/d2(nᵢ) (equals R̄/d2 when sizes are equal); limits x̿ ± 3σ̂/√nᵢ, R chart d2(nᵢ)σ̂ and D4-type limits.
    // Constants computed from their definitions (chartConstants).
    const groups = PISTON_RINGS.slice(0, 20).map((g, i) => g.slice(0, 2 + (i % 4)));
    const a = analyze({ chart: 'xbar-r', subgroups: groups.map((values) => ({ values })) });
    const sigma = groups.reduce((s, g) => s + (Math.max(...g) - Math.min(...g)) / chartConstants(g.length).d2, 0) / groups.length;
    expect(a.phases[0]!.sigmaWithin!).toBeCloseTo(sigma, 12);
    for (const i of [0, 1, 2, 3]) {
      const n = groups[i]!.length;
      const k = chartConstants(n);
      expect(a.points[i]!.ucl! - a.points[i]!.centre!).toBeCloseTo((3 * sigma) / Math.sqrt(n), 12);
      expect(a.points[i]!.companion!.centre!).toBeCloseTo(k.d2 * sigma, 12);
      expect(a.points[i]!.companion!.ucl!).toBeCloseTo((k.d2 + 3 * k.d3) * sigma, 12);
    }
  });
});

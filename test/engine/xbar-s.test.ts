import { describe, expect, it } from 'vitest';
import { analyze, c4 } from '../../src/engine';
import { expectPrinted } from './fixtures/printed';
import { PISTON_RINGS } from './fixtures/piston-rings';

describe('analyze() X̄-S', () => {
  // source: Montgomery, Introduction to SQC, Example 6.3 (piston rings, X̄ and s charts):
  // s̄ = 0.0094, X̄ limits 73.988 / 74.014, s UCL 0.0196, LCL 0 (from memory); exact values
  // with full-precision A3, B4 computed from the definition (spc-reference §6.6 [C]).
  const a = analyze({ chart: 'xbar-s', subgroups: PISTON_RINGS.map((values) => ({ values })) });
  const p0 = a.points[0]!;

  it('reproduces the book at its printed precision', () => {
    expectPrinted(p0.companion?.centre, 0.0094, 4);
    expectPrinted(p0.lcl, 73.988, 3);
    expectPrinted(p0.ucl, 74.014, 3);
    expectPrinted(p0.companion?.ucl, 0.0196, 4);
    expect(p0.companion?.lcl).toBe(0);
  });

  it('reproduces the exact values', () => {
    expect(p0.companion!.centre!).toBeCloseTo(0.0093995, 7);
    expect(p0.lcl!).toBeCloseTo(73.98776, 6);
    expect(p0.ucl!).toBeCloseTo(74.014592, 6);
    expect(p0.companion!.ucl!).toBeCloseTo(0.019635, 5);
    expect(a.phases[0]!.sigmaMethod).toBe('s-bar');
    expect(a.phases[0]!.sigmaWithin!).toBeCloseTo(0.0099996, 7); // s̄/c4
    expect(a.signals).toEqual([]);
  });

  it('uses the sample standard deviation (n − 1 divisor) as the plotted s', () => {
    const xs = PISTON_RINGS[0]!;
    const m = xs.reduce((s, x) => s + x, 0) / 5;
    const sd = Math.sqrt(xs.reduce((s, x) => s + (x - m) ** 2, 0) / 4);
    expect(p0.companion!.value!).toBeCloseTo(sd, 12);
  });
});

describe('analyze() X̄-S with unequal subgroup sizes', () => {
  // Drop values so sizes are 3, 4 or 5. Limits per point from the pooled s̄:
  // X̿ = Σnᵢx̄ᵢ/Σnᵢ, s̄ = √[Σ(nᵢ−1)sᵢ²/Σ(nᵢ−1)], X̿ ± A3(nᵢ)s̄, S: B3(nᵢ)s̄, B4(nᵢ)s̄.
  // source: Montgomery, Introduction to SQC, §6.3.2 (X̄ and s with variable sample size; from memory);
  // A3 = 3/(c4√n), B4 = 1 + 3√(1−c4²)/c4 computed from the definitions.
  const groups = PISTON_RINGS.map((g, i) => g.slice(0, 3 + (i % 3)));
  const a = analyze({ chart: 'xbar-s', subgroups: groups.map((values) => ({ values })) });

  let sumN = 0, sumNX = 0, ss = 0, dof = 0;
  for (const g of groups) {
    const n = g.length;
    const m = g.reduce((s, x) => s + x, 0) / n;
    sumN += n;
    sumNX += n * m;
    ss += g.reduce((s, x) => s + (x - m) ** 2, 0);
    dof += n - 1;
  }
  const grand = sumNX / sumN;
  const sbar = Math.sqrt(ss / dof);

  it('chooses the pooled estimate and gives limits per point', () => {
    expect(a.phases[0]!.sigmaMethod).toBe('pooled');
    for (const i of [0, 1, 2, 3]) {
      const n = groups[i]!.length;
      const k = c4(n);
      const A3 = 3 / (k * Math.sqrt(n));
      const B4 = 1 + (3 * Math.sqrt(1 - k * k)) / k;
      const p = a.points[i]!;
      expect(p.centre!).toBeCloseTo(grand, 10);
      expect(p.ucl!).toBeCloseTo(grand + A3 * sbar, 10);
      expect(p.lcl!).toBeCloseTo(grand - A3 * sbar, 10);
      expect(p.companion!.centre!).toBeCloseTo(sbar, 10);
      expect(p.companion!.ucl!).toBeCloseTo(B4 * sbar, 10);
    }
    expect(a.points[0]!.ucl! - a.points[0]!.centre!).toBeGreaterThan(a.points[2]!.ucl! - a.points[2]!.centre!);
  });

  it('reports sigma as s̄ₚ/c4(Σ(nᵢ−1)+1)', () => {
    expect(a.phases[0]!.sigmaWithin!).toBeCloseTo(sbar / c4(dof + 1), 12);
  });

  it('can be asked for s̄/c4 instead', () => {
    const b = analyze({ chart: 'xbar-s', subgroups: groups.map((values) => ({ values })), sigmaMethod: 's-bar' });
    const mean = groups.reduce((s, g) => {
      const m = g.reduce((t, x) => t + x, 0) / g.length;
      return s + Math.sqrt(g.reduce((t, x) => t + (x - m) ** 2, 0) / (g.length - 1)) / c4(g.length);
    }, 0) / groups.length;
    expect(b.phases[0]!.sigmaWithin!).toBeCloseTo(mean, 12);
  });
});

import { describe, expect, it } from 'vitest';
import { analyze, andersonDarling, bissellInterval, capabilityIndices, chiSquareInterval, cpm, expectedPpm } from '../../src/engine';
import { PISTON_RINGS } from './fixtures/piston-rings';

/** n values with exactly the given mean and sample standard deviation (a shape that is close to normal). */
function scaled(n: number, mean: number, sd: number): number[] {
  const raw = Array.from({ length: n }, (_, i) => Math.sin(i * 2.3) + Math.cos(i * 0.7));
  const m = raw.reduce((s, x) => s + x, 0) / n;
  const s = Math.sqrt(raw.reduce((t, x) => t + (x - m) ** 2, 0) / (n - 1));
  return raw.map((x) => mean + ((x - m) / s) * sd);
}

describe('capability via analyze()', () => {
  // source: Montgomery, Introduction to SQC, Example 8.x (piston rings, specification 74 ± 0.05):
  // σ̂ = R̄/d2 = 0.0099, Ĉp = 1.68 from the rounded σ̂ (from memory). Unrounded values computed from
  // the definitions (spc-reference §6.6 [C]): Cp 1.6681, Cpk 1.6288, Pp 1.6342, Ppk 1.5957.
  const a = analyze({ chart: 'xbar-r', subgroups: PISTON_RINGS.map((values) => ({ values })), spec: { lsl: 73.95, usl: 74.05 } });
  const c = a.capability!;

  it('reproduces the piston-ring indices', () => {
    expect(c.n).toBe(125);
    expect(c.sigmaWithin!).toBeCloseTo(0.0099917, 7);
    expect(c.sigmaWithinMethod).toBe('r-bar');
    expect(Math.abs(c.cp! - 1.68)).toBeLessThanOrEqual(0.015); // the book rounds σ̂ first
    expect(c.cp!).toBeCloseTo(1.6681, 4);
    expect(c.cpk!).toBeCloseTo(1.6288, 4);
    expect(c.sigmaOverall!).toBeCloseTo(0.0101989, 7);
    expect(c.pp!).toBeCloseTo(1.6342, 4);
    expect(c.ppk!).toBeCloseTo(1.5957, 4);
    expect(c.cpm).not.toBeNull();
  });

  it('has no stability caution when the chart is in control, and tests normality', () => {
    expect(c.cautions.some((t) => /signal/.test(t))).toBe(false);
    expect(c.normality!.pValue).toBeGreaterThan(0.05);
  });

  it('comes back with a caution when the period studied has signals', () => {
    const subgroups = [...PISTON_RINGS.map((values) => ({ values })), { values: [74.06, 74.07, 74.05, 74.06, 74.08] }];
    const b = analyze({ chart: 'xbar-r', subgroups, phases: [{ start: 0, baselineCount: 25 }], spec: { lsl: 73.95, usl: 74.05 } });
    expect(b.signals.length).toBeGreaterThan(0);
    expect(b.capability!.cautions[0]).toMatch(/^The period studied has 1 signal: the process is not shown to be stable/);
  });

  it('handles a one-sided specification: Cpk is the available side, Cp is null', () => {
    const b = analyze({ chart: 'xbar-r', subgroups: PISTON_RINGS.map((values) => ({ values })), spec: { usl: 74.05 } });
    expect(b.capability!.cp).toBeNull();
    expect(b.capability!.cpk).toBe(b.capability!.cpu);
    expect(b.capability!.cpl).toBeNull();
    expect(b.capability!.ppmWithin!.below).toBe(0);
  });

  it('gives the Cp and Cpk intervals of the published examples', () => {
    // source: Montgomery, Introduction to SQC, §8.3: USL 62, LSL 38, n = 20, s = 1.75 → Ĉp = 2.29,
    // 95% CI [1.57, 3.01] (from memory); exact [1.5649, 3.0056] computed from the chi-square definition [C].
    const b = analyze({ chart: 'xmr', subgroups: scaled(20, 50, 1.75).map((x) => ({ values: [x] })), spec: { lsl: 38, usl: 62 } });
    expect(b.capability!.pp!).toBeCloseTo(2.2857, 4);
    expect(b.capability!.ppInterval!.lower).toBeCloseTo(1.5649, 4);
    expect(b.capability!.ppInterval!.upper).toBeCloseTo(3.0056, 4);
    expect(b.capability!.cautions.some((t) => /Only 20 values/.test(t))).toBe(true);
  });

  it('studies the chosen phase', () => {
    const subgroups = [...PISTON_RINGS.map((values) => ({ values })), ...PISTON_RINGS.slice(0, 10).map((values) => ({ values: values.map((v) => v + 0.02) }))];
    const phases = [{ start: 0 }, { start: 25 }];
    const first = analyze({ chart: 'xbar-r', subgroups, phases, spec: { lsl: 73.95, usl: 74.05 }, capabilityPhase: 0 });
    expect(first.capability!.phase).toBe(0);
    expect(first.capability!.cp!).toBeCloseTo(1.6681, 4);
    const last = analyze({ chart: 'xbar-r', subgroups, phases, spec: { lsl: 73.95, usl: 74.05 } });
    expect(last.capability!.phase).toBe(1);
    expect(last.capability!.n).toBe(50);
    const none = analyze({ chart: 'xbar-r', subgroups, phases, spec: { lsl: 73.95, usl: 74.05 }, capabilityPhase: 5 });
    expect(none.capability).toBeUndefined();
    expect(none.warnings).toContain('Phase 6 has no data yet: capability not computed.');
  });

  it('rejects a specification with USL ≤ LSL', () => {
    expect(() => analyze({ chart: 'xmr', subgroups: [{ values: [1] }, { values: [2] }], spec: { lsl: 5, usl: 5 } })).toThrow(/must be above the lower/);
  });

  it('is not computed for attribute charts (with a warning)', () => {
    const b = analyze({ chart: 'c', subgroups: [{ count: 2 }, { count: 3 }], spec: { usl: 5 } });
    expect(b.capability).toBeUndefined();
    expect(b.warnings).toContain('Capability indices need measured values: not computed for an attribute chart.');
  });
});

describe('capability functions', () => {
  it('Bissell interval for Cpk', () => {
    // source: Bissell, "How reliable is your capability index?", Applied Statistics 39 (1990), as quoted
    // in Rodriguez, J. Quality Technology 24(4) 1992; values computed from the formula [C]; Montgomery
    // §8.3 prints [0.88, 1.78] for n = 20, Ĉpk = 1.33 (from memory).
    const a = bissellInterval(1.33, 20, 0.95)!;
    expect(a.lower).toBeCloseTo(0.8826, 4);
    expect(a.upper).toBeCloseTo(1.7774, 4);
    const b = bissellInterval(1.33, 50, 0.95)!;
    expect(b.lower).toBeCloseTo(1.0509, 4);
    expect(b.upper).toBeCloseTo(1.6091, 4);
    const c = bissellInterval(1.0, 100, 0.95)!;
    expect(c.lower).toBeCloseTo(0.8462, 4);
    expect(c.upper).toBeCloseTo(1.1538, 4);
    expect(bissellInterval(1.33, 50, 0.9)!.lower).toBeCloseTo(1.0958, 4); // one-sided 95% lower bound
  });

  it('chi-square interval for Cp', () => {
    // computed from the chi-square definition (spc-reference §5.3 [C])
    const a = chiSquareInterval(1.33, 50, 0.95)!;
    expect(a.lower).toBeCloseTo(1.0673, 4);
    expect(a.upper).toBeCloseTo(1.5922, 4);
    expect(chiSquareInterval(1.33, 50, 0.9)!.lower).toBeCloseTo(1.1067, 4);
  });

  it('off-centre process: indices, ppm split and Cpm', () => {
    // USL 20, LSL 8, μ 16, σ 2 (spc-reference §5.4, computed from the definitions [C])
    const k = capabilityIndices(16, 2, 8, 20);
    expect(k.potential!).toBeCloseTo(1, 12);
    expect(k.upper!).toBeCloseTo(0.6667, 4);
    expect(k.lower!).toBeCloseTo(1.3333, 4);
    expect(k.actual!).toBeCloseTo(0.6667, 4);
    const p = expectedPpm(16, 2, 8, 20)!;
    expect(p.total).toBeCloseTo(22781.8, 1);
    expect(p.above).toBeCloseTo(22750.1, 1);
    expect(p.below).toBeCloseTo(31.7, 1);
    expect(cpm(16, 2, 8, 20, 14)!).toBeCloseTo(0.70711, 5);
  });

  it('expected ppm for a centred process', () => {
    // 2Φ(−3Cp)·1e6 (spc-reference §5.2 [C]); Montgomery's PCR-vs-ppm table prints 66 ppm for 1.33 (from memory)
    const ppm = (cp: number) => expectedPpm(0, 1, -3 * cp, 3 * cp)!.total;
    expect(ppm(1)).toBeCloseTo(2699.8, 1);
    expect(ppm(1.33)).toBeCloseTo(66.07, 2);
    expect(ppm(4 / 3)).toBeCloseTo(63.34, 2);
    expect(ppm(1.5)).toBeCloseTo(6.795, 3);
    expect(ppm(2)).toBeCloseTo(0.001973, 6);
    // Six-sigma convention: Cp 2 with the mean 1.5σ off centre → 3.398 ppm
    expect(expectedPpm(1.5, 1, -6, 6)!.total).toBeCloseTo(3.398, 3);
  });
});

describe('andersonDarling()', () => {
  it('matches the definition of A² on a small sample', () => {
    const xs = [2.1, 3.4, 1.9, 5.6, 4.2, 3.3, 2.8, 3.9, 4.4, 3.0];
    const r = andersonDarling(xs)!;
    // recompute A² from the definition with an independent Φ (erf series)
    const n = xs.length;
    const m = xs.reduce((s, x) => s + x, 0) / n;
    const sd = Math.sqrt(xs.reduce((s, x) => s + (x - m) ** 2, 0) / (n - 1));
    const phi = (z: number) => {
      let sum = 0, term = z; // erf(z/√2) Taylor series
      const x = z / Math.SQRT2;
      term = x;
      for (let k = 0; k < 60; k++) {
        sum += term / (2 * k + 1);
        term *= (-x * x) / (k + 1);
      }
      return 0.5 * (1 + (2 / Math.sqrt(Math.PI)) * sum);
    };
    const z = xs.map((x) => (x - m) / sd).sort((a, b) => a - b);
    let s = 0;
    for (let i = 0; i < n; i++) s += (2 * i + 1) * (Math.log(phi(z[i]!)) + Math.log(1 - phi(z[n - 1 - i]!)));
    expect(r.a2).toBeCloseTo(-n - s / n, 10);
    expect(r.a2Adjusted).toBeCloseTo(r.a2 * (1 + 0.75 / n + 2.25 / (n * n)), 12);
  });

  it("gives the p-values of Stephens' critical points (0.631, 0.752, 1.035 at 10%, 5%, 1%)", () => {
    // source: D'Agostino & Stephens, Goodness-of-Fit Techniques (1986), Table 4.7 critical values
    // for the adjusted A*² (from memory); p from the Table 4.9 formulas.
    const pAt = (target: number) => {
      // build 40 values whose adjusted A² equals `target` by bisection on a skew parameter
      let lo = 0, hi = 3;
      for (let k = 0; k < 80; k++) {
        const mid = (lo + hi) / 2;
        const xs = Array.from({ length: 40 }, (_, i) => Math.exp(mid * qnorm((i + 0.5) / 40)));
        if (andersonDarling(xs)!.a2Adjusted < target) lo = mid;
        else hi = mid;
      }
      return andersonDarling(Array.from({ length: 40 }, (_, i) => Math.exp(lo * qnorm((i + 0.5) / 40))))!.pValue;
    };
    expect(pAt(0.631)).toBeCloseTo(0.1, 2);
    expect(pAt(0.752)).toBeCloseTo(0.05, 2);
    expect(pAt(1.035)).toBeCloseTo(0.01, 3);
  });

  it('rejects clearly non-normal data and needs 8 values', () => {
    const skewed = Array.from({ length: 50 }, (_, i) => Math.exp(3 * qnorm((i + 0.5) / 50)));
    expect(andersonDarling(skewed)!.pValue).toBeLessThan(0.001);
    expect(andersonDarling([1, 2, 3, 4, 5, 6, 7])).toBeNull();
  });
});

// Φ⁻¹ for building test shapes only (bisection on an erf series is enough here).
function qnorm(p: number): number {
  let lo = -8, hi = 8;
  for (let k = 0; k < 100; k++) {
    const mid = (lo + hi) / 2;
    const x = mid / Math.SQRT2;
    let sum = 0, term = x;
    for (let j = 0; j < 200 && Math.abs(term) > 1e-18; j++) {
      sum += term / (2 * j + 1);
      term *= (-x * x) / (j + 1);
    }
    const cdf = 0.5 * (1 + (2 / Math.sqrt(Math.PI)) * sum);
    if (cdf < p) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

import { describe, expect, it } from 'vitest';
import { analyze, normalCdf, type Signal } from '../../src/engine';
import { emptyLimits } from '../../src/engine/limits';
import { RuleEvaluator } from '../../src/engine/rules';
import { CusumSmoother, EwmaSmoother, SmoothedColumns, type Smoother } from '../../src/engine/smoothers';
import { seededNormal } from './fixtures/seeded-normal';

// Average run lengths (zero-state, known parameters, normal data, shift δ present from sample 1).
// Monte Carlo procedure as spc-reference §4.5: N independent runs with a fixed seed (20261202,
// chosen once, not tuned), each capped at 100×ARL; pass if |mean − ref| ≤ 4·SE with
// SE = SDRL/√N (SDRL from the reference where given, else the sample SD of the run lengths).
// The checks drive the engine's own rule evaluator and EWMA/CUSUM steppers.

const SEED = 20261202;

function meanRunLength(n: number, cap: number, run: (draw: () => number) => number): { mean: number; sd: number } {
  const draw = seededNormal(SEED);
  let sum = 0;
  let sumSq = 0;
  for (let r = 0; r < n; r++) {
    const len = Math.min(run(draw), cap);
    sum += len;
    sumSq += len * len;
  }
  const mean = sum / n;
  return { mean, sd: Math.sqrt((sumSq - n * mean * mean) / (n - 1)) };
}

function ruleRun(rules: ConstructorParameters<typeof RuleEvaluator>[0], shift: number, cap: number) {
  const ev = new RuleEvaluator(rules);
  const out: Signal[] = [];
  return (draw: () => number): number => {
    ev.reset();
    out.length = 0;
    for (let i = 0; i < cap; i++) {
      const z = draw() + shift;
      ev.push(i, z, z, out);
      if (out.length > 0) return i + 1;
    }
    return cap;
  };
}

function smootherRun(smoother: Smoother, shift: number, cap: number) {
  const lim = emptyLimits();
  lim.centre = 0;
  lim.sigma = 1;
  const cols = new SmoothedColumns();
  cols.reserve(cap);
  const out: Signal[] = [];
  return (draw: () => number): number => {
    smoother.reset(0);
    out.length = 0;
    for (let i = 0; i < cap; i++) {
      smoother.step(i, draw() + shift, lim, cols, out);
      if (out.length > 0) return i + 1;
    }
    return cap;
  };
}

function expectArl(result: { mean: number; sd: number }, ref: number, sdrl: number | null, n: number): void {
  if (process.env.ARL_VERBOSE) console.log(`ARL ${result.mean.toFixed(3)} (sd ${result.sd.toFixed(1)}) vs ${ref}`);
  const tolerance = (4 * (sdrl ?? result.sd)) / Math.sqrt(n);
  expect(Math.abs(result.mean - ref), `mean ${result.mean.toFixed(3)} vs ${ref} ± ${tolerance.toFixed(3)}`).toBeLessThanOrEqual(tolerance);
}

describe('ARL through analyze() (batch detector, end to end)', () => {
  it('Western Electric rules 1–4, δ = 0: 91.75 with N = 2,000 runs', () => {
    // Same reference as below (Champ & Woodall 1987; exact 91.7508 [C]); N reduced to 2,000 runs of
    // 2,000 points (cap ≈ 22×ARL, P(no signal) < 1e-9), so the 4·SE tolerance widens to 4·89.8/√2000.
    const draw = seededNormal(SEED + 1);
    const n = 2_000;
    let sum = 0;
    for (let r = 0; r < n; r++) {
      const xs = new Float64Array(2_000);
      for (let i = 0; i < xs.length; i++) xs[i] = 50 + 2 * draw();
      const a = analyze({ chart: 'xmr', individuals: xs, phases: [{ start: 0, given: { centre: 50, sigma: 2 } }], rules: ['we1', 'we2', 'we3', 'we4'] });
      const first = a.signals.find((s) => !s.companion);
      sum += first ? first.index + 1 : xs.length;
    }
    expect(Math.abs(sum / n - 91.75)).toBeLessThanOrEqual((4 * 89.8) / Math.sqrt(n));
  });
});

describe('Shewhart ARL, analytically', () => {
  // ARL = 1/p, p = 1 − Φ(3 − δ) + Φ(−3 − δ): computed from the definition (spc-reference §4.1 [C]);
  // ARL0 ≈ 370 as in Montgomery, Introduction to SQC, §6 (from memory).
  const arl = (d: number) => 1 / (1 - normalCdf(3 - d) + normalCdf(-3 - d));
  it.each([
    [0, 370.3983],
    [0.5, 155.2242],
    [1, 43.8947],
    [1.5, 14.9677],
    [2, 6.303],
    [3, 2.0],
  ])('δ = %f gives ARL %f', (d, ref) => expect(arl(d)).toBeCloseTo(ref, 3));
});

describe('Monte Carlo ARL of the engine', () => {
  it('Shewhart rule 1 alone, δ = 0: 370.40', () => {
    // source: computed from the definition, 1/(2Φ(−3)) (spc-reference §4.1, §4.5 [C])
    expectArl(meanRunLength(20_000, 37_000, ruleRun(['we1'], 0, 37_000)), 370.4, 369.9, 20_000);
  });

  it('Shewhart rule 1 alone, δ = 1: 43.89', () => {
    expectArl(meanRunLength(10_000, 4_400, ruleRun(['we1'], 1, 4_400)), 43.89, 43.4, 10_000);
  });

  it('Western Electric rules 1–4 combined, δ = 0: 91.75', () => {
    // source: Champ & Woodall, "Exact results for Shewhart control charts with supplementary runs
    // rules", Technometrics 29(4), 1987 (91.75, from memory); 91.7508 by exact Markov chain
    // (spc-reference §4.2 [C]); SDRL ≈ 89.8 (§4.5, Monte Carlo).
    expectArl(meanRunLength(20_000, 9_200, ruleRun(['we1', 'we2', 'we3', 'we4'], 0, 9_200)), 91.75, 89.8, 20_000);
  });

  it('Western Electric rules 1–4 combined, δ = 1: 9.222', () => {
    // source: exact Markov chain, spc-reference §4.2 [C]; SE from the sample SD of the run lengths
    expectArl(meanRunLength(10_000, 1_000, ruleRun(['we1', 'we2', 'we3', 'we4'], 1, 1_000)), 9.222, null, 10_000);
  });

  it('Nelson tests 1, 2, 5, 6 combined (9 in a row), δ = 0: 109.05', () => {
    // source: exact Markov chain with rule 4 = 9 points (spc-reference §4.2 [C]); SE from the sample SD
    expectArl(meanRunLength(10_000, 11_000, ruleRun(['n1', 'n2', 'n5', 'n6'], 0, 11_000)), 109.049, null, 10_000);
  });

  it('all 8 Nelson tests combined, δ = 0: 73.1', () => {
    // source: Monte Carlo reference, 100,000 runs, 73.1 ± 0.2 (spc-reference §4.2 [C]); the
    // reference's own ±0.2 is added to the tolerance.
    const r = meanRunLength(10_000, 7_400, ruleRun(['n1', 'n2', 'n3', 'n4', 'n5', 'n6', 'n7', 'n8'], 0, 7_400));
    expect(Math.abs(r.mean - 73.1)).toBeLessThanOrEqual((4 * r.sd) / Math.sqrt(10_000) + 0.2);
  });

  // source: Montgomery, Introduction to SQC, CUSUM chapter, ARL table for k = ½, h = 4 and 5
  // (168, 465, 8.38, 10.4; from memory); exact values by the integral equation (spc-reference §4.3 [C]).
  it('tabular CUSUM k = 0.5, h = 4, δ = 0: 167.68', () => {
    expectArl(meanRunLength(20_000, 16_800, smootherRun(new CusumSmoother(0.5, 4), 0, 16_800)), 167.68, 160, 20_000);
  });

  it('tabular CUSUM k = 0.5, h = 5, δ = 0: 465.44', () => {
    expectArl(meanRunLength(20_000, 46_600, smootherRun(new CusumSmoother(0.5, 5), 0, 46_600)), 465.44, 453, 20_000);
  });

  it('tabular CUSUM k = 0.5, h = 4, δ = 1: 8.383', () => {
    expectArl(meanRunLength(10_000, 1_000, smootherRun(new CusumSmoother(0.5, 4), 1, 1_000)), 8.383, 4.69, 10_000);
  });

  it('tabular CUSUM k = 0.5, h = 5, δ = 1: 10.376', () => {
    expectArl(meanRunLength(10_000, 1_100, smootherRun(new CusumSmoother(0.5, 5), 1, 1_100)), 10.376, 5.4, 10_000);
  });

  // source: Lucas & Saccucci, "Exponentially weighted moving average control schemes",
  // Technometrics 32(1), 1990, ARL table (500, 10.3, 10.5; from memory); values by Crowder's
  // integral equation (spc-reference §4.4 [C]). Asymptotic limits, as in the table.
  it('EWMA λ = 0.1, L = 2.814, δ = 0: 499.6', () => {
    expectArl(meanRunLength(20_000, 50_000, smootherRun(new EwmaSmoother(0.1, 2.814, true), 0, 50_000)), 499.6, 490, 20_000);
  });

  it('EWMA λ = 0.1, L = 2.814 with exact time-varying limits, δ = 0: 485.3', () => {
    // source: Monte Carlo reference, 200,000 runs, 485.3 ± 1.1 (spc-reference §4.4 [C]): the early
    // narrow limits signal sooner than the asymptotic table value; the reference's ±1.1 is added.
    const r = meanRunLength(20_000, 50_000, smootherRun(new EwmaSmoother(0.1, 2.814, false), 0, 50_000));
    expect(Math.abs(r.mean - 485.3)).toBeLessThanOrEqual((4 * r.sd) / Math.sqrt(20_000) + 1.1);
  });

  it('EWMA λ = 0.1, L = 2.814, δ = 1: 10.33', () => {
    expectArl(meanRunLength(10_000, 1_100, smootherRun(new EwmaSmoother(0.1, 2.814, true), 1, 1_100)), 10.33, 4.75, 10_000);
  });

  it('EWMA λ = 0.2, L = 2.962, δ = 1: 10.54', () => {
    expectArl(meanRunLength(10_000, 1_100, smootherRun(new EwmaSmoother(0.2, 2.962, true), 1, 1_100)), 10.54, 6.42, 10_000);
  });
});

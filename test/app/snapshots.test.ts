import { describe, expect, it } from 'vitest';
import { buildCharacteristicView } from '../../src/app/build-view';
import { snapshotSignals } from '../../src/app/snapshots';
import { SignalSnapshot } from '../../src/schema';
import { BASELINE, individuals, iso, makeCharacteristic, makePhase, T0 } from './helpers';

// XmR constants for n = 2, computed from the definition (spc-reference.md §1.1 [C]):
// d2(2) = 2/√π, d3(2) = √(2 − 4/π); E2 = 3/d2, D4 = 1 + 3·d3/d2.
// source: Montgomery, Introduction to Statistical Quality Control, individuals chart (X̄ ± 3·MR̄/d2; MR chart UCL = D4·MR̄) — from memory
const d2 = 2 / Math.sqrt(Math.PI);
const d3 = Math.sqrt(2 - 4 / Math.PI);
const E2 = 3 / d2;
const D4 = 1 + (3 * d3) / d2;

const mean = (xs: readonly number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
const movingRanges = (xs: readonly number[]) => xs.slice(1).map((x, i) => Math.abs(x - xs[i]!));

describe('snapshotSignals', () => {
  const ch = makeCharacteristic({ rules: ['we1'], baselineSize: 20 });
  const samples = individuals([...BASELINE, 11]); // the 21st point is far above the limits
  const view = buildCharacteristicView(ch, [makePhase({ number: 1, startsAt: iso(T0) })], samples, [], [], T0);
  const fired = view.analysis.signals.filter((s) => s.index === 20);

  it('the engine fires WE1 on the point and on its moving range', () => {
    expect(fired.map((s) => `${s.rule}${s.companion ? '-mr' : ''}`).sort()).toEqual(['we1', 'we1-mr']);
  });

  it('freezes the limits in force at the point (computed here from the baseline)', () => {
    const xbar = mean(BASELINE);
    const mrBar = mean(movingRanges(BASELINE));
    const snaps = snapshotSignals(fired.filter((s) => !s.companion), view.analysis, view.series);
    expect(snaps).toHaveLength(1);
    const s = snaps[0]!;
    expect(s.rule).toBe('we1');
    expect(s.explanation).toBe(fired.find((f) => !f.companion)!.explanation);
    expect(s.centre).toBeCloseTo(xbar, 10);
    expect(s.ucl).toBeCloseTo(xbar + E2 * mrBar, 10);
    expect(s.lcl).toBeCloseTo(xbar - E2 * mrBar, 10);
    expect(s.phaseId).toBe('ph-1');
    expect(s.sampleIds).toEqual([samples[20]!.id]);
  });

  it('a companion signal carries the moving-range limits and both samples of the range', () => {
    const mrBar = mean(movingRanges(BASELINE));
    const snaps = snapshotSignals(fired.filter((s) => s.companion), view.analysis, view.series);
    expect(snaps).toHaveLength(1);
    const s = snaps[0]!;
    expect(s.centre).toBeCloseTo(mrBar, 10);
    expect(s.ucl).toBeCloseTo(D4 * mrBar, 10);
    expect(s.lcl).toBe(0); // D3(2) = 0: no lower limit on the moving range
    expect(s.sampleIds).toEqual([samples[19]!.id, samples[20]!.id]);
  });

  it('every snapshot passes the schema the response is saved with', () => {
    for (const snap of snapshotSignals(fired, view.analysis, view.series)) {
      expect(SignalSnapshot.safeParse(snap).success).toBe(true);
    }
  });

  it('uses the limits of the point’s own phase, and names that phase', () => {
    const phases = [
      makePhase({ number: 1, startsAt: iso(T0) }),
      makePhase({ number: 2, startsAt: samples[20]!.takenAt, given: { centre: 12, sigma: 0.2 } }),
    ];
    const v = buildCharacteristicView(ch, phases, [...samples, ...individuals([13]).map((s) => ({ ...s, takenAt: iso(T0 + 21 * 3_600_000) }))], [], [], T0);
    const sig = v.analysis.signals.find((s) => s.index === 21 && !s.companion);
    expect(sig).toBeDefined();
    const [snap] = snapshotSignals([sig!], v.analysis, v.series);
    // Standard given: μ ± 3σ for individuals (common practice)
    expect(snap).toMatchObject({ phaseId: 'ph-2', centre: 12 });
    expect(snap!.ucl).toBeCloseTo(12.6, 12);
    expect(snap!.lcl).toBeCloseTo(11.4, 12);
  });

  it('leaves phaseId out when the characteristic has no phase records', () => {
    const v = buildCharacteristicView(ch, [], samples, [], [], T0);
    const sig = v.analysis.signals.find((s) => s.index === 20 && !s.companion)!;
    const [snap] = snapshotSignals([sig], v.analysis, v.series);
    expect(snap).not.toHaveProperty('phaseId');
    expect(SignalSnapshot.safeParse(snap).success).toBe(true);
  });
});

describe('snapshotSignals on an EWMA characteristic', () => {
  // EWMA: zᵢ = λxᵢ + (1 − λ)zᵢ₋₁ with z₀ = μ₀; exact limits μ₀ ± Lσ√(λ/(2 − λ)·(1 − (1 − λ)^{2i})).
  // source: S. W. Roberts, "Control chart tests based on geometric moving averages", Technometrics 1(3), 1959;
  // Montgomery, Introduction to Statistical Quality Control, EWMA chapter — from memory. σ = MR̄/d2(2) as above.
  const ch = makeCharacteristic({ chartType: 'ewma', ewma: { lambda: 0.2, L: 2.962 } });
  const shifted = [10.1, 10.12, 10.1, 10.15, 10.12, 10.1];
  const samples = individuals([...BASELINE, ...shifted]);
  const view = buildCharacteristicView(ch, [], samples, [], [], T0);

  it('the first EWMA signal carries the EWMA limit at that point, computed here from the definition', () => {
    const mu = mean(BASELINE);
    const sigma = mean(movingRanges(BASELINE)) / d2;
    const { lambda, L } = { lambda: 0.2, L: 2.962 };
    let z = mu;
    const ucl: number[] = [];
    const zs: number[] = [];
    [...BASELINE, ...shifted].forEach((x, k) => {
      z = lambda * x + (1 - lambda) * z;
      zs.push(z);
      ucl.push(mu + L * sigma * Math.sqrt((lambda / (2 - lambda)) * (1 - (1 - lambda) ** (2 * (k + 1)))));
    });
    const firstAbove = zs.findIndex((v, k) => v > ucl[k]!);
    const first = view.analysis.signals.find((s) => s.rule === 'ewma')!;
    expect(first.index).toBe(firstAbove);
    const [snap] = snapshotSignals([first], view.analysis, view.series);
    expect(snap!.rule).toBe('ewma');
    expect(snap!.centre).toBeCloseTo(mu, 10);
    expect(snap!.ucl).toBeCloseTo(ucl[firstAbove]!, 10);
    expect(snap!.sampleIds).toEqual([samples[firstAbove]!.id]);
    expect(SignalSnapshot.safeParse(snap).success).toBe(true);
  });
});

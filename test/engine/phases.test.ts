import { describe, expect, it } from 'vitest';
import { analyze, chartConstants } from '../../src/engine';
import { CONCENTRATION } from './fixtures/concentration';

const individuals = (xs: readonly number[]) => xs.map((x) => ({ values: [x] }));
const mean = (xs: readonly number[]) => xs.reduce((s, x) => s + x, 0) / xs.length;
const mrBar = (xs: readonly number[]) => mean(xs.slice(1).map((x, i) => Math.abs(x - xs[i]!)));
const d2 = chartConstants(2).d2;

describe('phases', () => {
  it('freezes limits from the first k subgroups and applies them to later points', () => {
    const a = analyze({ chart: 'xmr', subgroups: individuals(CONCENTRATION), phases: [{ start: 0, baselineCount: 10 }] });
    const base = CONCENTRATION.slice(0, 10);
    const sigma = mrBar(base) / d2;
    expect(a.points[15]!.centre!).toBeCloseTo(mean(base), 12);
    expect(a.points[15]!.ucl!).toBeCloseTo(mean(base) + 3 * sigma, 12);
    expect(a.phases[0]).toMatchObject({ baselineCount: 10, baselineStart: 0, provisional: true, source: 'baseline', end: 20 });
  });

  it('takes the baseline from a chosen range', () => {
    const a = analyze({ chart: 'xmr', subgroups: individuals(CONCENTRATION), phases: [{ start: 0, baselineStart: 5, baselineCount: 8 }] });
    expect(a.points[0]!.centre!).toBeCloseTo(mean(CONCENTRATION.slice(5, 13)), 12);
    expect(a.phases[0]!.baselineStart).toBe(5);
  });

  it('uses given limits: centre and sigma of individual values', () => {
    const a = analyze({ chart: 'xbar-r', subgroups: [{ values: [10, 11, 12, 13] }], phases: [{ start: 0, given: { centre: 10, sigma: 2 } }] });
    const p = a.points[0]!;
    expect(p.centre).toBe(10);
    expect(p.ucl!).toBeCloseTo(10 + (3 * 2) / 2, 12); // μ + 3σ/√n
    const k = chartConstants(4);
    expect(p.companion!.centre!).toBeCloseTo(k.d2 * 2, 12); // R chart centre d2σ (standard given)
    expect(p.companion!.ucl!).toBeCloseTo((k.d2 + 3 * k.d3) * 2, 12); // D2σ
    expect(a.phases[0]).toMatchObject({ source: 'given', sigmaMethod: 'given', provisional: false, baselineCount: 0, sigmaWithin: 2 });
  });

  it('starts a new phase with its own baseline after a documented change', () => {
    const before = [10, 11, 9, 10, 12, 10, 11, 9];
    const after = [20, 21, 19, 22, 20, 21];
    const a = analyze({ chart: 'xmr', subgroups: individuals([...before, ...after]), phases: [{ start: 0 }, { start: 8, reason: 'new fixture' }] });
    expect(a.phases).toHaveLength(2);
    expect(a.phases[1]).toMatchObject({ index: 1, start: 8, end: 14, reason: 'new fixture', baselineCount: 6 });
    expect(a.points[8]!.centre!).toBeCloseTo(mean(after), 12);
    expect(a.points[8]!.phase).toBe(1);
    expect(a.points[8]!.companion!.value).toBeNull(); // no moving range across the phase boundary
    expect(a.phases[1]!.sigmaWithin!).toBeCloseTo(mrBar(after) / d2, 12);
    expect(a.signals).toEqual([]);
  });

  it('leaves excluded points out of the limits but still plots and tests them', () => {
    const xs = [10, 11, 9, 10, 30, 10, 11, 9, 10, 11];
    const subgroups = xs.map((x, i) => (i === 4 ? { values: [x], excluded: true, exclusionReason: 'gauge dropped' } : { values: [x] }));
    const a = analyze({ chart: 'xmr', subgroups, rules: ['we1'] });
    const kept = xs.filter((_, i) => i !== 4);
    // Moving ranges touching the excluded point are dropped: |11−9|, … but not |10−30| or |30−10|.
    const mrs = [1, 2, 1, 1, 2, 1, 1];
    expect(a.points[0]!.centre!).toBeCloseTo(mean(kept), 12);
    expect(a.phases[0]!.sigmaWithin!).toBeCloseTo(mean(mrs) / d2, 12);
    expect(a.phases[0]!.baselineCount).toBe(9);
    expect(a.points[4]).toMatchObject({ excluded: true, exclusionReason: 'gauge dropped', value: 30 });
    expect(a.signals.filter((s) => !s.companion).map((s) => s.index)).toEqual([4]);
  });

  it('marks limits provisional below 20 baseline subgroups (common practice), not at 20', () => {
    const xs = Array.from({ length: 20 }, (_, i) => 10 + ((i * 7) % 5));
    expect(analyze({ chart: 'xmr', subgroups: individuals(xs.slice(0, 19)) }).phases[0]!.provisional).toBe(true);
    expect(analyze({ chart: 'xmr', subgroups: individuals(xs) }).phases[0]!.provisional).toBe(false);
  });

  it('rejects a phase layout that is out of order or a baseline outside its phase', () => {
    expect(() => analyze({ chart: 'xmr', subgroups: [], phases: [{ start: 0 }, { start: 0 }] })).toThrow(/not after phase 0/);
    expect(() => analyze({ chart: 'xmr', subgroups: [], phases: [{ start: 0, baselineStart: 5 }, { start: 3 }] })).toThrow(/baseline must start inside the phase/);
    expect(() => analyze({ chart: 'xmr', subgroups: [], phases: [{ start: 0, given: { centre: 1, sigma: -1 } }] })).toThrow(/sigma must be a positive/);
  });
});

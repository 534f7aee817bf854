import { describe, expect, it } from 'vitest';
import { analyze } from '../../src/engine';
import { CONCENTRATION, NIST_EWMA } from './fixtures/concentration';

const individuals = (xs: readonly number[]) => xs.map((x) => ({ values: [x] }));

describe('analyze() XmR', () => {
  // Check values computed from the definitions (X̄ ± 3·MR̄/d2(2), MR UCL = D4(2)·MR̄ with exact
  // constants) on published data sets (spc-reference §6.7 [C]). Data: Montgomery & Runger,
  // Applied Statistics and Probability for Engineers, 3rd ed., Table 16-7; NIST/SEMATECH e-Handbook §6.3.2.4.
  const cases = [
    { name: 'concentration', data: CONCENTRATION, mean: 99.095, mrBar: 2.589474, sigma: 2.294861, lcl: 92.210416, ucl: 105.979584, mrUcl: 8.458598, medLcl: 90.917807, medUcl: 107.272193 },
    { name: 'NIST EWMA data', data: NIST_EWMA, mean: 50.465, mrBar: 2.268421, sigma: 2.010336, lcl: 44.433993, ucl: 56.496007, mrUcl: 7.40987, medLcl: 45.747389, medUcl: 55.182611 },
  ];
  for (const c of cases) {
    it(`reproduces the ${c.name} limits`, () => {
      const a = analyze({ chart: 'xmr', subgroups: individuals(c.data) });
      const p = a.points[5]!;
      expect(p.centre!).toBeCloseTo(c.mean, 6);
      expect(a.phases[0]!.sigmaWithin!).toBeCloseTo(c.sigma, 6);
      expect(p.lcl!).toBeCloseTo(c.lcl, 5);
      expect(p.ucl!).toBeCloseTo(c.ucl, 5);
      expect(p.companion!.centre!).toBeCloseTo(c.mrBar, 6);
      expect(p.companion!.ucl!).toBeCloseTo(c.mrUcl, 5);
      expect(p.companion!.lcl).toBe(0);
      expect(a.points[0]!.companion!.value).toBeNull(); // no moving range for the first point
      expect(a.points[1]!.companion!.value).toBeCloseTo(Math.abs(c.data[1]! - c.data[0]!), 12);
    });

    it(`reproduces the ${c.name} median moving-range limits`, () => {
      const a = analyze({ chart: 'xmr', subgroups: individuals(c.data), sigmaMethod: 'mr-median' });
      const p = a.points[0]!;
      expect(p.lcl!).toBeCloseTo(c.medLcl, 5);
      expect(p.ucl!).toBeCloseTo(c.medUcl, 5);
      expect(a.phases[0]!.sigmaMethod).toBe('mr-median');
    });
  }

  it('agrees with the printed 2.66 factor to about 1e-3', () => {
    // source: Wheeler & Chambers, Understanding SPC: X̄ ± 2.66·MR̄ (from memory); spc-reference §6.7
    const a = analyze({ chart: 'xmr', subgroups: individuals(CONCENTRATION) });
    expect(Math.abs(a.points[0]!.ucl! - 105.983)).toBeLessThan(5e-3);
    expect(Math.abs(a.points[0]!.lcl! - 92.207)).toBeLessThan(5e-3);
  });

  it('uses median MR × 3.86413 for the moving-range UCL in the median variant', () => {
    // source: computed from the definition, (d2 + 3d3)/0.953873 = 3.86413 [C]; printed 3.865 (Wheeler, from memory)
    const a = analyze({ chart: 'xmr', subgroups: individuals(CONCENTRATION), sigmaMethod: 'mr-median' });
    expect(a.points[0]!.companion!.ucl!).toBeCloseTo(3.86413 * 2.6, 4);
    expect(a.points[0]!.companion!.centre!).toBeCloseTo(2.6, 10);
  });

  it('flags a moving range above its limit on the companion chart', () => {
    const data = [10, 10.2, 9.9, 10.1, 10, 9.8, 10.1, 10, 10.2, 9.9, 14];
    const a = analyze({ chart: 'xmr', subgroups: individuals(data), phases: [{ start: 0, baselineCount: 10 }] });
    const mr = a.signals.find((s) => s.companion);
    expect(mr).toMatchObject({ rule: 'we1', index: 10, points: [9, 10], side: 'above', explanation: 'The moving range is above its upper control limit' });
  });
});

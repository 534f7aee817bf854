import { describe, expect, it } from 'vitest';
import { buildCharacteristicView } from '../../src/app/build-view';
import { capabilityUnavailable, histogram, studyCapability } from '../../src/app/capability-study';
import { BASELINE, individuals, makeCharacteristic, T0 } from './helpers';

describe('histogram()', () => {
  it('covers the values and the specification limits with about √n equal bins that hold every value', () => {
    const values = Array.from({ length: 100 }, (_, i) => 10 + ((i * 37) % 100) / 100);
    const bins = histogram(values, 9.5, 11.5);
    expect(bins).toHaveLength(10); // √100 (common practice for a first look)
    expect(bins[0]!.from).toBe(9.5);
    expect(bins[bins.length - 1]!.to).toBeCloseTo(11.5, 12);
    expect(bins.reduce((n, b) => n + b.count, 0)).toBe(100);
  });

  it('with the gauge resolution, bins are whole steps wide and readings fall inside them, never on an edge', () => {
    const values = Array.from({ length: 900 }, (_, i) => Math.round((25 + ((i * 7919) % 17) * 0.001 - 0.008) * 1000) / 1000);
    const bins = histogram(values, 24.985, 25.015, 0.001);
    for (const b of bins) {
      const steps = (b.to - b.from) / 0.001;
      expect(Math.abs(steps - Math.round(steps))).toBeLessThan(1e-6);
    }
    for (const v of values) expect(bins.some((b) => Math.abs(v - b.from) < 1e-9)).toBe(false);
    expect(bins.reduce((n, b) => n + b.count, 0)).toBe(900);
    expect(bins[0]!.from).toBeLessThanOrEqual(24.985);
    expect(bins[bins.length - 1]!.to).toBeGreaterThanOrEqual(25.015);
  });

  it('keeps between 6 and 30 bins and copes with constant data', () => {
    expect(histogram([1, 1, 1])).toHaveLength(6);
    expect(histogram([1, 1, 1]).reduce((n, b) => n + b.count, 0)).toBe(3);
    expect(histogram(Array.from({ length: 10_000 }, (_, i) => i))).toHaveLength(30);
  });
});

describe('studyCapability()', () => {
  it('says why no study can be made for a counted characteristic or one with no specification', () => {
    const counted = buildCharacteristicView(makeCharacteristic({ chartType: 'c' }), [], [], [], [], T0);
    expect(capabilityUnavailable(counted)).toMatch(/counted/);
    const noSpec = buildCharacteristicView(makeCharacteristic({ spec: {} }), [], individuals(BASELINE), [], [], T0);
    expect(capabilityUnavailable(noSpec)).toMatch(/no specification/);
  });

  it('gives Cp = (USL − LSL) / 6σ with σ = MR̄/d2(2) over the phase', () => {
    const ch = makeCharacteristic({ spec: { lsl: 9.4, usl: 10.6 } });
    const view = buildCharacteristicView(ch, [], individuals(BASELINE), [], [], T0);
    const study = studyCapability(view)!;
    // d2(2) = 2/√π (computed from the definition of the expected range of two normal values; spc-reference §1.1).
    const mr = BASELINE.slice(1).map((v, i) => Math.abs(v - BASELINE[i]!));
    const sigma = mr.reduce((a, b) => a + b, 0) / mr.length / (2 / Math.sqrt(Math.PI));
    expect(study.capability.cp).toBeCloseTo(1.2 / (6 * sigma), 10);
    expect(study.values).toEqual(BASELINE);
    expect(study.bins.reduce((n, b) => n + b.count, 0)).toBe(BASELINE.length);
  });

  it('comes with a caution when the phase studied has signals', () => {
    const ch = makeCharacteristic({ spec: { lsl: 9, usl: 12 } });
    const view = buildCharacteristicView(ch, [], individuals([...BASELINE, 11, 11.1, 11.2]), [], [], T0);
    const study = studyCapability(view)!;
    expect(study.capability.cautions.join(' ')).toMatch(/signal/i);
  });
});

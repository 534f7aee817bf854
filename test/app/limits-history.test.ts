import { describe, expect, it } from 'vitest';
import { buildCharacteristicView } from '../../src/app/build-view';
import { limitsHistory } from '../../src/app/limits-history';
import { PISTON_RINGS } from '../engine/fixtures/piston-rings';
import { BASELINE, individuals, makeCharacteristic, makePhase, sampleAt, T0, iso } from './helpers';

const HOUR = 3_600_000;

describe('limitsHistory()', () => {
  // source: Montgomery, Introduction to Statistical Quality Control, piston-ring data (Table 6.3) and its X̄-R example:
  // x̿ = 74.001, R̄ = 0.023, limits 73.988 and 74.014 as printed (from memory); the check values below are
  // computed from the definitions with exact constants (spc-reference.md §6.6): x̿ 74.001176, limits
  // 73.987771 / 74.014581, σ̂ = R̄/d2 = 0.0099917.
  it('lists the piston-ring X̄-R limits of phase 1, then a phase with given limits and the change between them', () => {
    const ch = makeCharacteristic({ chartType: 'xbar-r', subgroupSize: 5, decimals: 3, baselineSize: 25, spec: {} });
    const rings = PISTON_RINGS.map((values, i) => sampleAt(i * 60, { values: [...values] }));
    const later = [0, 1, 2, 3, 4].map((i) => sampleAt((25 + i) * 60, { values: [74.0, 74.01, 73.99, 74.0, 74.005] }));
    const phases = [
      makePhase({ number: 1, startsAt: iso(T0), reason: 'Trial limits' }),
      makePhase({ number: 2, startsAt: iso(T0 + 25 * HOUR), reason: 'Bore honing changed', given: { centre: 74.0, sigma: 0.008 } }),
    ];
    const view = buildCharacteristicView(ch, phases, [...rings, ...later], [], [], T0 + 40 * HOUR);
    const [first, second] = limitsHistory(view.analysis, view.series, phases);

    expect(first).toMatchObject({ number: 1, reason: 'Trial limits', source: 'baseline', baselineCount: 25, provisional: false, points: 25, signalPoints: 0, sigmaMethod: 'r-bar' });
    expect(first!.centre).toBeCloseTo(74.001176, 6);
    expect(first!.ucl).toBeCloseTo(74.014581, 5);
    expect(first!.lcl).toBeCloseTo(73.987771, 5);
    expect(first!.sigma).toBeCloseTo(0.0099917, 6);
    // Printed to the book's 3 decimals.
    expect(first!.ucl!.toFixed(3)).toBe('74.015'); // 74.014581 rounds up; the book's 74.014 comes from the rounded x̿ = 74.001 and R̄ = 0.023: 74.001 + 0.577·0.023 (from memory)
    expect(first!.lcl!.toFixed(3)).toBe('73.988');

    // Given limits: centre 74.0, sigma 0.008 of individuals → X̄ limits 74 ± 3·0.008/√5 (computed from the definition).
    expect(second).toMatchObject({ number: 2, reason: 'Bore honing changed', source: 'given', baselineCount: 0, provisional: false, points: 5, sigmaMethod: 'given' });
    expect(second!.centre).toBeCloseTo(74.0, 9);
    expect(second!.ucl).toBeCloseTo(74 + (3 * 0.008) / Math.sqrt(5), 9);
    expect(second!.change!.centre).toBeCloseTo(74.0 - 74.001176, 6);
    expect(second!.change!.sigmaRatio).toBeCloseTo(0.008 / 0.0099917, 4);
    expect(second!.firstPointAt).toBe(later[0]!.takenAt);
  });

  it('marks a short baseline provisional and counts the points at which rules fired', () => {
    const ch = makeCharacteristic({ rules: ['we1'], baselineSize: 20 });
    const samples = individuals([...BASELINE, 10, 10.05, 9.95, 10, 10.6, 10.7]);
    const phases = [makePhase({ number: 1, startsAt: iso(T0) }), makePhase({ number: 2, startsAt: samples[20]!.takenAt, reason: 'New fixture', baselineCount: 5 })];
    const view = buildCharacteristicView(ch, phases, samples, [], [], T0);
    const rows = limitsHistory(view.analysis, view.series, phases);
    expect(rows.map((r) => [r.number, r.baselineCount, r.provisional, r.points])).toEqual([[1, 20, false, 20], [2, 5, true, 6]]);
    expect(rows[1]!.signalPoints).toBeGreaterThanOrEqual(1); // 10.7 is far beyond the limits of a phase centred on 10 with a small sigma
  });

  it('gives one row with a default reason when no phase was ever written down', () => {
    const ch = makeCharacteristic();
    const view = buildCharacteristicView(ch, [], individuals(BASELINE), [], [], T0);
    const rows = limitsHistory(view.analysis, view.series, []);
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ number: 1, reason: 'Limits as first set up', source: 'baseline', points: 20 });
    expect(rows[0]!.change).toBeUndefined();
  });
});

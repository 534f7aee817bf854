import { describe, expect, it } from 'vitest';
import { c4, chartConstants, MEDIAN_MR_FACTOR } from '../../src/engine';
import { rangeMoments } from '../../src/engine/constants';

// Exact constants to 5 decimals, n = 2..25: d2, d3, c4, A2, A3, B3, B4, D3, D4, E2.
// source: computed from the definitions (d2 = E[W], d3 = SD[W] for the range W of n standard
// normals; c4 from the gamma function) with scipy, as tabulated in spc-reference.md §1.2 [C];
// these agree with the printed factor table in Montgomery, Introduction to SQC, Appendix VI, and
// ASTM MNL7 at their printed precision except for the rounding-edge entries checked below.
const EXACT: Record<number, readonly number[]> = {
  2: [1.12838, 0.8525, 0.79788, 1.87997, 2.65868, 0, 3.26653, 0, 3.26653, 2.65868],
  3: [1.69257, 0.88837, 0.88623, 1.02333, 1.95441, 0, 2.56817, 0, 2.57459, 1.77245],
  4: [2.05875, 0.87981, 0.92132, 0.7286, 1.6281, 0, 2.26605, 0, 2.28205, 1.45719],
  5: [2.32593, 0.86408, 0.93999, 0.57682, 1.4273, 0, 2.089, 0, 2.1145, 1.28981],
  6: [2.53441, 0.84804, 0.95153, 0.48325, 1.28713, 0.03036, 1.96964, 0, 2.00383, 1.18371],
  7: [2.70436, 0.83321, 0.95937, 0.41928, 1.18192, 0.11769, 1.88231, 0.07571, 1.92429, 1.10932],
  8: [2.8472, 0.81983, 0.96503, 0.37253, 1.0991, 0.18509, 1.81491, 0.13617, 1.86383, 1.05367],
  9: [2.97003, 0.80783, 0.96931, 0.3367, 1.03166, 0.23913, 1.76087, 0.18401, 1.81599, 1.01009],
  10: [3.07751, 0.79705, 0.97266, 0.30826, 0.97535, 0.28371, 1.71629, 0.22302, 1.77698, 0.97482],
  11: [3.17287, 0.78731, 0.97535, 0.28508, 0.92739, 0.32128, 1.67872, 0.25558, 1.74442, 0.94552],
  12: [3.25846, 0.77848, 0.97756, 0.26578, 0.88591, 0.35351, 1.64649, 0.28327, 1.71673, 0.92068],
  13: [3.33598, 0.77042, 0.97941, 0.24942, 0.84955, 0.38156, 1.61844, 0.30718, 1.69282, 0.89929],
  14: [3.40676, 0.76302, 0.98097, 0.23535, 0.81734, 0.40625, 1.59375, 0.32808, 1.67192, 0.8806],
  15: [3.47183, 0.75621, 0.98232, 0.22311, 0.78854, 0.4282, 1.5718, 0.34656, 1.65344, 0.8641],
  16: [3.53198, 0.74991, 0.98348, 0.21235, 0.7626, 0.44789, 1.55211, 0.36304, 1.63696, 0.84938],
  17: [3.58788, 0.74405, 0.98451, 0.2028, 0.73906, 0.46568, 1.53432, 0.37786, 1.62214, 0.83615],
  18: [3.64006, 0.73859, 0.98541, 0.19426, 0.71758, 0.48185, 1.51815, 0.39128, 1.60872, 0.82416],
  19: [3.68896, 0.73348, 0.98621, 0.18657, 0.69787, 0.49664, 1.50336, 0.40351, 1.59649, 0.81324],
  20: [3.73495, 0.72869, 0.98693, 0.17961, 0.6797, 0.51023, 1.48977, 0.4147, 1.5853, 0.80322],
  21: [3.77834, 0.72417, 0.98758, 0.17327, 0.66288, 0.52278, 1.47722, 0.42501, 1.57499, 0.794],
  22: [3.81938, 0.71991, 0.98817, 0.16746, 0.64726, 0.53441, 1.46559, 0.43453, 1.56547, 0.78547],
  23: [3.85832, 0.71589, 0.9887, 0.16213, 0.63269, 0.54523, 1.45477, 0.44337, 1.55663, 0.77754],
  24: [3.89535, 0.71207, 0.98919, 0.15721, 0.61906, 0.55533, 1.44467, 0.4516, 1.5484, 0.77015],
  25: [3.93063, 0.70844, 0.98964, 0.15265, 0.60628, 0.56479, 1.43521, 0.45929, 1.54071, 0.76324],
};
const NAMES = ['d2', 'd3', 'c4', 'A2', 'A3', 'B3', 'B4', 'D3', 'D4', 'E2'] as const;

describe('chartConstants()', () => {
  for (let n = 2; n <= 25; n++) {
    it(`n = ${n} matches the exact table to 5 decimals`, () => {
      const k = chartConstants(n);
      NAMES.forEach((name, j) => expect(k[name], `${name}(${n})`).toBeCloseTo(EXACT[n]![j]!, 5));
    });
  }

  it('integrates to the closed forms d2(2) = 2/√π, d3(2) = √(2 − 4/π), d2(3) = 3/√π', () => {
    // source: computed from the definition (range of 2 and 3 normals has these closed forms) [C];
    // chartConstants(2) uses the closed forms, so the integration is checked here directly.
    expect(rangeMoments(2).d2).toBeCloseTo(2 / Math.sqrt(Math.PI), 9);
    expect(rangeMoments(2).d3).toBeCloseTo(Math.sqrt(2 - 4 / Math.PI), 8);
    expect(chartConstants(3).d2).toBeCloseTo(3 / Math.sqrt(Math.PI), 9);
  });

  it('matches the extra digits for n = 2 and n = 5', () => {
    // source: spc-reference.md §1.2 "more digits", computed from the definitions [C]
    expect(chartConstants(2).c4).toBeCloseTo(0.7978846, 7);
    expect(chartConstants(5).d2).toBeCloseTo(2.3259289, 7);
    expect(chartConstants(5).d3).toBeCloseTo(0.8640819, 7);
    expect(chartConstants(5).c4).toBeCloseTo(0.9399856, 7);
  });

  it('agrees with the printed 3-decimal d2 and 4-decimal c4 table for n = 2..10', () => {
    // source: Montgomery, Introduction to SQC, Appendix VI factor table; ASTM MNL7 (from memory)
    const d2 = [1.128, 1.693, 2.059, 2.326, 2.534, 2.704, 2.847, 2.97, 3.078];
    const c4s = [0.7979, 0.8862, 0.9213, 0.94, 0.9515, 0.9594, 0.965, 0.9693, 0.9727];
    d2.forEach((v, j) => expect(Math.abs(chartConstants(j + 2).d2 - v)).toBeLessThanOrEqual(0.0005 + 1e-9));
    c4s.forEach((v, j) => expect(Math.abs(c4(j + 2) - v)).toBeLessThanOrEqual(0.00005 + 1e-9));
  });

  it('gives D4(3) = 2.5746, the exact value behind the printed 2.574/2.575 rounding edge', () => {
    // source: spc-reference.md §1.3: exact 2.574591 [C]; printed 2.574 (Montgomery, from memory)
    expect(chartConstants(3).D4).toBeCloseTo(2.574591, 6);
  });

  it('gives the median moving-range factor √2·Φ⁻¹(0.75) = 0.953873', () => {
    // source: computed from the definition [C]; printed 0.954 in Wheeler & Chambers, Understanding SPC (from memory)
    expect(MEDIAN_MR_FACTOR).toBeCloseTo(0.953873, 6);
  });

  it('rejects a subgroup size below 2', () => {
    expect(() => chartConstants(1)).toThrow(/at least 2/);
  });
});

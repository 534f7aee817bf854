import { describe, expect, it } from 'vitest';
import { buildCharacteristicView } from '../../src/app/build-view';
import { entryProblem } from '../../src/app/entry-check';
import { makeCharacteristic, sampleAt, T0 } from './helpers';

describe('entryProblem', () => {
  it('variable charts need values', () => {
    for (const chartType of ['xmr', 'xbar-r', 'xbar-s', 'ewma', 'cusum'] as const) {
      const ch = makeCharacteristic({ chartType, subgroupSize: chartType.startsWith('xbar') ? 4 : 1 });
      expect(entryProblem(ch, { values: [10] })).toBeUndefined();
      expect(entryProblem(ch, {})).toBe('Bore diameter is measured: enter the measured value.');
      expect(entryProblem(ch, { values: [] })).toMatch(/is measured/);
      expect(entryProblem(ch, { count: 3 })).toMatch(/is measured/);
    }
  });

  it('attribute charts need a count; p, np and u also the quantity inspected', () => {
    for (const chartType of ['p', 'np', 'u'] as const) {
      const ch = makeCharacteristic({ chartType, name: 'Scratches', subgroupSize: 50 });
      expect(entryProblem(ch, { count: 2, inspected: 50 })).toBeUndefined();
      expect(entryProblem(ch, { count: 0, inspected: 50 })).toBeUndefined();
      expect(entryProblem(ch, { values: [2] })).toBe('Scratches is counted: enter the count.');
      expect(entryProblem(ch, { count: 2 })).toBe('Scratches: enter the quantity inspected with the count.');
    }
    expect(entryProblem(makeCharacteristic({ chartType: 'c' }), { count: 7 })).toBeUndefined();
  });

  it('p and np: no more nonconforming items than items inspected; u may count more defects than units', () => {
    expect(entryProblem(makeCharacteristic({ chartType: 'p' }), { count: 51, inspected: 50 })).toBe('More nonconforming items (51) than items inspected (50).');
    expect(entryProblem(makeCharacteristic({ chartType: 'np' }), { count: 50, inspected: 50 })).toBeUndefined();
    expect(entryProblem(makeCharacteristic({ chartType: 'u' }), { count: 12, inspected: 2.5 })).toBeUndefined();
  });
});

describe('buildCharacteristicView with a sample the engine refuses', () => {
  it('returns an empty chart with the engine’s reason instead of throwing', () => {
    const ch = makeCharacteristic({ chartType: 'p', subgroupSize: 100 });
    const bad = sampleAt(0, { values: undefined, count: 150, inspected: 100 });
    const view = buildCharacteristicView(ch, [], [bad], [], [], T0);
    expect(view.analysis.points).toEqual([]);
    expect(view.analysis.signals).toEqual([]);
    expect(view.analysis.warnings).toEqual([expect.stringMatching(/^The chart cannot be drawn: .*150 defectives out of 100 inspected/)]);
    expect(view.groups).toEqual([]);
    expect(view.lastTakenAt).toBe(bad.takenAt); // the due state still follows the last sample
  });
});

import { describe, expect, it } from 'vitest';
import { buildChartSeries, compareSamples, DEFAULT_CUSUM, DEFAULT_EWMA } from '../../src/app/analysis-input';
import { buildCharacteristicView } from '../../src/app/build-view';
import { resolveCorrections } from '../../src/store/resolve-corrections';
import { BASELINE, individuals, iso, makeCharacteristic, makePhase, MINUTE, sampleAt, T0 } from './helpers';

const ch = makeCharacteristic();

describe('buildChartSeries: samples in time order', () => {
  it('sorts by takenAt, then id, and keeps sampleIds aligned with the subgroups', () => {
    const a = sampleAt(0, { values: [1] });
    const b = sampleAt(60, { values: [2] });
    const c = sampleAt(120, { values: [3] });
    const tie = sampleAt(60, { values: [2.5] }); // same time as b, newer id
    const series = buildChartSeries(ch, [], [c, tie, a, b]);
    expect(series.sampleIds).toEqual([a.id, b.id, tie.id, c.id]);
    expect(series.input.subgroups?.map((s) => s.values)).toEqual([[1], [2], [2.5], [3]]);
    expect(series.samples.map((s) => s.id)).toEqual(series.sampleIds);
  });

  it('does not reorder the caller’s array', () => {
    const list = [sampleAt(60), sampleAt(0)];
    const ids = list.map((s) => s.id);
    buildChartSeries(ch, [], list);
    expect(list.map((s) => s.id)).toEqual(ids);
  });

  it('compareSamples orders equal times by id', () => {
    const x = sampleAt(0);
    const y = sampleAt(0);
    expect(compareSamples(x, y)).toBe(-1);
    expect(compareSamples(y, x)).toBe(1);
    expect(compareSamples(x, x)).toBe(0);
  });

  it('passes chart type, rules and specification through to the engine input', () => {
    const series = buildChartSeries(makeCharacteristic({ rules: ['we1', 'we2', 'n3'], spec: { lsl: 1, usl: 2, target: 1.5 } }), [], [sampleAt(0)]);
    expect(series.input).toMatchObject({ chart: 'xmr', rules: ['we1', 'we2', 'n3'], spec: { lsl: 1, usl: 2, target: 1.5 } });
  });
});

describe('buildChartSeries: phases mapped to sample indices', () => {
  const samples = individuals([10, 10, 10, 10, 10, 10]); // at T0, +1 h, … +5 h

  it('without phases: one phase from 0 with the characteristic’s baseline size', () => {
    const series = buildChartSeries(ch, [], samples);
    expect(series.input.phases).toEqual([{ start: 0, baselineCount: 20 }]);
    expect(series.phaseIds).toEqual([]);
  });

  it('a phase starts at the first sample taken at or after its start', () => {
    const phases = [
      makePhase({ number: 1, startsAt: iso(T0) }),
      makePhase({ number: 2, startsAt: iso(T0 + 150 * MINUTE) }), // between samples 2 (+2 h) and 3 (+3 h)
      makePhase({ number: 3, startsAt: iso(T0 + 240 * MINUTE) }), // exactly at sample 4
    ];
    const series = buildChartSeries(ch, phases, samples);
    expect(series.input.phases).toEqual([
      { start: 0, baselineCount: 20 },
      { start: 3, baselineCount: 20 },
      { start: 4, baselineCount: 20 },
    ]);
    expect(series.phaseIds).toEqual(['ph-1', 'ph-2', 'ph-3']);
  });

  it('orders phases by number, whatever order they arrive in, and ignores other characteristics’ phases', () => {
    const phases = [
      makePhase({ number: 2, startsAt: iso(T0 + 150 * MINUTE) }),
      makePhase({ number: 1, startsAt: iso(T0) }),
      makePhase({ id: 'other', characteristicId: 'ch-other', number: 2, startsAt: iso(T0 + 60 * MINUTE) }),
    ];
    const series = buildChartSeries(ch, phases, samples);
    expect(series.input.phases?.map((p) => p.start)).toEqual([0, 3]);
    expect(series.phaseIds).toEqual(['ph-1', 'ph-2']);
  });

  it('the first phase covers samples taken before its start', () => {
    const series = buildChartSeries(ch, [makePhase({ number: 1, startsAt: iso(T0 + 90 * MINUTE) })], samples);
    expect(series.input.phases).toEqual([{ start: 0, baselineCount: 20 }]);
    expect(series.phaseIds).toEqual(['ph-1']);
  });

  it('a phase starting after the last sample begins at samples.length and carries its given limits', () => {
    const phases = [
      makePhase({ number: 1, startsAt: iso(T0) }),
      makePhase({ number: 2, startsAt: iso(T0 + 24 * 60 * MINUTE), given: { centre: 10.2, sigma: 0.05 } }),
    ];
    const series = buildChartSeries(ch, phases, samples);
    expect(series.input.phases).toEqual([
      { start: 0, baselineCount: 20 },
      { start: 6, given: { centre: 10.2, sigma: 0.05 } },
    ]);
    expect(series.phaseIds).toEqual(['ph-1', 'ph-2']);
  });

  it('a phase that no sample has reached yet is superseded by a later one at the same place', () => {
    const phases = [
      makePhase({ number: 1, startsAt: iso(T0) }),
      makePhase({ number: 2, startsAt: iso(T0 + 10 * 60 * MINUTE) }),
      makePhase({ number: 3, startsAt: iso(T0 + 20 * 60 * MINUTE), given: { centre: 10, sigma: 0.1 } }),
    ];
    const series = buildChartSeries(ch, phases, samples);
    expect(series.input.phases).toEqual([{ start: 0, baselineCount: 20 }, { start: 6, given: { centre: 10, sigma: 0.1 } }]);
    expect(series.phaseIds).toEqual(['ph-1', 'ph-3']);
  });

  it('once a sample arrives after a given-limits phase starts, it is judged by the given limits', () => {
    const phases = [
      makePhase({ number: 1, startsAt: iso(T0) }),
      makePhase({ number: 2, startsAt: iso(T0 + 5.5 * 60 * MINUTE), given: { centre: 10.2, sigma: 0.05 } }),
    ];
    const later = sampleAt(6 * 60, { values: [10.21] });
    const view = buildCharacteristicView(ch, phases, [...samples, later], [], [], T0 + 7 * 60 * MINUTE);
    expect(view.series.input.phases?.[1]).toEqual({ start: 6, given: { centre: 10.2, sigma: 0.05 } });
    const p = view.analysis.points[6]!;
    expect(p.phase).toBe(1);
    // Standard given, individuals: μ ± 3σ (source: Shewhart, Economic Control of Quality of Manufactured Product (1931), 3-sigma limits; common practice)
    expect(p.centre).toBeCloseTo(10.2, 12);
    expect(p.ucl).toBeCloseTo(10.2 + 3 * 0.05, 12);
    expect(p.lcl).toBeCloseTo(10.2 - 3 * 0.05, 12);
  });

  it('no samples at all: every phase starts at 0 and only the last survives', () => {
    const phases = [makePhase({ number: 1, startsAt: iso(T0) }), makePhase({ number: 2, startsAt: iso(T0 + MINUTE), given: { centre: 1, sigma: 1 } })];
    const series = buildChartSeries(ch, phases, []);
    expect(series.input.phases).toEqual([{ start: 0, given: { centre: 1, sigma: 1 } }]);
    expect(series.phaseIds).toEqual(['ph-2']);
    expect(series.input.subgroups).toEqual([]);
  });
});

describe('buildChartSeries: corrections and exclusions', () => {
  it('a correction (same takenAt as the original, after resolveCorrections) replaces the value in place', () => {
    const [a, b, c] = individuals([10, 12, 10.1]);
    const fix = sampleAt(60, { values: [10.2], supersedes: b!.id, reason: 'Misread the gauge' });
    const current = resolveCorrections([a!, b!, fix, c!]);
    const series = buildChartSeries(ch, [], current);
    expect(series.input.subgroups?.map((s) => s.values)).toEqual([[10], [10.2], [10.1]]);
    expect(series.sampleIds).toEqual([a!.id, fix.id, c!.id]);
  });

  it('marks excluded samples as excluded subgroups (still plotted), with the reason', () => {
    const [a, b] = individuals([10, 10.4]);
    const series = buildChartSeries(ch, [], [a!, { ...b!, excluded: true, reason: 'Gauge dropped' }]);
    expect(series.input.subgroups).toEqual([
      { values: [10], excluded: false },
      { values: [10.4], excluded: true, exclusionReason: 'Gauge dropped' },
    ]);
  });

  it('an excluded sample does not move the baseline limits', () => {
    const base = individuals(BASELINE);
    const wild = sampleAt(20 * 60, { values: [14], excluded: true, reason: 'Setting-up part' });
    const without = buildCharacteristicView(makeCharacteristic({ baselineSize: 21 }), [], base, [], [], T0);
    const withExcluded = buildCharacteristicView(makeCharacteristic({ baselineSize: 21 }), [], [...base, wild], [], [], T0);
    expect(withExcluded.analysis.points).toHaveLength(21);
    expect(withExcluded.analysis.phases[0]!.centre).toBeCloseTo(without.analysis.phases[0]!.centre!, 12);
  });
});

describe('buildChartSeries: variable and attribute subgroups', () => {
  it('X̄–R and X̄–S subgroups carry the values', () => {
    for (const chartType of ['xbar-r', 'xbar-s'] as const) {
      const s = buildChartSeries(makeCharacteristic({ chartType, subgroupSize: 3 }), [], [sampleAt(0, { values: [1, 2, 3] })]);
      expect(s.input.subgroups).toEqual([{ values: [1, 2, 3], excluded: false }]);
      expect(s.input.chart).toBe(chartType);
    }
  });

  it('p, np and u: the count over the quantity inspected on that sample', () => {
    for (const chartType of ['p', 'np', 'u'] as const) {
      const c = makeCharacteristic({ chartType, subgroupSize: 100, decimals: 0 });
      const s = buildChartSeries(c, [], [sampleAt(0, { values: undefined, count: 3, inspected: 80 })]);
      expect(s.input.subgroups).toEqual([{ count: 3, size: 80, excluded: false }]);
    }
  });

  it('p, np and u: without an inspected quantity the usual subgroup size is used', () => {
    for (const chartType of ['p', 'np', 'u'] as const) {
      const c = makeCharacteristic({ chartType, subgroupSize: 125, decimals: 0 });
      const s = buildChartSeries(c, [], [sampleAt(0, { values: undefined, count: 4 })]);
      expect(s.input.subgroups).toEqual([{ count: 4, size: 125, excluded: false }]);
    }
  });

  it('u keeps a fractional quantity of units (e.g. 2.5 m² inspected)', () => {
    const c = makeCharacteristic({ chartType: 'u', subgroupSize: 1, decimals: 0 });
    const s = buildChartSeries(c, [], [sampleAt(0, { values: undefined, count: 7, inspected: 2.5 })]);
    expect(s.input.subgroups).toEqual([{ count: 7, size: 2.5, excluded: false }]);
  });

  it('c: the count alone, no size', () => {
    const c = makeCharacteristic({ chartType: 'c', subgroupSize: 1, decimals: 0 });
    const s = buildChartSeries(c, [], [sampleAt(0, { values: undefined, count: 5, inspected: 10 })]);
    expect(s.input.subgroups).toEqual([{ count: 5, excluded: false }]);
  });
});

describe('buildChartSeries: EWMA and CUSUM characteristics', () => {
  it('EWMA: the values, with the characteristic’s λ and L or the default design', () => {
    const own = buildChartSeries(makeCharacteristic({ chartType: 'ewma', ewma: { lambda: 0.1, L: 2.7 } }), [], [sampleAt(0, { values: [10.2] })]);
    expect(own.input).toMatchObject({ chart: 'ewma', subgroups: [{ values: [10.2], excluded: false }], ewma: { lambda: 0.1, L: 2.7 } });
    expect(own.input.cusum).toBeUndefined();
    const def = buildChartSeries(makeCharacteristic({ chartType: 'ewma' }), [], [sampleAt(0)]);
    expect(def.input.ewma).toEqual(DEFAULT_EWMA);
  });

  it('CUSUM: the values, with the characteristic’s k and h or the default design', () => {
    const own = buildChartSeries(makeCharacteristic({ chartType: 'cusum', cusum: { k: 0.25, h: 8 } }), [], [sampleAt(0, { values: [10.2] })]);
    expect(own.input).toMatchObject({ chart: 'cusum', subgroups: [{ values: [10.2], excluded: false }], cusum: { k: 0.25, h: 8 } });
    expect(own.input.ewma).toBeUndefined();
    expect(buildChartSeries(makeCharacteristic({ chartType: 'cusum' }), [], [sampleAt(0)]).input.cusum).toEqual(DEFAULT_CUSUM);
  });

  it('Shewhart charts carry neither design', () => {
    const s = buildChartSeries(makeCharacteristic(), [], [sampleAt(0)]);
    expect(s.input.ewma).toBeUndefined();
    expect(s.input.cusum).toBeUndefined();
  });
});

import { describe, expect, it } from 'vitest';
import { ALL_RULES, analyze, Evaluator, type AnalysisInput } from '../../src/engine';
import { PISTON_RINGS } from './fixtures/piston-rings';
import { CONCENTRATION } from './fixtures/concentration';

// A deterministic pseudo-random sequence (no Math.random in tests).
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32);
}

function appendOneByOne(input: AnalysisInput) {
  const { subgroups, ...config } = input;
  const ev = new Evaluator(config);
  const froms: number[] = [];
  for (const sg of subgroups ?? []) froms.push(ev.append(sg));
  return { result: ev.analysis(), froms };
}

describe('Evaluator (incremental)', () => {
  const next = lcg(42);
  const xs = Array.from({ length: 120 }, (_, i) => 10 + next() * 2 + (i > 90 ? 1.5 : 0));
  const inputs: AnalysisInput[] = [
    { chart: 'xmr', subgroups: xs.map((x) => ({ values: [x] })), phases: [{ start: 0, baselineCount: 25 }, { start: 60, baselineCount: 20 }], rules: ['n1', 'n2', 'n3', 'n4', 'n5', 'n6', 'n7', 'n8'] },
    { chart: 'xmr', subgroups: CONCENTRATION.map((x, i) => ({ values: [x], excluded: i === 3 })) },
    { chart: 'xbar-r', subgroups: PISTON_RINGS.map((values) => ({ values })), phases: [{ start: 0, baselineCount: 12 }] },
    { chart: 'ewma', subgroups: xs.map((x) => ({ values: [x] })), ewma: { lambda: 0.2, L: 2.962 }, phases: [{ start: 0, baselineCount: 30 }] },
    { chart: 'cusum', subgroups: xs.map((x) => ({ values: [x] })), cusum: { k: 0.5, h: 4 }, phases: [{ start: 0, baselineCount: 30 }] },
    { chart: 'p', subgroups: xs.map((x, i) => ({ count: Math.round(x), size: 50 + (i % 7) })), phases: [{ start: 0, baselineCount: 25 }] },
  ];

  for (const input of inputs) {
    it(`gives the same result appended one at a time as in one batch (${input.chart})`, () => {
      const batch = analyze(input);
      const { result } = appendOneByOne(input);
      expect(result).toEqual(batch);
    });
  }

  it('recomputes only inside a baseline; after it, each append touches only the new point', () => {
    const { froms } = appendOneByOne(inputs[0]!);
    // Within the first baseline (0..24) limits change, so the phase is re-evaluated from 0.
    expect(froms.slice(0, 25)).toEqual(Array.from({ length: 25 }, () => 0));
    expect(froms.slice(25, 60)).toEqual(Array.from({ length: 35 }, (_, i) => 25 + i));
    expect(froms.slice(60, 80)).toEqual(Array.from({ length: 20 }, () => 60));
    expect(froms.slice(80)).toEqual(Array.from({ length: 40 }, (_, i) => 80 + i));
  });

  it('returns copies from analysis() unless asked for live arrays', () => {
    const ev = new Evaluator({ chart: 'xmr' });
    ev.append({ values: [1] });
    const snap = ev.analysis();
    ev.append({ values: [2] });
    expect(snap.points).toHaveLength(1);
    expect(ev.analysis().points).toHaveLength(2);
  });
});

describe('analyze() with the individuals form', () => {
  it('gives the same result as one-value subgroups', () => {
    const xs = [10.2, 9.8, 10.1, 10.4, 9.7, 10.0, 12.9, 10.1, 9.9, 10.3, 10.2, 10.1, 10.0, 10.2, 10.4, 10.3, 10.5, 10.2, 10.6];
    const phases = [{ start: 0, baselineCount: 10 }, { start: 12 }];
    const a = analyze({ chart: 'xmr', individuals: Float64Array.from(xs), phases, rules: ['n1', 'n2', 'n3', 'n5', 'n6'] });
    const b = analyze({ chart: 'xmr', subgroups: xs.map((x) => ({ values: [x] })), phases, rules: ['n1', 'n2', 'n3', 'n5', 'n6'] });
    expect(a).toEqual(b);
    expect(JSON.parse(JSON.stringify(a))).toEqual(JSON.parse(JSON.stringify(b)));
  });

  it('gives the same result as appending the values one at a time (baseline sums, moving ranges filled in on read, companion signals)', () => {
    const next = lcg(7);
    // Noise with a shift, a trend, a run of alternations, a wild point and repeated values.
    const xs = Array.from({ length: 400 }, (_, i) => {
      const base = 10 + (next() - 0.5) * 2 + (i > 250 ? 1.2 : 0) + (i >= 120 && i < 130 ? (i - 120) * 0.3 : 0);
      const alt = i >= 180 && i < 200 ? (i % 2 === 0 ? 0.8 : -0.8) : 0;
      const wild = i === 300 ? 6 : 0;
      return i >= 340 && i < 344 ? 10 : base + alt + wild;
    });
    for (const phases of [undefined, [{ start: 0, baselineCount: 50 }, { start: 150, baselineCount: 40 }, { start: 320 }]]) {
      const config = { chart: 'xmr' as const, rules: [...ALL_RULES], ...(phases ? { phases } : {}) };
      const batch = analyze({ ...config, individuals: Float64Array.from(xs) });
      const one = new Evaluator(config);
      for (const x of xs) one.append({ values: [x] });
      const single = one.analysis();
      expect(batch.signals.some((s) => s.companion)).toBe(true);
      expect(batch.signals.length).toBeGreaterThan(20);
      expect(batch.phases).toEqual(single.phases);
      expect(batch.signals).toEqual(single.signals);
      expect(batch.points).toEqual(single.points);
    }
  });

  it('rejects both forms at once, and values that are not finite', () => {
    expect(() => analyze({ chart: 'xmr', individuals: [1], subgroups: [] })).toThrow(/either subgroups or individuals/);
    expect(() => analyze({ chart: 'xmr', individuals: [1, Number.POSITIVE_INFINITY] })).toThrow(/subgroup 1: value Infinity is not a finite number/);
    expect(() => analyze({ chart: 'p', individuals: [1] })).toThrow(/needs counts/);
  });
});

import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ALL_RULES, Evaluator, type RuleCode, type Signal } from '../../src/engine';
import { CONTEXT, detectBatch, zoneBound } from '../../src/engine/bit-rules';
import { ruleSet } from '../../src/engine/rule-signals';
import { RuleEvaluator } from '../../src/engine/rules';
import { useZoneKernel, zoneKernel } from '../../src/engine/zone-kernel';

// The word-parallel detector must give exactly the signals of the point-by-point evaluator
// (same rules, same points, same order), whatever the data, rule subset and starting point.
// Values include the zone lines themselves and repeated values (ties), where the rules are subtle.
const value = fc.oneof(fc.constantFrom(0, 1, -1, 2, -2, 3, -3, 0.5, -0.5), fc.double({ min: -4, max: 4, noNaN: true }));

function scalar(values: Float64Array, from: number, to: number, rules: readonly RuleCode[]): Signal[] {
  const ev = new RuleEvaluator(rules);
  const out: Signal[] = [];
  ev.pushRun(values, 0, to, 0, 1, out);
  return out.filter((s) => s.index >= from);
}

// The batch compares x − centre with a bound A(k) per zone line instead of dividing each point
// by sigma; A(k) must give exactly the comparisons of the computed z = (x − centre)/sigma.
function nextUp(x: number): number {
  const f = new Float64Array([x]);
  const b = new BigInt64Array(f.buffer);
  b[0] = b[0]! + (x >= 0 ? 1n : -1n);
  return f[0]!;
}
function nextDown(x: number): number {
  return -nextUp(-x);
}

describe('zoneBound()', () => {
  it('is the largest d ≥ 0 with d / sigma ≤ k', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-300, max: 1e300, noNaN: true }), fc.constantFrom(0, 1, 2, 3), (sigma, k) => {
        const a = zoneBound(sigma, k);
        expect(a / sigma <= k).toBe(true);
        expect(nextUp(a) / sigma > k).toBe(true);
      }),
      { numRuns: 2000, seed: 20261202 },
    );
  });
});

// Every batch check runs twice: zone tests in JavaScript only, and in the WebAssembly SIMD kernel
// for every batch however short (by default it takes batches of 256 points and more).
describe.each(['never', 'always'] as const)('zone kernel: %s', (mode) => {
  beforeAll(() => useZoneKernel(mode));
  afterAll(() => useZoneKernel('auto'));

  describe('detectBatch()', () => {
    it('matches the point-by-point evaluator', () => {
      fc.assert(
        fc.property(fc.array(value, { minLength: 1, maxLength: 300 }), fc.subarray([...ALL_RULES], { minLength: 1 }), fc.nat(), (xs, rules, f) => {
          const values = Float64Array.from(xs);
          const from = f % xs.length;
          const out: Signal[] = [];
          detectBatch(values, Math.max(0, from - CONTEXT), from, xs.length, 0, 1, ruleSet(rules), out);
          expect(out).toEqual(scalar(values, from, xs.length, rules));
        }),
        { numRuns: 400, seed: 20261202 },
      );
    });

    it('matches on long runs that cross many words (all rules, centre and sigma not 0 and 1)', () => {
      const xs = Array.from({ length: 2000 }, (_, i) => 10 + 0.7 * Math.sin(i * 0.37) + (i % 97 < 20 ? 0.9 : 0) + (i % 13 === 0 ? 1.6 : 0));
      const values = Float64Array.from(xs);
      const out: Signal[] = [];
      detectBatch(values, 0, 0, xs.length, 10, 0.5, ruleSet(ALL_RULES), out);
      const ev = new RuleEvaluator(ALL_RULES);
      const ref: Signal[] = [];
      ev.pushRun(values, 0, xs.length, 10, 0.5, ref);
      expect(ref.length).toBeGreaterThan(50);
      expect(out).toEqual(ref);
    });
  });

  describe('Evaluator after a batch', () => {
    it('continues point by point exactly as a single batch would (state rebuilt from the last points)', () => {
      fc.assert(
        fc.property(fc.array(value, { minLength: 70, maxLength: 260 }), fc.subarray([...ALL_RULES], { minLength: 1 }), fc.nat(), (xs, rules, k) => {
          const split = 64 + (k % (xs.length - 64));
          const config = { chart: 'xmr' as const, phases: [{ start: 0, given: { centre: 0, sigma: 1 } }], rules };
          const whole = new Evaluator(config);
          whole.appendValues(xs);
          const parts = new Evaluator(config);
          parts.appendValues(xs.slice(0, split));
          for (const x of xs.slice(split)) parts.append({ values: [x] });
          expect(parts.analysis().signals).toEqual(whole.analysis().signals);
        }),
        { numRuns: 200, seed: 7 },
      );
    });

    it('gives from a batch of values the signals of point-by-point appends, moving-range chart included', () => {
      fc.assert(
        fc.property(fc.array(value, { minLength: 64, maxLength: 300 }), fc.subarray([...ALL_RULES], { minLength: 1 }), fc.nat(), (xs, rules, k) => {
          const config = { chart: 'xmr' as const, phases: [{ start: 0, given: { centre: 0, sigma: 1 } }], rules };
          const batch = new Evaluator(config);
          batch.appendValues(Float64Array.from(xs));
          const one = new Evaluator(config);
          for (const x of xs) one.append({ values: [x] });
          expect(batch.analysis().signals).toEqual(one.analysis().signals);
          // two batches: the second's run of points starts inside the first's words
          const split = k % xs.length;
          const two = new Evaluator(config);
          two.appendValues(Float64Array.from(xs.slice(0, split)));
          two.appendValues(Float64Array.from(xs.slice(split)));
          expect(two.analysis().signals).toEqual(one.analysis().signals);
        }),
        { numRuns: 200, seed: 11 },
      );
    });
  });

  describe('detectBatch() at the zone lines of any centre and sigma', () => {
    it('matches the point-by-point evaluator on values a few units in the last place from each line', () => {
      const point = (centre: number, sigma: number) =>
        fc.tuple(fc.constantFrom(-3, -2, -1, 0, 1, 2, 3), fc.integer({ min: -2, max: 2 }), fc.double({ min: -0.5, max: 0.5, noNaN: true })).map(([k, ulps, jitter]) => {
          let x = ulps === 0 && jitter !== 0 ? centre + (k + jitter) * sigma : centre + k * sigma;
          for (let u = 0; u < Math.abs(ulps); u++) x = ulps > 0 ? nextUp(x) : nextDown(x);
          return x;
        });
      const case_ = fc
        .tuple(fc.double({ min: -1e6, max: 1e6, noNaN: true }), fc.double({ min: 1e-6, max: 1e4, noNaN: true }))
        .chain(([centre, sigma]) => fc.tuple(fc.constant(centre), fc.constant(sigma), fc.array(point(centre, sigma), { minLength: 1, maxLength: 200 })));
      fc.assert(
        fc.property(case_, fc.subarray([...ALL_RULES], { minLength: 1 }), fc.nat(), ([centre, sigma, xs], rules, f) => {
          const values = Float64Array.from(xs);
          const from = f % xs.length;
          const out: Signal[] = [];
          detectBatch(values, Math.max(0, from - CONTEXT), from, xs.length, centre, sigma, ruleSet(rules), out);
          const ev = new RuleEvaluator(rules);
          const ref: Signal[] = [];
          ev.pushRun(values, 0, xs.length, centre, sigma, ref);
          expect(out).toEqual(ref.filter((s) => s.index >= from));
        }),
        { numRuns: 300, seed: 11 },
      );
    });
  });
});

describe('zone kernel', () => {
  it('is there in this Node (WebAssembly SIMD), and the batch uses it from 256 points on', () => {
    useZoneKernel('auto');
    expect(zoneKernel(255)).toBeNull();
    expect(zoneKernel(256)).not.toBeNull();
  });

  it('gives the JavaScript loop\'s signals on 100,000 points of every kind of data (all rules, moving-range chart)', () => {
    const n = 100_000;
    const rows = [
      (i: number) => Math.sin(i * 1.7) * 2.2 + Math.cos(i * 0.013) * 1.3, // smooth and noisy
      (i: number) => Math.round(Math.sin(i * 0.9) * 6) / 2, // on the zone lines, ties, on the centre
      (i: number) => (i % 500 < 9 ? 4 : 0) + Math.sin(i) * 0.2, // runs beyond 3σ, long moves
    ];
    for (const f of rows) {
      const values = Float64Array.from({ length: n }, (_, i) => f(i));
      const check = { spread: null, ucl: 3.686, lcl: 0, rule: 'n1' as const, name: 'moving range', pair: true };
      const run = (mode: 'never' | 'always'): Signal[] => {
        useZoneKernel(mode);
        const out: Signal[] = [];
        detectBatch(values, 0, 0, n, 0, 1, ruleSet(ALL_RULES), out, check);
        return out;
      };
      const js = run('never');
      const simd = run('always');
      useZoneKernel('auto');
      expect(js.length).toBeGreaterThan(100);
      expect(simd).toEqual(js);
    }
  });
});

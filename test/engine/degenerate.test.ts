import { describe, expect, it } from 'vitest';
import { analyze, EngineInputError, type Analysis } from '../../src/engine';

/** No NaN or ±Infinity anywhere: JSON would turn them into null silently. */
function expectAllFinite(a: Analysis): void {
  const walk = (v: unknown, path: string): void => {
    if (typeof v === 'number') expect(Number.isFinite(v), path).toBe(true);
    else if (Array.isArray(v)) v.forEach((x, i) => walk(x, `${path}[${i}]`));
    else if (v && typeof v === 'object') for (const [k, x] of Object.entries(v)) walk(x, `${path}.${k}`);
  };
  walk(a, 'analysis');
  expect(JSON.parse(JSON.stringify(a))).toEqual(a);
  expect(structuredClone(a)).toEqual(a);
}

const individuals = (xs: readonly number[]) => xs.map((x) => ({ values: [x] }));

describe('analyze() with degenerate input', () => {
  it('constant data: warns, gives null limits and no signals', () => {
    const a = analyze({ chart: 'xmr', subgroups: individuals([5, 5, 5, 5, 5, 5, 5, 5, 5]) });
    expect(a.warnings).toEqual(['All baseline values are equal (no variation): sigma is 0 and limits cannot be computed.']);
    expect(a.points[3]).toMatchObject({ value: 5, centre: null, ucl: null, lcl: null, sigma: null });
    expect(a.points[3]!.companion).toEqual({ value: 0, centre: null, ucl: null, lcl: null });
    expect(a.signals).toEqual([]);
    expect(a.phases[0]).toMatchObject({ centre: null, sigmaWithin: null, provisional: true });
    expectAllFinite(a);
  });

  it('one point: warns that a moving range needs two values', () => {
    const a = analyze({ chart: 'xmr', subgroups: individuals([5]) });
    expect(a.warnings[0]).toMatch(/At least 2 consecutive values/);
    expect(a.points).toHaveLength(1);
    expect(a.points[0]!.ucl).toBeNull();
    expectAllFinite(a);
  });

  it('no subgroups: an empty result with a warning', () => {
    const a = analyze({ chart: 'xbar-r', subgroups: [] });
    expect(a.points).toEqual([]);
    expect(a.warnings).toEqual(['No subgroups yet.']);
  });

  it('X̄-R with subgroups of one value: warns and omits limits', () => {
    const a = analyze({ chart: 'xbar-r', subgroups: individuals([1, 2, 3]) });
    expect(a.warnings[0]).toMatch(/Subgroups of at least 2 values/);
    expect(a.points[1]).toMatchObject({ value: 2, centre: null, ucl: null });
    expect(a.points[1]!.companion!.value).toBeNull();
    expectAllFinite(a);
  });

  it('given limits without sigma on a measured chart: warns', () => {
    const a = analyze({ chart: 'xmr', subgroups: individuals([1, 2]), phases: [{ start: 0, given: { centre: 1 } }] });
    expect(a.warnings[0]).toMatch(/need a sigma/);
    expectAllFinite(a);
  });

  it('few baseline subgroups: limits are provisional', () => {
    const a = analyze({ chart: 'xmr', subgroups: individuals([1, 3, 2, 4, 3]) });
    expect(a.phases[0]!.provisional).toBe(true);
    expect(a.phases[0]!.baselineCount).toBe(5);
  });

  it('rejects malformed input with a clear error', () => {
    expect(() => analyze({ chart: 'xmr', subgroups: [{ values: [1] }, { values: [Number.NaN] }] })).toThrow(EngineInputError);
    expect(() => analyze({ chart: 'xmr', subgroups: [{ values: [1] }, { values: [Number.NaN] }] })).toThrow('subgroup 1: value NaN is not a finite number');
    expect(() => analyze({ chart: 'xmr', subgroups: [{ values: [1, 2] }] })).toThrow(/one value per subgroup/);
    expect(() => analyze({ chart: 'xbar-r', subgroups: [{ values: [] }] })).toThrow(/at least one measured value/);
    expect(() => analyze({ chart: 'p', subgroups: [{ count: 3, size: 2 }] })).toThrow(/3 defectives out of 2/);
    expect(() => analyze({ chart: 'xmr', subgroups: [], phases: [{ start: 2 }] })).toThrow(/first phase must start at subgroup 0/);
    expect(() => analyze({ chart: 'ewma', subgroups: [] })).toThrow(/λ/);
    expect(() => analyze({ chart: 'bogus' as 'xmr', subgroups: [] })).toThrow(/unknown chart type/);
  });
});

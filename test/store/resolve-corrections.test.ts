import { describe, expect, it } from 'vitest';
import { resolveCorrections } from '../../src/store/resolve-corrections';
import { makeSample } from './helpers';

describe('resolveCorrections()', () => {
  it('returns the samples unchanged when nothing is corrected', () => {
    const list = [makeSample(), makeSample()];
    expect(resolveCorrections(list)).toEqual(list);
  });

  it('puts a correction in the place of the sample it supersedes', () => {
    const a = makeSample({ values: [1] });
    const b = makeSample({ values: [2] });
    const fixA = makeSample({ values: [1.5], supersedes: a.id, reason: 'Misread' });
    expect(resolveCorrections([a, b, fixA])).toEqual([fixA, b]);
  });

  it('follows a chain of corrections to the last one', () => {
    const a = makeSample({ values: [1] });
    const fix1 = makeSample({ values: [2], supersedes: a.id, reason: 'x' });
    const fix2 = makeSample({ values: [3], supersedes: fix1.id, reason: 'y' });
    expect(resolveCorrections([a, fix1, fix2])).toEqual([fix2]);
  });

  it('lets the later of two corrections of the same sample win', () => {
    const a = makeSample({ values: [1] });
    const first = makeSample({ values: [2], supersedes: a.id, reason: 'x' });
    const second = makeSample({ values: [3], supersedes: a.id, reason: 'y' });
    expect(resolveCorrections([a, first, second])).toEqual([second]);
  });

  it('keeps a correction whose original is not in the list where it is', () => {
    const orphan = makeSample({ supersedes: '01900000-0000-7000-8000-0000000000ff', reason: 'x' });
    const b = makeSample();
    expect(resolveCorrections([orphan, b])).toEqual([orphan, b]);
  });

  it('does not mutate its input', () => {
    const a = makeSample({ values: [1] });
    const fix = makeSample({ values: [2], supersedes: a.id, reason: 'x' });
    const input = [a, fix];
    const copy = structuredClone(input);
    resolveCorrections(input);
    expect(input).toEqual(copy);
  });
});

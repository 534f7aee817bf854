import { describe, expect, it } from 'vitest';
import { analyze } from '../../src/engine';
import { brief, signalsFor } from './fixtures/run';

// Rule definitions: Western Electric Co., Statistical Quality Control Handbook (1956), as worded in
// Montgomery & Runger, Applied Statistics and Probability for Engineers, 3rd ed., Ch. 16 (rules 2
// and 3 one side at a time); Nelson, "The Shewhart control chart – tests for special causes",
// J. Quality Technology 16(4), 1984. "Beyond" a zone line is strictly beyond it (a point on the
// line is in the inner zone, Nelson's convention, from memory). Zone widths are 1 sigma of the
// plotted statistic; here limits are given as centre 0, sigma 1 so each value is its z.
const run = (n: number, z: number) => Array.from({ length: n }, () => z);

describe('Western Electric rule 1 (Nelson 1): one point beyond 3 sigma', () => {
  it('fires strictly beyond the limit, on either side', () => {
    const s = signalsFor([0, 3, 3.0001, -3, -3.0001], ['we1']);
    expect(brief(s)).toEqual([['we1', 2, 'above'], ['we1', 4, 'below']]);
    expect(s[0]!.points).toEqual([2]);
    expect(s[0]!.explanation).toBe('1 point above the upper control limit');
    expect(s[1]!.explanation).toBe('1 point below the lower control limit');
  });

  it('reports every selected rule that fires (WE 1 and Nelson 1 together)', () => {
    expect(brief(signalsFor([4], ['we1', 'n1']))).toEqual([['we1', 0, 'above'], ['n1', 0, 'above']]);
  });
});

describe('Western Electric rule 2 (Nelson 5): 2 of 3 beyond 2 sigma, same side', () => {
  it('fires on 2 of 3 with the third anywhere, listing the two points', () => {
    const s = signalsFor([2.1, -0.5, 2.5], ['we2']);
    expect(brief(s)).toEqual([['we2', 2, 'above']]);
    expect(s[0]!.points).toEqual([0, 2]);
    expect(s[0]!.explanation).toBe('2 of 3 points in a row more than 2 sigma above the centre line');
  });

  it('does not combine sides: +2.1 then −2.1 is no signal', () => {
    expect(signalsFor([2.1, -2.1], ['we2'])).toEqual([]);
  });

  it('does not fire on the 2-sigma line itself', () => {
    expect(signalsFor([2, 2.1, 2], ['we2'])).toEqual([]);
  });

  it('does not fire when the two are 3 apart (outside a window of 3)', () => {
    expect(signalsFor([-2.1, 0, 0, -2.1], ['we2'])).toEqual([]);
  });

  it('needs the newest point in the pattern', () => {
    expect(brief(signalsFor([-2.1, -2.2, 0], ['n5']))).toEqual([['n5', 1, 'below']]);
  });
});

describe('Western Electric rule 3 (Nelson 6): 4 of 5 beyond 1 sigma, same side', () => {
  it('fires on 4 of 5 and lists the four', () => {
    const s = signalsFor([1.1, 1.2, 1.5, 0, 1.1], ['we3']);
    expect(brief(s)).toEqual([['we3', 4, 'above']]);
    expect(s[0]!.points).toEqual([0, 1, 2, 4]);
    expect(s[0]!.explanation).toBe('4 of 5 points in a row more than 1 sigma above the centre line');
  });

  it('does not fire on 3 of 5, nor with points on the 1-sigma line', () => {
    expect(signalsFor([1, 1, 1.1, 1.1, 1.1], ['we3'])).toEqual([]);
    expect(signalsFor([-1.1, -1.1, 1.1, -1.1, 0], ['we3'])).toEqual([]);
  });

  it('fires below as well', () => {
    expect(brief(signalsFor([-1.1, -1.1, -1.1, -1.1], ['n6']))).toEqual([['n6', 3, 'below']]);
  });
});

describe('Western Electric rule 4: 8 in a row on one side', () => {
  it('fires at the 8th point and again at the 9th', () => {
    const s = signalsFor(run(9, 0.5), ['we4']);
    expect(brief(s)).toEqual([['we4', 7, 'above'], ['we4', 8, 'above']]);
    expect(s[0]!.points).toEqual([0, 1, 2, 3, 4, 5, 6, 7]);
    expect(s[0]!.explanation).toBe('8 points in a row above the centre line');
  });

  it('does not fire on 7, and a point on the centre line breaks the run', () => {
    expect(signalsFor(run(7, -0.2), ['we4'])).toEqual([]);
    expect(signalsFor([...run(4, 0.3), 0, ...run(4, 0.3)], ['we4'])).toEqual([]);
  });

  it('fires below the centre line', () => {
    expect(brief(signalsFor(run(8, -0.1), ['we4']))).toEqual([['we4', 7, 'below']]);
    expect(signalsFor(run(8, -0.1), ['we4'])[0]!.explanation).toBe('8 points in a row below the centre line');
  });
});

describe('Nelson rules 2, 3, 4, 7, 8', () => {
  it('test 2 needs 9 in a row, not 8', () => {
    expect(signalsFor(run(8, 0.4), ['n2'])).toEqual([]);
    const s = signalsFor(run(9, -0.4), ['n2']);
    expect(brief(s)).toEqual([['n2', 8, 'below']]);
    expect(s[0]!.explanation).toBe('9 points in a row below the centre line');
  });

  it('test 3 fires on 6 points steadily increasing; a tie breaks the trend', () => {
    const up = [-0.5, -0.3, -0.1, 0.1, 0.3, 0.5];
    const s = signalsFor(up, ['n3']);
    expect(brief(s)).toEqual([['n3', 5, 'above']]);
    expect(s[0]!.points).toEqual([0, 1, 2, 3, 4, 5]);
    expect(s[0]!.explanation).toBe('6 points in a row steadily increasing');
    expect(signalsFor(up.slice(1), ['n3'])).toEqual([]);
    expect(signalsFor([-0.5, -0.3, -0.1, -0.1, 0.1, 0.3, 0.5], ['n3'])).toEqual([]);
    expect(signalsFor([...up].reverse(), ['n3'])[0]!.explanation).toBe('6 points in a row steadily decreasing');
  });

  it('test 4 fires on 14 points alternating up and down, not on 13', () => {
    const alt = Array.from({ length: 14 }, (_, i) => (i % 2 === 0 ? 0.2 : -0.2));
    expect(signalsFor(alt.slice(0, 13), ['n4'])).toEqual([]);
    const s = signalsFor(alt, ['n4']);
    expect(brief(s)).toEqual([['n4', 13, null]]);
    expect(s[0]!.points).toHaveLength(14);
    expect(s[0]!.explanation).toBe('14 points in a row alternating up and down');
    const tie = [...alt.slice(0, 7), alt[6]!, ...alt.slice(7)];
    expect(signalsFor(tie.slice(0, 14), ['n4'])).toEqual([]);
  });

  it('test 7 fires on 15 points within 1 sigma (a point on the line counts as inside)', () => {
    const hug = Array.from({ length: 15 }, (_, i) => (i % 3 === 0 ? 1 : i % 3 === 1 ? -0.5 : 0.2));
    const s = signalsFor(hug, ['n7']);
    expect(brief(s)).toEqual([['n7', 14, null]]);
    expect(s[0]!.explanation).toBe('15 points in a row within 1 sigma of the centre line');
    expect(signalsFor([...hug.slice(0, 7), 1.01, ...hug.slice(8)], ['n7'])).toEqual([]);
  });

  it('test 8 fires on 8 points beyond 1 sigma on both sides, not on one side only', () => {
    const mix = [1.5, -1.5, 1.2, -1.2, 2.5, -2.5, 1.1, -1.1];
    const s = signalsFor(mix, ['n8']);
    expect(brief(s)).toEqual([['n8', 7, null]]);
    expect(s[0]!.explanation).toBe('8 points in a row more than 1 sigma from the centre line, on both sides');
    expect(signalsFor(run(8, 1.5), ['n8'])).toEqual([]);
    expect(signalsFor([...mix.slice(0, 7), 1], ['n8'])).toEqual([]);
  });
});

describe('rule selection', () => {
  it('evaluates only the selected rules', () => {
    const zs = [...run(9, 0.5), 3.5];
    expect(new Set(signalsFor(zs, ['n1']).map((s) => s.rule))).toEqual(new Set(['n1']));
    expect(signalsFor(zs, [])).toEqual([]);
  });

  it('uses Western Electric 1–4 by default', () => {
    expect(brief(signalsFor([...run(8, 0.5), 2.5, 2.5], undefined))).toEqual([['we4', 7, 'above'], ['we4', 8, 'above'], ['we2', 9, 'above'], ['we4', 9, 'above']]);
    expect(signalsFor([...run(8, 0.5), 2.5, 2.5], undefined).some((s) => s.rule.startsWith('n'))).toBe(false);
  });

  it('restarts the rules in a new phase', () => {
    const zs = run(10, 0.5).map((z) => ({ values: [z] }));
    // 5 points in phase 1 and 5 in phase 2 above centre: no run of 8 within a phase.
    const given = { centre: 0, sigma: 1 };
    const a = analyze({ chart: 'xmr', subgroups: zs, phases: [{ start: 0, given }, { start: 5, given }], rules: ['we4'] });
    expect(a.signals).toEqual([]);
  });
});

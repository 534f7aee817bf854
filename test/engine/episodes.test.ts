import { describe, expect, it } from 'vitest';
import { analyze, continuesEarlierEpisode, episodeStarts } from '../../src/engine';
import type { Signal } from '../../src/engine';

const sig = (rule: Signal['rule'], index: number, side?: 'above' | 'below', companion?: boolean): Signal => ({
  rule, index, points: [index], explanation: 'x', ...(side ? { side } : {}), ...(companion ? { companion } : {}),
});

describe('episodeStarts()', () => {
  it('joins a rule firing at consecutive points on one side into one episode', () => {
    const s = [sig('we4', 7, 'above'), sig('we4', 8, 'above'), sig('we4', 9, 'above'), sig('we4', 12, 'above')];
    expect(episodeStarts(s)).toEqual([7, 7, 7, 12]);
    expect(continuesEarlierEpisode(s)).toEqual([false, true, true, false]);
  });

  it('keeps other rules, other sides and the companion chart apart, whatever the input order', () => {
    const s = [sig('we1', 5, 'above'), sig('we4', 5, 'above'), sig('we1', 4, 'below'), sig('we1', 5, 'above', true), sig('we1', 4, 'above', true)];
    expect(episodeStarts(s)).toEqual([5, 5, 4, 4, 4]);
  });

  it('on a real chart: a sustained shift fires WE rule 4 at each point of the run, as one episode', () => {
    // 20 points around 0 then 10 points at +1.2 sigma: rule 4 (8 in a row above) fires from the 8th
    // point of the run on (Western Electric rule 4 as in spc-reference §3; the grouping is common practice).
    const base = [0.3, -0.2, 0.1, -0.4, 0.2, -0.1, 0.5, -0.3, 0.0, 0.2, -0.2, 0.1, -0.5, 0.3, -0.1, 0.4, -0.3, 0.2, -0.2, 0.1];
    const run = Array.from({ length: 10 }, (_, i) => 1.2 + (i % 2 ? 0.1 : -0.1));
    const a = analyze({ chart: 'xmr', individuals: [...base, ...run], phases: [{ start: 0, baselineCount: 20 }], rules: ['we4'] });
    const we4 = a.signals.filter((s) => s.rule === 'we4');
    // It fires at every point from the 8th above the centre line to the end (the last baseline point is above too).
    const first = we4[0]!.index;
    expect(we4.map((s) => s.index)).toEqual(Array.from({ length: 30 - first }, (_, i) => first + i));
    expect(we4.length).toBeGreaterThanOrEqual(3);
    expect(new Set(episodeStarts(we4))).toEqual(new Set([first]));
  });
});

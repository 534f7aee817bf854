import { describe, expect, it } from 'vitest';
import { paretoOfCauses } from '../../src/app/pareto';
import { iso, makeResponse, T0 } from './helpers';

const HOUR = 3_600_000;
const answer = (causeCategory: string, cause: string | undefined, hoursAfter: number) =>
  makeResponse('0190f1c2-0000-7000-8000-000000000001', { causeCategory, ...(cause ? { cause } : {}), respondedAt: iso(T0 + hoursAfter * HOUR) });

describe('paretoOfCauses()', () => {
  const responses = [
    answer('Machine', 'Worn insert', 1), answer('Material', 'New bar batch', 2), answer('Machine', 'Worn insert', 3),
    answer('Machine', 'Coolant low', 4), answer('Measurement', undefined, 5), answer('Material', 'New bar batch', 6),
    answer('Method', 'Skipped warm-up', 50),
  ];

  it('ranks the categories, most frequent first, with shares that run up to 1', () => {
    const bars = paretoOfCauses(responses, T0, T0 + 24 * HOUR);
    expect(bars.map((b) => [b.category, b.count])).toEqual([['Machine', 3], ['Material', 2], ['Measurement', 1]]);
    expect(bars.map((b) => b.cumulative)).toEqual([3 / 6, 5 / 6, 1]);
    expect(bars[0]!.causes).toEqual([{ cause: 'Worn insert', count: 2 }, { cause: 'Coolant low', count: 1 }]);
  });

  it('counts only the answers of the period and is empty when there are none', () => {
    expect(paretoOfCauses(responses, T0 + 40 * HOUR, T0 + 60 * HOUR).map((b) => b.category)).toEqual(['Method']);
    expect(paretoOfCauses([], T0, T0 + HOUR)).toEqual([]);
  });
});

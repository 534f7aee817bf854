import { describe, expect, it } from 'vitest';
import type { Signal } from '../../src/engine/types';
import { groupSignals, signalsAt, signalsAtNewest } from '../../src/app/signal-state';
import { analysisWith, iso, makeAck, makeResponse, MINUTE, newId, T0 } from './helpers';

const we1 = (index: number, companion = false): Signal => ({
  rule: 'we1', index, points: companion ? [index - 1, index] : [index], side: 'above',
  explanation: companion ? '1 moving range above its upper control limit' : '1 point above the upper control limit',
  ...(companion ? { companion: true } : {}),
});
const we2 = (index: number): Signal => ({ rule: 'we2', index, points: [index - 2, index - 1, index], side: 'above', explanation: '2 of 3 points beyond 2 sigma above the centre' });

const ids = Array.from({ length: 8 }, () => newId());

describe('groupSignals', () => {
  it('groups the signals by the sample they fired at, newest first', () => {
    const analysis = analysisWith(8, [we1(2), we2(5), we1(5), we1(5, true)]);
    const groups = groupSignals(analysis, ids, [], []);
    expect(groups.map((g) => g.sampleId)).toEqual([ids[5], ids[2]]);
    expect(groups.map((g) => g.index)).toEqual([5, 2]);
    expect(groups[0]!.signals.map((s) => `${s.rule}${s.companion ? '-mr' : ''}`)).toEqual(['we2', 'we1', 'we1-mr']);
  });

  it('no signals, no groups', () => {
    expect(groupSignals(analysisWith(8, []), ids, [], [])).toEqual([]);
  });

  it('unanswered until a response for that sample exists', () => {
    const [g] = groupSignals(analysisWith(8, [we1(3)]), ids, [makeResponse(ids[4]!)], []);
    expect(g).toMatchObject({ sampleId: ids[3], state: 'unanswered' });
    expect(g!.response).toBeUndefined();
    expect(g!.ack).toBeUndefined();
  });

  it('historical (not open) when it fired at an imported sample and nobody answered it; answered and closed as usual once someone does', () => {
    const analysis = analysisWith(8, [we1(3), we1(6)]);
    const imported = new Set([ids[3]!]);
    const groups = groupSignals(analysis, ids, [], [], imported);
    expect(groups.map((g) => [g.index, g.state])).toEqual([[6, 'unanswered'], [3, 'historical']]);
    const r = makeResponse(ids[3]!);
    expect(groupSignals(analysis, ids, [r], [], imported).find((g) => g.index === 3)?.state).toBe('answered');
    expect(groupSignals(analysis, ids, [r], [makeAck(r.id)], imported).find((g) => g.index === 3)?.state).toBe('closed');
  });

  it('answered once a response exists, closed once a supervisor acknowledges it', () => {
    const r = makeResponse(ids[3]!);
    const analysis = analysisWith(8, [we1(3)]);
    expect(groupSignals(analysis, ids, [r], [])[0]).toMatchObject({ state: 'answered', response: r });
    const ack = makeAck(r.id);
    expect(groupSignals(analysis, ids, [r], [ack])[0]).toMatchObject({ state: 'closed', response: r, ack });
  });

  it('an acknowledgement of some other response does not close the group', () => {
    const r = makeResponse(ids[3]!);
    const analysis = analysisWith(8, [we1(3)]);
    expect(groupSignals(analysis, ids, [r], [makeAck(newId())])[0]!.state).toBe('answered');
  });

  it('the latest response wins, whatever order they arrive in', () => {
    const older = makeResponse(ids[3]!, { respondedAt: iso(T0 + 5 * MINUTE), whatHappened: 'First look' });
    const newer = makeResponse(ids[3]!, { respondedAt: iso(T0 + 30 * MINUTE), whatHappened: 'Found the cause' });
    const analysis = analysisWith(8, [we1(3)]);
    for (const order of [[older, newer], [newer, older]]) {
      const [g] = groupSignals(analysis, ids, order, []);
      expect(g!.response?.whatHappened).toBe('Found the cause');
    }
  });

  it('a sign-off of a superseded response does not close a group whose latest response is newer', () => {
    const older = makeResponse(ids[3]!, { respondedAt: iso(T0 + 5 * MINUTE) });
    const newer = makeResponse(ids[3]!, { respondedAt: iso(T0 + 30 * MINUTE) });
    const [g] = groupSignals(analysisWith(8, [we1(3)]), ids, [older, newer], [makeAck(older.id)]);
    expect(g).toMatchObject({ state: 'answered', response: newer });
  });

  it('each group has its own state', () => {
    const r2 = makeResponse(ids[2]!);
    const r5 = makeResponse(ids[5]!);
    const groups = groupSignals(analysisWith(8, [we1(2), we1(5), we1(7)]), ids, [r2, r5], [makeAck(r2.id)]);
    expect(groups.map((g) => [g.index, g.state])).toEqual([[7, 'unanswered'], [5, 'answered'], [2, 'closed']]);
  });

  it('skips a signal whose point has no sample id', () => {
    const groups = groupSignals(analysisWith(8, [we1(2)]), ids.slice(0, 2), [], []);
    expect(groups).toEqual([]);
  });
});

describe('signalsAtNewest', () => {
  it('returns only the signals that fired at the newest point (main and companion)', () => {
    const analysis = analysisWith(8, [we1(2), we1(7), we2(7), we1(7, true)]);
    expect(signalsAtNewest(analysis).map((s) => [s.rule, s.index, s.companion === true])).toEqual([
      ['we1', 7, false], ['we2', 7, false], ['we1', 7, true],
    ]);
  });

  it('nothing when the newest point is clean, even if older points fired', () => {
    expect(signalsAtNewest(analysisWith(8, [we1(2), we1(6)]))).toEqual([]);
  });

  it('nothing for an empty chart', () => {
    expect(signalsAtNewest(analysisWith(0, []))).toEqual([]);
  });
});

describe('signalsAt', () => {
  it('returns the signals that fired at that point, whether or not it is the newest', () => {
    const analysis = analysisWith(8, [we1(2), we2(5), we1(5, true), we1(7)]);
    expect(signalsAt(analysis, 5).map((s) => [s.rule, s.companion === true])).toEqual([['we2', false], ['we1', true]]);
    expect(signalsAt(analysis, 7).map((s) => s.index)).toEqual([7]);
    expect(signalsAt(analysis, 3)).toEqual([]);
  });

  it('nothing for a sample that is not on the chart (index -1)', () => {
    expect(signalsAt(analysisWith(8, [we1(7)]), -1)).toEqual([]);
  });
});

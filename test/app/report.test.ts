import { describe, expect, it } from 'vitest';
import { buildCharacteristicView } from '../../src/app/build-view';
import { limitsHistory } from '../../src/app/limits-history';
import { correctionLines, withdrawalLine } from '../../src/app/phase-change';
import {
  capabilityScope, limitsInRange, phasesInRange, reportHeader, reportRange, rulesText, signalCounts, signalsInRange, specificationText,
} from '../../src/app/report';
import type { SignalGroup } from '../../src/app/signal-state';
import { BASELINE, MINUTE, T0, individuals, iso, makeAck, makeCharacteristic, makePhase, makeResponse, sampleAt } from './helpers';

const HOUR = 60 * MINUTE;
const DAY = 24 * HOUR;
const SETUP = {
  sites: [{ id: 'site-1', name: 'Works' }],
  lines: [{ id: 'ln-1', siteId: 'site-1', name: 'Line 1' }],
  stations: [{ id: 'st-1', lineId: 'ln-1', name: 'Press 4' }],
};

/** One sample a day for `days` days from T0, each at 10 except where `at` says otherwise. */
function daily(days: number, at: Record<number, number> = {}) {
  return Array.from({ length: days }, (_, i) => sampleAt(i * 24 * 60, { values: [at[i] ?? (BASELINE[i % BASELINE.length] ?? 10)] }));
}

describe('reportRange()', () => {
  const ch = makeCharacteristic();
  const samples = daily(40);
  const now = T0 + 39 * DAY + HOUR; // an hour after the 40th sample
  const view = buildCharacteristicView(ch, [], samples, [], [], now);

  it('whole history: every point', () => {
    expect(reportRange(view, 'all', now)).toEqual({ from: 0, to: 40 });
  });

  it('last 7 and 30 days: the samples taken since that many days before now', () => {
    // Samples on days 0..39; now is day 39 + 1 h, so 7 days back is day 32 + 1 h: days 33..39 (7 samples).
    expect(reportRange(view, 'last-7-days', now)).toEqual({ from: 33, to: 40 });
    expect(reportRange(view, 'last-30-days', now)).toEqual({ from: 10, to: 40 });
  });

  it('a period with no samples is empty (from = to), never negative', () => {
    expect(reportRange(view, 'last-7-days', now + 60 * DAY)).toEqual({ from: 40, to: 40 });
  });

  it('current phase: from the first point of the last phase', () => {
    const phases = [makePhase({ number: 1, startsAt: iso(T0) }), makePhase({ number: 2, startsAt: iso(T0 + 25 * DAY - HOUR), reason: 'New holder' })];
    const phased = buildCharacteristicView(ch, phases, samples, [], [], now);
    expect(reportRange(phased, 'current-phase', now)).toEqual({ from: 25, to: 40 });
    // One phase only: the current phase is the whole history.
    expect(reportRange(view, 'current-phase', now)).toEqual({ from: 0, to: 40 });
  });
});

describe('specificationText()', () => {
  it('two-sided with target, to the gauge resolution', () => {
    expect(specificationText({ lsl: 22, target: 25, usl: 28 }, 1)).toBe('LSL 22.0 · target 25.0 · USL 28.0');
  });
  it('one-sided says which side it bounds', () => {
    expect(specificationText({ usl: 0.5 }, 2)).toBe('USL 0.50 · one-sided: upper limit only, no lower limit');
    expect(specificationText({ lsl: 12 }, 0)).toBe('LSL 12 · one-sided: lower limit only, no upper limit');
  });
  it('none', () => {
    expect(specificationText({}, 2)).toBe('No specification');
    expect(specificationText({ target: 5 }, 1)).toBe('No specification limits · target 5.0');
  });
});

describe('rulesText()', () => {
  it('groups the rule families, in order', () => {
    expect(rulesText({ chartType: 'xmr', rules: ['n6', 'n1', 'we2', 'n2', 'we1'] })).toBe('Western Electric rules 1, 2 · Nelson tests 1, 2, 6');
    expect(rulesText({ chartType: 'xmr', rules: ['we1'] })).toBe('Western Electric rule 1');
    expect(rulesText({ chartType: 'xmr', rules: [] })).toBe('No run rules chosen');
  });
  it('EWMA and CUSUM name their own decision and design (defaults when none is set)', () => {
    expect(rulesText({ chartType: 'ewma', rules: [] })).toBe('EWMA beyond its limits (λ 0.2, L 2.962)');
    expect(rulesText({ chartType: 'cusum', rules: [], cusum: { k: 0.5, h: 4 } })).toBe('CUSUM beyond its decision interval (k 0.5σ, h 4σ)');
  });
});

describe('reportHeader()', () => {
  it('names where, what, the period (first and last sample) and who printed it when', () => {
    const ch = makeCharacteristic({ name: 'Bolt torque', unit: 'N·m', decimals: 1, spec: { lsl: 22, usl: 28, target: 25 }, rules: ['n1', 'n2'], safetyCritical: true });
    const samples = daily(10);
    const now = T0 + 9 * DAY + HOUR;
    const view = buildCharacteristicView(ch, [], samples, [], [], now);
    const range = reportRange(view, 'last-7-days', now);
    const h = reportHeader(view, SETUP, range, 'last-7-days', { name: 'Tomasz', role: 'supervisor' }, now);
    expect(h).toEqual({
      site: 'Works', line: 'Line 1', station: 'Press 4',
      characteristic: 'Bolt torque', unit: 'N·m',
      specification: 'LSL 22.0 · target 25.0 · USL 28.0',
      rules: 'Nelson tests 1, 2',
      periodLabel: 'Last 7 days',
      firstSampleAt: samples[3]!.takenAt, lastSampleAt: samples[9]!.takenAt, points: 7,
      printedAt: iso(now), printedBy: 'Tomasz (supervisor)',
      safetyCritical: true,
    });
  });

  it('an empty period has no first or last sample; an unknown station leaves the place out', () => {
    const ch = makeCharacteristic({ stationId: 'st-gone' });
    const view = buildCharacteristicView(ch, [], [], [], [], T0);
    const h = reportHeader(view, SETUP, reportRange(view, 'all', T0), 'all', undefined, T0);
    expect(h.firstSampleAt).toBeUndefined();
    expect(h.lastSampleAt).toBeUndefined();
    expect(h.points).toBe(0);
    expect(h.station).toBeUndefined();
    expect(h.site).toBeUndefined();
    expect(h.printedBy).toBe('not signed in');
  });
});

describe('signals of the period', () => {
  const ch = makeCharacteristic();
  // Points 21, 23 and 25 far above the baseline limits: Western Electric rule 1 (common practice: a point beyond 3 sigma).
  const samples = individuals([...BASELINE, 11, 10, 11, 10, 11]);
  const r21 = makeResponse(samples[20]!.id, { whatHappened: 'Chip' });
  const r23 = makeResponse(samples[22]!.id, { whatHappened: 'Chip again' });
  const ack = makeAck(r21.id);
  const view = buildCharacteristicView(ch, [], samples, [r21, r23], [ack], T0 + 30 * HOUR);

  it('keeps the groups that start or go on in the period, oldest first, with their answers', () => {
    const all = signalsInRange(view.groups, { from: 0, to: 25 });
    expect(all.map((g) => g.index)).toEqual([20, 22, 24]);
    expect(all.map((g) => g.state)).toEqual(['closed', 'answered', 'unanswered']);
    expect(all[0]!.response?.whatHappened).toBe('Chip');
    expect(all[0]!.ack?.id).toBe(ack.id);
    expect(signalCounts(all)).toEqual({ total: 3, open: 1, awaitingSignOff: 1, closed: 1, historical: 0 });
    // Only the last two points: the group at 24, and the moving-range pattern begun at 21 that fired on to 25.
    const tail = signalsInRange(view.groups, { from: 23, to: 25 });
    expect(tail.map((g) => g.index)).toEqual([20, 24]);
    expect(signalsInRange(view.groups, { from: 0, to: 20 })).toEqual([]);
  });

  it('counts by state from hand-built groups', () => {
    const g = (state: SignalGroup['state']): SignalGroup => ({ sampleId: state, index: 0, lastIndex: 0, signals: [], state });
    expect(signalCounts([g('unanswered'), g('unanswered'), g('closed'), g('historical')])).toEqual({ total: 4, open: 2, awaitingSignOff: 0, closed: 1, historical: 1 });
  });
});

describe('limitsInRange()', () => {
  const ch = makeCharacteristic();
  const samples = daily(40);
  const phases = [
    makePhase({ number: 1, startsAt: iso(T0), reason: 'First limits' }),
    makePhase({ number: 2, startsAt: iso(T0 + 25 * DAY - HOUR), reason: 'New holder', given: { centre: 10, sigma: 0.08 } }),
  ];
  const view = buildCharacteristicView(ch, phases, samples, [], [], T0 + 40 * DAY);

  it('is limitsHistory() itself, cut to the phases with points in the period', () => {
    const whole = limitsHistory(view.analysis, view.series, phases);
    expect(limitsInRange(view, phases, { from: 0, to: 40 })).toEqual(whole);
    expect(limitsInRange(view, phases, { from: 30, to: 40 })).toEqual([whole[1]]);
    expect(limitsInRange(view, phases, { from: 0, to: 10 })).toEqual([whole[0]]);
    expect(limitsInRange(view, phases, { from: 24, to: 26 }).map((r) => r.number)).toEqual([1, 2]);
  });

  it('capabilityScope() says when the studied phase reaches outside the period', () => {
    expect(capabilityScope(view, { from: 25, to: 40 })).toEqual({ phase: 2, from: 25, to: 40, outside: false });
    expect(capabilityScope(view, { from: 33, to: 40 })).toEqual({ phase: 2, from: 25, to: 40, outside: true });
  });
});

describe('phasesInRange(): corrected and withdrawn phases', () => {
  const ch = makeCharacteristic();
  const samples = daily(40);
  const phases = [
    makePhase({ number: 1, startsAt: iso(T0), reason: 'First limits' }),
    // Started at point 11, withdrawn two days later.
    makePhase({ number: 2, startsAt: iso(T0 + 10 * DAY - HOUR), reason: 'New insert', withdrawn: { at: iso(T0 + 12 * DAY), by: 'p-eng', note: 'Started by mistake: the insert was not changed' } }),
    // Started at point 21 first, then moved to point 26 with given limits.
    makePhase({
      number: 3, startsAt: iso(T0 + 25 * DAY - HOUR), reason: 'New holder, second fitting', given: { centre: 10, sigma: 0.08 },
      corrections: [{ at: iso(T0 + 26 * DAY), by: 'p-eng', note: 'The holder was fitted on day 25', was: { startsAt: iso(T0 + 20 * DAY - HOUR), reason: 'New holder' } }],
    }),
    // Started after the newest point and withdrawn before it had any.
    makePhase({ number: 4, startsAt: iso(T0 + 45 * DAY), reason: 'Gauge swap', withdrawn: { at: iso(T0 + 45 * DAY + HOUR), by: 'p-eng', note: 'Wrong characteristic' } }),
  ];
  const view = buildCharacteristicView(ch, phases, samples, [], [], T0 + 46 * DAY);

  it('lists the withdrawn phases among those in force, by number, with the points they would hold', () => {
    const all = phasesInRange(view, phases, { from: 0, to: 40 });
    expect(all.map((e) => [e.number, e.kind])).toEqual([[1, 'in-force'], [2, 'withdrawn'], [3, 'in-force'], [4, 'withdrawn']]);
    // Phase 2's points 11–25 are judged against phase 1; phase 4 never had points.
    expect(all[1]).toEqual({ kind: 'withdrawn', number: 2, phase: phases[1], from: 10, to: 25, judgedBy: 1 });
    expect(all[3]).toEqual({ kind: 'withdrawn', number: 4, phase: phases[3], from: 40, to: 40 });
    // The rows in force are limitsInRange()'s own, with the set-up phase (its corrections) beside them.
    const inForce = all.filter((e) => e.kind === 'in-force');
    expect(inForce.map((e) => e.row)).toEqual(limitsInRange(view, phases, { from: 0, to: 40 }));
    expect(inForce.map((e) => e.phase)).toEqual([phases[0], phases[2]]);
  });

  it('keeps a withdrawn phase only where its points (or, with none, its start) fall in the period', () => {
    const numbers = (from: number, to: number) => phasesInRange(view, phases, { from, to }).map((e) => e.number);
    expect(numbers(0, 10)).toEqual([1]); // phase 2 would begin at point 11
    expect(numbers(12, 20)).toEqual([1, 2]);
    expect(numbers(24, 26)).toEqual([1, 2, 3]);
    expect(numbers(30, 40)).toEqual([3, 4]);
    // A period that stops before the newest point leaves out the phase withdrawn after it.
    expect(numbers(30, 39)).toEqual([3]);
  });

  it('two withdrawn phases in a row each keep their own points, judged against the phase in force before them', () => {
    const both = phases.map((p) => (p.number === 3 ? { ...p, withdrawn: { at: iso(T0 + 27 * DAY), by: 'p-eng', note: 'Holder not changed after all' } } : p));
    const v = buildCharacteristicView(ch, both, samples, [], [], T0 + 46 * DAY);
    const withdrawn = phasesInRange(v, both, { from: 0, to: 40 }).filter((e) => e.kind === 'withdrawn');
    expect(withdrawn.map((e) => e.kind === 'withdrawn' && [e.number, e.from, e.to, e.judgedBy])).toEqual([[2, 10, 25, 1], [3, 25, 40, 1], [4, 40, 40, undefined]]);
  });

  it('says the corrections and the withdrawal in words, through the helpers the limits history uses', () => {
    const nameOf = (id: string) => (id === 'p-eng' ? 'Elif' : id);
    const time = (t: string) => t.slice(0, 10);
    expect(withdrawalLine(phases[1]!, nameOf, time)).toBe('Withdrawn 2026-12-14 by Elif: Started by mistake: the insert was not changed');
    expect(withdrawalLine(phases[2]!, nameOf, time)).toBeUndefined();
    expect(correctionLines(phases[2]!, ch, nameOf, time)).toEqual([
      'Corrected 2026-12-28 by Elif: The holder was fitted on day 25 (reason was “New holder”; started 2026-12-22; limits were from its first 20 subgroups)',
    ]);
  });
});

// @vitest-environment happy-dom
import { cleanup, fireEvent, render, screen, within } from '@testing-library/preact';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { buildCharacteristicView } from '../../src/app/build-view';
import type { Person } from '../../src/schema';
import { CharacteristicScreen } from '../../src/ui/CharacteristicScreen';
import { ReportScreen } from '../../src/ui/report/ReportScreen';
import { BASELINE, T0, individuals, iso, makeAck, makeCharacteristic, makePhase, makeResponse } from '../app/helpers';
import { fakeActions, readyState } from './helpers';

afterEach(cleanup);

const HOUR = 3_600_000;
const people: Person[] = [
  { id: 'p-op', name: 'Odile', login: 'odile', role: 'operator', active: true },
  { id: 'p-sup', name: 'Sven', login: 'sven', role: 'supervisor', active: true },
];
const ch = makeCharacteristic({ name: 'Bolt torque', unit: 'N·m', spec: { lsl: 9.5, usl: 10.5, target: 10 }, rules: ['we1'], safetyCritical: true });
// Points 21, 23 and 25 far above the baseline limits; 21 answered and signed off, 23 answered, 25 open.
const samples = individuals([...BASELINE, 11, 10, 11, 10, 11]);
const answered = makeResponse(samples[22]!.id, { whatHappened: 'Bar stock changed', causeCategory: 'Material', cause: 'New supplier', action: 'Quarantined the lot', respondedBy: 'p-op', respondedAt: iso(T0 + 22 * HOUR + 600_000) });
const closed = makeResponse(samples[20]!.id, { whatHappened: 'Clutch slipped', causeCategory: 'Machine', action: 'Replaced the clutch spring', respondedBy: 'p-op' });
const ack = makeAck(closed.id, { by: 'p-sup', note: 'Seen on the line.' });
const phases = [makePhase({ number: 1, startsAt: iso(T0), reason: 'First limits', characteristicId: ch.id })];
const now = T0 + 26 * HOUR;
const view = buildCharacteristicView(ch, phases, samples, [answered, closed], [ack], now);

function stateFor(person: Person) {
  const base = readyState([ch], { [ch.id]: view }, { person, now, screen: { name: 'report', characteristicId: ch.id } });
  return { ...base, setup: { ...base.setup, people, phases } };
}

const facts = () =>
  Object.fromEntries(within(screen.getByTestId('report-header')).getAllByRole('term').map((dt) => [dt.textContent, dt.nextElementSibling!.textContent]));

describe('ReportScreen', () => {
  it('heads the sheet with where, what, the specification, chart and rules, the period and who printed it', () => {
    render(<ReportScreen state={stateFor(people[0]!)} actions={fakeActions()} characteristicId={ch.id} />);
    expect(screen.getByRole('heading', { level: 1 }).textContent).toBe('Bolt torque');
    const f = facts();
    expect(f).toMatchObject({ Site: 'Works', Line: 'Line 1', Station: 'Press 4', Characteristic: 'Bolt torque (N·m)', Specification: 'LSL 9.50 · target 10.00 · USL 10.50', Chart: 'XmR', 'Rules in force': 'Western Electric rule 1' });
    expect(f.Period).toMatch(/^Whole history: .+ to .+, 25 points$/);
    expect(f.Printed).toMatch(/ by Odile \(operator\)$/);
    expect(screen.getByTestId('safety-caution').textContent).toContain('Safety-critical characteristic.');
    expect(screen.getByTestId('main-chart')).toBeTruthy();
    expect(screen.getByTestId('companion-chart')).toBeTruthy();
    // Nothing to tap or move on the printed chart.
    expect(screen.queryByRole('group', { name: 'Span of the chart' })).toBeNull();
  });

  it('lists limits by phase, and the signals oldest first with responses, sign-off and the open one marked', () => {
    render(<ReportScreen state={stateFor(people[0]!)} actions={fakeActions()} characteristicId={ch.id} />);
    expect(screen.getByTestId('report-phase-1').textContent).toMatch(/Phase 1.*First limits.*Baseline of 20 subgroups/);
    const rows = within(screen.getByTestId('report-signals')).getAllByTestId('report-signal-row');
    expect(rows.map((r) => r.getAttribute('data-state'))).toEqual(['closed', 'answered', 'unanswered']);
    expect(rows[0]!.textContent).toMatch(/Point 21.*Signed off.*Clutch slipped.*Cause: Machine.*Action: Replaced the clutch spring.*Answered: Odile.*Signed off: Sven.*Seen on the line\./);
    expect(rows[1]!.textContent).toMatch(/Point 23.*Answered, awaiting sign-off.*Bar stock changed.*Cause: Material: New supplier.*Action: Quarantined the lot.*Answered: Odile.*Signed off: not yet/);
    expect(rows[2]!.textContent).toMatch(/Point 25.*OPEN: no answer yet.*No response recorded\./);
    expect(screen.getByTestId('report-signal-summary').textContent).toBe('3 signals in this period: 1 open (no answer yet), 1 awaiting sign-off, 1 signed off.');
  });

  it('puts the stability caution first in the capability section when the period has signals', () => {
    render(<ReportScreen state={stateFor(people[0]!)} actions={fakeActions()} characteristicId={ch.id} />);
    const panel = screen.getByTestId('capability-panel');
    const cautions = panel.querySelectorAll('.caution');
    expect(cautions[0]!.getAttribute('data-testid')).toBe('report-stability-caution');
    expect(cautions[0]!.textContent).toContain('3 signals in the period of this report, 1 still open');
    expect(panel.textContent).toContain('Cpk');
  });

  it('the period choice narrows the sheet: the last 7 days hold the last points only', () => {
    // Samples are an hour apart: move the clock so that only the last two (points 24 and 25) fall in the last 7 days.
    const later = { ...stateFor(people[0]!), now: T0 + 23 * HOUR + 7 * 24 * HOUR };
    render(<ReportScreen state={later} actions={fakeActions()} characteristicId={ch.id} />);
    fireEvent.click(screen.getByTestId('period-last-7-days'));
    expect(screen.getByTestId('period-last-7-days').getAttribute('aria-pressed')).toBe('true');
    expect(facts().Period).toMatch(/^Last 7 days: .+, 2 points$/);
    // The moving-range pattern begun at point 21 went on firing up to 25: it stays, with the open point 25; point 23 is out.
    expect(within(screen.getByTestId('report-signals')).getAllByTestId('report-signal-row').map((r) => r.getAttribute('data-state'))).toEqual(['closed', 'unanswered']);
    expect(screen.getByText(/Studied over the whole of phase 1: points 1 to 25/)).toBeTruthy();
  });

  it('Print calls the browser print; back returns to the characteristic', () => {
    const print = vi.fn();
    window.print = print; // happy-dom has no print
    const actions = fakeActions();
    render(<ReportScreen state={stateFor(people[0]!)} actions={actions} characteristicId={ch.id} />);
    fireEvent.click(screen.getByTestId('print-report'));
    expect(print).toHaveBeenCalledTimes(1);
    fireEvent.click(screen.getByRole('button', { name: '← Bolt torque' }));
    expect(actions.open).toHaveBeenCalledWith({ name: 'characteristic', characteristicId: ch.id });
  });

  it('the characteristic screen offers “Print report” to everyone signed in', () => {
    for (const person of people) {
      const actions = fakeActions();
      const { unmount } = render(<CharacteristicScreen state={stateFor(person)} actions={actions} characteristicId={ch.id} separator="." />);
      fireEvent.click(screen.getByRole('button', { name: 'Print report' }));
      expect(actions.open).toHaveBeenCalledWith({ name: 'report', characteristicId: ch.id });
      unmount();
    }
  });

  it('no capability section without a specification; an empty period says so', () => {
    const bare = makeCharacteristic({ spec: {} });
    const v = buildCharacteristicView(bare, [], samples, [], [], now);
    const s = readyState([bare], { [bare.id]: v }, { now: now + 90 * 24 * HOUR });
    render(<ReportScreen state={s} actions={fakeActions()} characteristicId={bare.id} />);
    expect(screen.queryByTestId('capability-panel')).toBeNull();
    expect(facts().Specification).toBe('No specification');
    fireEvent.click(screen.getByTestId('period-last-30-days'));
    expect(screen.getByTestId('report-empty').textContent).toBe('No samples were taken in this period.');
    expect(screen.queryByTestId('main-chart')).toBeNull();
    expect(screen.getByTestId('report-signal-summary').textContent).toBe('No run rule fired in this period.');
  });

  it('limits by phase: a corrected phase says what it replaced, by whom, when and why; a withdrawn one is marked, with its note', () => {
    const eng: Person = { id: 'p-eng', name: 'Elif', login: 'elif', role: 'engineer', active: true };
    const changed = [
      phases[0]!,
      makePhase({ number: 2, characteristicId: ch.id, startsAt: iso(T0 + 10 * HOUR - 60_000), reason: 'New insert', withdrawn: { at: iso(T0 + 12 * HOUR), by: 'p-eng', note: 'Started by mistake' } }),
      makePhase({
        number: 3, characteristicId: ch.id, startsAt: iso(T0 + 15 * HOUR - 60_000), reason: 'New holder, refitted', given: { centre: 10, sigma: 0.1 },
        corrections: [{ at: iso(T0 + 16 * HOUR), by: 'p-eng', note: 'Wrong reason typed', was: { startsAt: iso(T0 + 15 * HOUR - 60_000), reason: 'New holder', given: { centre: 10, sigma: 0.1 } } }],
      }),
    ];
    const v = buildCharacteristicView(ch, changed, samples, [], [], now);
    const base = readyState([ch], { [ch.id]: v }, { person: people[0]!, now });
    render(<ReportScreen state={{ ...base, setup: { ...base.setup, people: [...people, eng], phases: changed } }} actions={fakeActions()} characteristicId={ch.id} />);
    const rows = within(screen.getByTestId('report-limits')).getAllByRole('row').slice(1);
    expect(rows.map((r) => r.getAttribute('data-testid'))).toEqual(['report-phase-1', 'report-phase-2', 'report-phase-3']);
    const withdrawn = screen.getByTestId('report-phase-2');
    expect(withdrawn.getAttribute('data-withdrawn')).toBe('true');
    expect(withdrawn.textContent).toMatch(/^Phase 2 Withdrawn.*New insert/);
    expect(within(withdrawn).getByTestId('report-phase-note').textContent).toMatch(/^Withdrawn .+ by Elif: Started by mistake$/);
    // Points 11 to 15 (phase 2 began at point 11, phase 3 at point 16) fall back to phase 1.
    expect(withdrawn.textContent).toContain("Not used: points 11–15 are judged against phase 1's limits.");
    const corrected = screen.getByTestId('report-phase-3');
    expect(within(corrected).getByTestId('report-phase-note').textContent).toMatch(/^Corrected .+ by Elif: Wrong reason typed \(reason was “New holder”\)$/);
    expect(screen.getByTestId('report-phase-1').querySelector('[data-testid="report-phase-note"]')).toBeNull();
    expect(screen.getByText(/A correction names what it replaced, who made it, when and why/)).toBeTruthy();
  });

  it('signals in imported history name the file and line and read as never asked for, not as open', () => {
    const imp = samples.map((s, i) => (i >= 20 ? { ...s, imported: { file: 'paper log 2025.csv', line: i + 2 } } : s));
    const v = buildCharacteristicView(ch, phases, imp, [], [], now);
    const base = readyState([ch], { [ch.id]: v }, { person: people[0]!, now });
    render(<ReportScreen state={{ ...base, setup: { ...base.setup, people, phases } }} actions={fakeActions()} characteristicId={ch.id} />);
    const rows = within(screen.getByTestId('report-signals')).getAllByTestId('report-signal-row');
    expect(rows.map((r) => r.getAttribute('data-state'))).toEqual(['historical', 'historical', 'historical']);
    expect(rows[0]!.textContent).toMatch(/^Point 21.*In imported history, not answered.*Imported from paper log 2025\.csv, line 22\./);
    expect(rows[0]!.textContent).toContain('No response recorded: it fired in history imported from a file, where no answer was asked for.');
    expect(rows[0]!.textContent).toContain('Answered: not asked for (imported history)');
    expect(rows[0]!.querySelector('.report-open')).toBeNull();
    expect(screen.getByTestId('report-signal-summary').textContent).toBe('3 signals in this period: 0 open (no answer yet), 0 awaiting sign-off, 0 signed off, 3 in imported history.');
  });
});

// @vitest-environment happy-dom
import { cleanup, fireEvent, render, screen } from '@testing-library/preact';
import { afterEach, describe, expect, it } from 'vitest';
import { buildCharacteristicView } from '../../src/app/build-view';
import type { Person, Phase } from '../../src/schema';
import { LimitsHistoryScreen } from '../../src/ui/setup/LimitsHistoryScreen';
import { PhaseChangeScreen } from '../../src/ui/setup/PhaseChangeScreen';
import { BASELINE, individuals, makeCharacteristic, makePhase, T0, iso } from '../app/helpers';
import { fakeActions, readyState } from './helpers';

afterEach(cleanup);

const engineer: Person = { id: 'p-eng', name: 'Esme', login: 'esme', role: 'engineer', active: true };
const ch = makeCharacteristic();
const samples = individuals([...BASELINE, 10.4, 10.5, 10.45, 10.5, 10.4, 10.45]);
const p1 = makePhase({ id: 'ch-bore:phase-1', number: 1, startsAt: iso(T0), reason: 'Limits as first set up' });
const p2 = makePhase({ id: 'ch-bore:phase-2', number: 2, startsAt: samples[20]!.takenAt, reason: 'New insert holdr', baselineCount: 5 });
const NOW = T0 + 40 * 3_600_000;

function stateWith(phases: Phase[], person: Person = engineer) {
  const view = buildCharacteristicView(ch, phases, samples, [], [], NOW);
  const base = readyState([ch], { [ch.id]: view }, { person, now: NOW });
  return { ...base, setup: { ...base.setup, phases, people: [engineer] } };
}

describe('PhaseChangeScreen', () => {
  it('corrects the reason only after a note and a confirmation that says the chart stays as it is', () => {
    const actions = fakeActions();
    render(<PhaseChangeScreen state={stateWith([p1, p2])} actions={actions} characteristicId={ch.id} phaseId={p2.id} />);
    expect(screen.getByTestId('phase-now').textContent).toMatch(/starts at point 21/);
    fireEvent.input(screen.getByLabelText('Reason: the documented process change'), { target: { value: 'New insert holder' } });
    fireEvent.click(screen.getByTestId('save-change'));
    expect(screen.getByText('Say why the phase is being changed.')).toBeTruthy();
    expect(screen.queryByTestId('confirm-change')).toBeNull();
    fireEvent.input(screen.getByLabelText('Why this correction'), { target: { value: 'Typo in the reason' } });
    fireEvent.click(screen.getByTestId('save-change'));
    expect(actions.saveSetup).not.toHaveBeenCalled();
    expect(screen.getByTestId('confirm-change').textContent).toMatch(/Only the reason changes, to “New insert holder”: the chart stays as it is\./);
    fireEvent.click(screen.getByTestId('confirm-change-yes'));
    const [entries] = actions.saveSetup.mock.calls[0]!;
    expect(entries).toEqual([{ kind: 'phase', id: p2.id, body: { ...p2, reason: 'New insert holder', corrections: [{ at: expect.any(String), by: 'p-eng', note: 'Typo in the reason', was: { startsAt: p2.startsAt, reason: 'New insert holdr', baselineCount: 5 } }] } }]);
  });

  it('withdraws with a required note, saying which points go back to which limits', () => {
    const actions = fakeActions();
    render(<PhaseChangeScreen state={stateWith([p1, p2])} actions={actions} characteristicId={ch.id} phaseId={p2.id} />);
    fireEvent.click(screen.getByTestId('withdraw-phase'));
    expect(screen.getByText('Say why the phase is withdrawn.')).toBeTruthy();
    fireEvent.input(screen.getByTestId('withdraw-note'), { target: { value: 'Started on the wrong characteristic' } });
    fireEvent.click(screen.getByTestId('withdraw-phase'));
    expect(screen.getByTestId('confirm-withdraw').textContent).toContain("Phase 2 will be withdrawn: points 21–26 will be judged against phase 1's limits.");
    fireEvent.click(screen.getByTestId('confirm-withdraw-yes'));
    const [entries] = actions.saveSetup.mock.calls[0]!;
    expect(entries[0].body.withdrawn).toMatchObject({ by: 'p-eng', note: 'Started on the wrong characteristic' });
  });

  it('refuses operators and supervisors', () => {
    for (const role of ['operator', 'supervisor'] as const) {
      const { unmount } = render(<PhaseChangeScreen state={stateWith([p1, p2], { ...engineer, role })} actions={fakeActions()} characteristicId={ch.id} phaseId={p2.id} />);
      expect(screen.getByText(/Only a quality engineer or an admin/)).toBeTruthy();
      expect(screen.queryByTestId('phase-change-form')).toBeNull();
      unmount();
    }
  });
});

describe('LimitsHistoryScreen with corrected and withdrawn phases', () => {
  it('offers the correction to engineers only, for phases after the first', () => {
    for (const role of ['operator', 'supervisor', 'engineer', 'admin'] as const) {
      const actions = fakeActions();
      const { unmount } = render(<LimitsHistoryScreen state={stateWith([p1, p2], { ...engineer, role })} actions={actions} characteristicId={ch.id} />);
      const allowed = role === 'engineer' || role === 'admin';
      expect([!!screen.queryByTestId('change-phase-1'), !!screen.queryByTestId('change-phase-2')]).toEqual([false, allowed]);
      if (allowed) {
        fireEvent.click(screen.getByTestId('change-phase-2'));
        expect(actions.open).toHaveBeenCalledWith({ name: 'edit-phase', characteristicId: ch.id, phaseId: p2.id });
      }
      unmount();
    }
  });

  it('keeps a withdrawn phase listed, marked withdrawn with its note, and a correction note under the reason', () => {
    const p3 = makePhase({ id: 'ch-bore:phase-3', number: 3, startsAt: samples[23]!.takenAt, reason: 'Wrong chart', withdrawn: { at: iso(NOW), by: 'p-eng', note: 'Started by mistake' } });
    const fixed = { ...p2, reason: 'New insert holder', corrections: [{ at: iso(NOW), by: 'p-eng', note: 'Typo in the reason', was: { startsAt: p2.startsAt, reason: 'New insert holdr', baselineCount: 5 } }] };
    render(<LimitsHistoryScreen state={stateWith([p1, fixed, p3])} actions={fakeActions()} characteristicId={ch.id} />);
    expect(screen.getByTestId('history-row-3').textContent).toMatch(/Phase 3 withdrawn.*Wrong chart.*Withdrawn .* by Esme: Started by mistake/);
    expect(screen.getByTestId('history-row-2').textContent).toMatch(/New insert holderCorrected .* by Esme: Typo in the reason \(reason was “New insert holdr”\)/);
    expect(screen.getByTestId('history-row-2').textContent).toMatch(/Baseline of 5 subgroups/);
    expect(screen.queryByTestId('change-phase-3')).toBeNull();
  });
});

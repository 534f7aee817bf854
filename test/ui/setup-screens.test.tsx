// @vitest-environment happy-dom
import { cleanup, fireEvent, render, screen, within } from '@testing-library/preact';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { buildCharacteristicView } from '../../src/app/build-view';
import type { Person } from '../../src/schema';
import { CharacteristicScreen } from '../../src/ui/CharacteristicScreen';
import { CharacteristicEditor } from '../../src/ui/setup/CharacteristicEditor';
import { LimitsHistoryScreen } from '../../src/ui/setup/LimitsHistoryScreen';
import { PhaseScreen } from '../../src/ui/setup/PhaseScreen';
import { SetupScreen } from '../../src/ui/setup/SetupScreen';
import { TopBar } from '../../src/ui/TopBar';
import { PointDetails } from '../../src/ui/chart/PointDetails';
import { BASELINE, individuals, makeCharacteristic, makePhase, T0, iso } from '../app/helpers';
import { fakeActions, readyState } from './helpers';

afterEach(cleanup);

const engineer: Person = { id: 'p-eng', name: 'Esme', login: 'esme', role: 'engineer', active: true };
const type = (label: string, value: string) => fireEvent.input(screen.getByLabelText(label, { exact: true }), { target: { value } });

describe('who sees the set-up', () => {
  it('shows the entry points to engineers and admins only', () => {
    const ch = makeCharacteristic();
    const view = buildCharacteristicView(ch, [], individuals(BASELINE), [], [], T0);
    for (const role of ['operator', 'supervisor', 'engineer', 'admin'] as const) {
      const state = readyState([ch], { [ch.id]: view }, { person: { ...engineer, role } });
      const { unmount } = render(<><TopBar state={state} actions={fakeActions()} /><CharacteristicScreen state={state} actions={fakeActions()} characteristicId={ch.id} separator="." /></>);
      const allowed = role === 'engineer' || role === 'admin';
      expect([!!screen.queryByTestId('open-setup'), !!screen.queryByTestId('open-new-phase'), !!screen.queryByTestId('edit-characteristic')]).toEqual([allowed, allowed, allowed]);
      expect(screen.getByTestId('open-limits-history')).toBeTruthy(); // the history is for everyone to read
      unmount();
    }
  });

  it('the editor itself refuses other roles', () => {
    render(<CharacteristicEditor state={readyState([], {})} actions={fakeActions()} stationId="st-1" />);
    expect(screen.getByText(/Only a quality engineer or an admin/)).toBeTruthy();
  });
});

describe('CharacteristicEditor', () => {
  it('checks fields as they are typed, sends nothing until valid, then saves a schema-valid characteristic', async () => {
    const actions = fakeActions();
    render(<CharacteristicEditor state={readyState([], {}, { person: engineer })} actions={actions} stationId="st-1" />);
    type('Lower limit (LSL)', '10,5');
    type('Upper limit (USL)', '10.2');
    expect(screen.getByText('The upper limit must be above the lower limit.')).toBeTruthy();
    expect(screen.getByLabelText('Upper limit (USL)').getAttribute('aria-invalid')).toBe('true');
    expect(screen.queryByText('Required.')).toBeNull(); // untouched fields stay quiet until a save is tried
    fireEvent.click(screen.getByTestId('save-characteristic'));
    expect(actions.saveSetup).not.toHaveBeenCalled();
    expect(screen.getAllByText('Required.').length).toBeGreaterThanOrEqual(2);
    type('Name', 'Flange flatness');
    type('Unit (or what is counted)', 'mm');
    type('Upper limit (USL)', '10.9');
    type('Step 1', 'Re-clamp and re-measure');
    fireEvent.click(screen.getByTestId('save-characteristic'));
    expect(actions.saveSetup).toHaveBeenCalledTimes(1);
    const [entries, what] = actions.saveSetup.mock.calls[0]!;
    expect(what).toBe('The new characteristic “Flange flatness”');
    expect(entries).toEqual([{ kind: 'characteristic', id: 'flange-flatness', body: expect.objectContaining({
      id: 'flange-flatness', stationId: 'st-1', name: 'Flange flatness', unit: 'mm', chartType: 'xmr', subgroupSize: 1,
      spec: { lsl: 10.5, usl: 10.9 }, rules: ['we1', 'we2', 'we3', 'we4'], reactionPlan: ['Re-clamp and re-measure'], causeCategories: [], safetyCritical: false, baselineSize: 25,
    }) }]);
  });

  it('shows the EWMA design with its published defaults, the safety caution when flagged, and rule presets', () => {
    render(<CharacteristicEditor state={readyState([], {}, { person: engineer })} actions={fakeActions()} stationId="st-1" />);
    fireEvent.change(screen.getByTestId('chart-type'), { target: { value: 'ewma' } });
    expect((screen.getByLabelText('Weight λ (0–1)') as HTMLInputElement).value).toBe('0.2');
    expect((screen.getByLabelText('Limit width L (sigmas)') as HTMLInputElement).value).toBe('2.962');
    expect(screen.getByText(/Lucas & Saccucci, 1990/)).toBeTruthy();
    expect(screen.queryByRole('heading', { name: 'Run rules' })).toBeNull(); // EWMA has its own decision rule
    fireEvent.change(screen.getByTestId('chart-type'), { target: { value: 'xbar-r' } });
    expect((screen.getByLabelText('Subgroup size') as HTMLInputElement).value).toBe('5');
    fireEvent.click(screen.getByRole('button', { name: 'Nelson 1–8' }));
    expect(['n1', 'n8', 'we1'].map((r) => (screen.getByTestId(`rule-${r}`) as HTMLInputElement).checked)).toEqual([true, true, false]);
    expect(screen.queryByTestId('safety-caution')).toBeNull();
    fireEvent.click(screen.getByTestId('safety-critical'));
    expect(screen.getByTestId('safety-caution').textContent).toMatch(/does not replace the inspection/);
  });

  it('reorders and removes reaction-plan steps', () => {
    const ch = makeCharacteristic({ reactionPlan: ['A', 'B', 'C'] });
    const actions = fakeActions();
    render(<CharacteristicEditor state={readyState([ch], {}, { person: engineer })} actions={actions} characteristicId={ch.id} />);
    fireEvent.click(screen.getByRole('button', { name: 'Move step 3 up' }));
    fireEvent.click(screen.getByRole('button', { name: 'Remove step 1' }));
    fireEvent.click(screen.getByTestId('save-characteristic'));
    expect(actions.saveSetup.mock.calls[0]![0][0].body.reactionPlan).toEqual(['C', 'B']);
  });

  it('warns that a chart-type change on a characteristic with history should start a new phase', () => {
    const ch = makeCharacteristic();
    const view = buildCharacteristicView(ch, [], individuals(BASELINE), [], [], T0);
    render(<CharacteristicEditor state={readyState([ch], { [ch.id]: view }, { person: engineer })} actions={fakeActions()} characteristicId={ch.id} />);
    expect(screen.queryByTestId('phase-notice')).toBeNull();
    fireEvent.change(screen.getByTestId('chart-type'), { target: { value: 'ewma' } });
    expect(screen.getByTestId('phase-notice').textContent).toMatch(/20 points .* start a new phase/);
  });

  it('says plainly when offline, and keeps the typed form when saving fails', async () => {
    const actions = fakeActions();
    actions.saveSetup.mockResolvedValue(false);
    const state = readyState([], {}, { person: engineer, sync: { state: 'offline', pending: 0, rejected: 0 } });
    render(<CharacteristicEditor state={state} actions={actions} stationId="st-2" />);
    expect(screen.getByTestId('setup-offline').textContent).toMatch(/need a connection/);
    type('Name', 'Shaft runout');
    cleanup();
    // Back on the screen later: the draft is still there.
    render(<CharacteristicEditor state={state} actions={actions} stationId="st-2" />);
    expect((screen.getByLabelText('Name', { exact: true }) as HTMLInputElement).value).toBe('Shaft runout');
  });
});

describe('PhaseScreen', () => {
  const ch = makeCharacteristic();
  const samples = individuals([...BASELINE, 10.2, 10.3, 10.25, 10.3]);
  const view = buildCharacteristicView(ch, [], samples, [], [], T0);

  it('requires a reason, offers points after the current phase began, and sends phase 1 and 2 for a characteristic without phases', () => {
    const actions = fakeActions();
    render(<PhaseScreen state={readyState([ch], { [ch.id]: view }, { person: engineer, now: T0 + 30 * 3_600_000 })} actions={actions} characteristicId={ch.id} />);
    fireEvent.click(screen.getByTestId('save-phase'));
    expect(actions.saveSetup).not.toHaveBeenCalled();
    expect(screen.getByText('Required.')).toBeTruthy();
    fireEvent.input(screen.getByLabelText('Reason: the documented process change'), { target: { value: 'Spindle bearing replaced' } });
    fireEvent.click(screen.getByTestId('start-at-point'));
    const options = within(screen.getByTestId('start-point')).getAllByRole('option');
    expect(options).toHaveLength(23); // points 2–24: after the first point of the only phase
    fireEvent.change(screen.getByTestId('start-point'), { target: { value: samples[20]!.id } });
    fireEvent.click(screen.getByTestId('save-phase'));
    // Nothing is sent before the engineer has read what changes on the chart.
    expect(actions.saveSetup).not.toHaveBeenCalled();
    expect(screen.getByTestId('confirm-phase').textContent).toMatch(/Limits from point 21 on will be recomputed from the next 20 subgroups \(phase 2\)\. Points 1–20 keep phase 1's limits\./);
    fireEvent.click(screen.getByTestId('confirm-phase-yes'));
    const [entries] = actions.saveSetup.mock.calls[0]!;
    expect(entries.map((e: { body: { number: number; startsAt: string } }) => [e.body.number, e.body.startsAt])).toEqual([[1, samples[0]!.takenAt], [2, samples[20]!.takenAt]]);
  });

  it('asks only the centre for given limits on an attribute chart', () => {
    const p = makeCharacteristic({ chartType: 'p', subgroupSize: 50, decimals: 0 });
    const pv = buildCharacteristicView(p, [], [], [], [], T0);
    render(<PhaseScreen state={readyState([p], { [p.id]: pv }, { person: engineer })} actions={fakeActions()} characteristicId={p.id} />);
    fireEvent.click(screen.getByTestId('limits-given'));
    expect(screen.getByLabelText('Proportion defective p̄')).toBeTruthy();
    expect(screen.queryByLabelText(/Sigma of individual values/)).toBeNull();
  });
});

describe('LimitsHistoryScreen', () => {
  it('lists each phase with reason, how the limits were set and the change from the phase before', () => {
    const ch = makeCharacteristic();
    const samples = individuals([...BASELINE, 10.4, 10.5, 10.45, 10.5, 10.4]);
    const phases = [makePhase({ number: 1, startsAt: iso(T0), reason: 'First study' }), makePhase({ number: 2, startsAt: samples[20]!.takenAt, reason: 'New insert holder', baselineCount: 5 })];
    const view = buildCharacteristicView(ch, phases, samples, [], [], T0);
    render(<LimitsHistoryScreen state={readyState([ch], { [ch.id]: view }, { setup: { ...readyState([ch], {}).setup, phases } })} actions={fakeActions()} characteristicId={ch.id} />);
    const row1 = screen.getByTestId('history-row-1').textContent!;
    const row2 = screen.getByTestId('history-row-2').textContent!;
    expect(row1).toMatch(/First study.*Baseline of 20 subgroups/);
    expect(row1).not.toMatch(/provisional/);
    expect(row2).toMatch(/New insert holder.*Baseline of 5 subgroups — provisional/);
    expect(row2).toMatch(/\+0\.4\d{3}/); // the centre moved up by about 0.45 mm
    expect(screen.getByRole('button', { name: 'Print' })).toBeTruthy();
  });
});

describe('SetupScreen', () => {
  it('adds a station to a line with a readable id, and renames a line', async () => {
    const actions = fakeActions();
    render(<SetupScreen state={readyState([], {}, { person: engineer })} actions={actions} />);
    fireEvent.input(screen.getByLabelText('New station on Line 1'), { target: { value: 'Press 5' } });
    fireEvent.submit(screen.getByLabelText('New station on Line 1').closest('form')!);
    expect(actions.saveSetup).toHaveBeenLastCalledWith([{ kind: 'station', id: 'st-press-5', body: { id: 'st-press-5', lineId: 'ln-1', name: 'Press 5' } }], 'The new station Press 5');
    fireEvent.click(screen.getByRole('button', { name: 'Rename line Line 2' }));
    fireEvent.input(screen.getByLabelText('New name of the line'), { target: { value: '' } });
    fireEvent.submit(screen.getByLabelText('New name of the line').closest('form')!);
    expect(screen.getByText('Give a name.')).toBeTruthy();
    expect(actions.saveSetup).toHaveBeenCalledTimes(1);
  });
});

describe('SiteCausesEditor (on the set-up screen)', () => {
  it('starts from the usual six categories and saves the edited list under the site’s causes id', () => {
    const actions = fakeActions();
    render(<SetupScreen state={readyState([], {}, { person: engineer })} actions={actions} />);
    expect((screen.getByLabelText('Category 1') as HTMLInputElement).value).toBe('People');
    fireEvent.click(screen.getByRole('button', { name: 'Remove category 6' }));
    fireEvent.input(screen.getByLabelText('Category 1'), { target: { value: 'Operator' } });
    fireEvent.click(screen.getByTestId('save-site-causes'));
    expect(actions.saveSetup).toHaveBeenLastCalledWith(
      [{ kind: 'causes', id: 'site-1-causes', body: { siteId: 'site-1', categories: ['Operator', 'Machine', 'Method', 'Material', 'Measurement'] } }],
      "The site's cause categories",
    );
  });
});

describe('after saving a change that needs a new phase', () => {
  it('goes on to the new-phase screen', async () => {
    const ch = makeCharacteristic();
    const view = buildCharacteristicView(ch, [], individuals(BASELINE), [], [], T0);
    const actions = fakeActions();
    render(<CharacteristicEditor state={readyState([ch], { [ch.id]: view }, { person: engineer })} actions={actions} characteristicId={ch.id} />);
    fireEvent.change(screen.getByTestId('chart-type'), { target: { value: 'ewma' } });
    fireEvent.click(screen.getByTestId('save-characteristic'));
    await vi.waitFor(() => expect(actions.open).toHaveBeenCalledWith({ name: 'new-phase', characteristicId: ch.id }));
  });
});

describe('a refused or failed save', () => {
  it('puts the focus on the first field with a problem, and shows why a send failed beside the buttons', async () => {
    const actions = fakeActions();
    actions.saveSetup.mockResolvedValue(false);
    const state = readyState([], {}, { person: engineer, error: 'The new characteristic “X” was NOT saved: set-up changes need a connection to the site server.' });
    render(<CharacteristicEditor state={state} actions={actions} stationId="st-1" />);
    fireEvent.click(screen.getByTestId('save-characteristic'));
    await vi.waitFor(() => expect(document.activeElement).toBe(screen.getByLabelText('Name', { exact: true })));
    type('Name', 'X');
    type('Unit (or what is counted)', 'mm');
    type('Step 1', 'Stop');
    fireEvent.click(screen.getByTestId('save-characteristic'));
    await vi.waitFor(() => expect(screen.getByTestId('send-failed').textContent).toMatch(/need a connection/));
    expect((screen.getByLabelText('Name', { exact: true }) as HTMLInputElement).value).toBe('X');
  });
});

describe('a chart-type change the history cannot follow', () => {
  it('is refused with the reason, and nothing is sent', async () => {
    const ch = makeCharacteristic();
    const view = buildCharacteristicView(ch, [], individuals(BASELINE), [], [], T0);
    const actions = fakeActions();
    render(<CharacteristicEditor state={readyState([ch], { [ch.id]: view }, { person: engineer })} actions={actions} characteristicId={ch.id} />);
    fireEvent.change(screen.getByTestId('chart-type'), { target: { value: 'c' } });
    expect(screen.getByTestId('history-conflict').textContent).toMatch(/measurements; a count chart cannot plot them/);
    expect(screen.queryByTestId('phase-notice')).toBeNull();
    fireEvent.click(screen.getByTestId('save-characteristic'));
    await new Promise((r) => setTimeout(r, 10));
    expect(actions.saveSetup).not.toHaveBeenCalled();
  });
});

describe('a new phase from a point on the chart', () => {
  it('preselects the point the engineer chose', () => {
    const ch = makeCharacteristic();
    const samples = individuals([...BASELINE, 10.2, 10.3]);
    const view = buildCharacteristicView(ch, [], samples, [], [], T0);
    render(<PhaseScreen state={readyState([ch], { [ch.id]: view }, { person: engineer })} actions={fakeActions()} characteristicId={ch.id} fromSampleId={samples[20]!.id} />);
    expect((screen.getByTestId('start-at-point') as HTMLInputElement).checked).toBe(true);
    expect((screen.getByTestId('start-point') as HTMLSelectElement).value).toBe(samples[20]!.id);
  });
});

describe('PointDetails offers “New phase from here”', () => {
  it('to engineers, at points after the current phase began', () => {
    const ch = makeCharacteristic();
    const samples = individuals([...BASELINE, 10.2]);
    const view = buildCharacteristicView(ch, [], samples, [], [], T0);
    const actions = fakeActions();
    const { unmount } = render(<PointDetails view={view} index={20} state={readyState([ch], { [ch.id]: view }, { person: engineer })} actions={actions} onClose={() => {}} />);
    fireEvent.click(screen.getByTestId('phase-from-point'));
    expect(actions.open).toHaveBeenCalledWith({ name: 'new-phase', characteristicId: ch.id, fromSampleId: samples[20]!.id });
    unmount();
    render(<PointDetails view={view} index={20} state={readyState([ch], { [ch.id]: view })} actions={actions} onClose={() => {}} />);
    expect(screen.queryByTestId('phase-from-point')).toBeNull(); // not for an operator
  });
});

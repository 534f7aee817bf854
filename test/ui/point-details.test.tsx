// @vitest-environment happy-dom
import { cleanup, fireEvent, render, screen, waitFor } from '@testing-library/preact';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { buildCharacteristicView } from '../../src/app/build-view';
import type { Person } from '../../src/schema';
import { PointDetails } from '../../src/ui/chart/PointDetails';
import { BASELINE, individuals, makeCharacteristic, makeResponse, sampleAt, T0 } from '../app/helpers';
import { fakeActions, readyState } from './helpers';

afterEach(cleanup);

const operator: Person = { id: 'p-op', name: 'Odile', login: 'odile', role: 'operator', active: true };
const engineer: Person = { id: 'p-eng', name: 'Enzo', login: 'enzo', role: 'engineer', active: true };
const field = (name: string) => document.querySelector(`input[name="${name}"]`) as HTMLInputElement;
const type = (name: string, value: string) => fireEvent.input(field(name), { target: { value } });
const click = (name: string) => fireEvent.click(screen.getByRole('button', { name }));

function show(opts: { person?: Person; index?: number; chartType?: 'xmr' | 'p' | 'u' | 'c' } = {}) {
  const chartType = opts.chartType ?? 'xmr';
  const ch = makeCharacteristic(chartType === 'xmr' ? {} : { chartType, subgroupSize: 50, decimals: 0, unit: 'defectives' });
  const samples = chartType === 'xmr'
    ? individuals([...BASELINE, 11], { lot: 'L-9' })
    : [sampleAt(0, { values: undefined, count: 3, inspected: 50 }), sampleAt(60, { values: undefined, count: 4, inspected: 50 })];
  const responses = chartType === 'xmr' ? [makeResponse(samples[20]!.id, { whatHappened: 'Burr', causeCategory: 'Machine', action: 'Deburred' })] : [];
  const view = buildCharacteristicView(ch, [], samples, responses, [], T0);
  const base = readyState([ch], { [ch.id]: view }, { person: opts.person ?? operator });
  const state = { ...base, setup: { ...base.setup, people: [operator, engineer] } };
  const actions = fakeActions();
  const onClose = vi.fn();
  render(<PointDetails view={view} index={opts.index ?? 20} state={state} actions={actions} onClose={onClose} />);
  return { actions, onClose, samples, ch };
}

describe('PointDetails', () => {
  it('shows what is behind the point: values, limits there, who, lot, signals, the answer', () => {
    show();
    const text = screen.getByTestId('point-details').textContent!;
    expect(screen.getByRole('heading', { level: 3 }).textContent).toMatch(/^Point 21 · /);
    expect(text).toContain('11.00 mm');
    expect(text).toContain('Recorded by' + 'Odile');
    expect(text).toContain('L-9');
    expect(text).toContain('1 point above the upper control limit (Western Electric rule 1)');
    expect(text).toContain('Answer: Burr · Machine · Deburred — Odile');
  });

  it('a correction is prefilled, needs a reason and the right number of values, then goes to correct()', async () => {
    const { actions, onClose, samples } = show();
    click('Correct this sample');
    expect(field('correction').value).toBe('11');
    click('Save correction');
    expect(screen.getByRole('alert').textContent).toBe('Give a reason; it is kept with the record.');
    type('reason', 'Misread the gauge');
    type('correction', '10,1 10,2');
    click('Save correction');
    expect(screen.getByRole('alert').textContent).toBe('Enter 1 value, separated by spaces.');
    type('correction', '10,123');
    click('Save correction');
    expect(screen.getByRole('alert').textContent).toMatch(/reads to 2 decimals/);
    type('correction', ' 10,1 ');
    click('Save correction');
    await waitFor(() => expect(actions.correct).toHaveBeenCalledWith('ch-bore', samples[20]!.id, { values: [10.1] }, 'Misread the gauge'));
    await waitFor(() => expect(onClose).toHaveBeenCalled());
  });

  it('an attribute correction takes the count and the quantity inspected', async () => {
    const { actions, samples } = show({ chartType: 'p', index: 1 });
    click('Correct this sample');
    expect(field('correction').value).toBe('4 50');
    type('correction', '5 48');
    type('reason', 'Recounted');
    click('Save correction');
    await waitFor(() => expect(actions.correct).toHaveBeenCalledWith('ch-bore', samples[1]!.id, { count: 5, inspected: 48 }, 'Recounted'));
  });

  it('a count is a whole number', () => {
    const { actions } = show({ chartType: 'p', index: 1 });
    click('Correct this sample');
    type('correction', '4.5 50');
    type('reason', 'Recounted');
    click('Save correction');
    expect(screen.getByRole('alert').textContent).toMatch(/0 decimals/);
    expect(actions.correct).not.toHaveBeenCalled();
  });

  it('a u chart’s units inspected may have decimals', async () => {
    const { actions, samples } = show({ chartType: 'u', index: 0 });
    click('Correct this sample');
    type('correction', '12 2,5');
    type('reason', 'Measured the panel again');
    click('Save correction');
    await waitFor(() => expect(actions.correct).toHaveBeenCalledWith('ch-bore', samples[0]!.id, { count: 12, inspected: 2.5 }, 'Measured the panel again'));
  });

  it('only engineers (and admins) may leave a point out of the limits, with a reason', async () => {
    show();
    expect(screen.queryByRole('button', { name: 'Leave out of limits' })).toBeNull();
    cleanup();
    const { actions, onClose, samples } = show({ person: engineer, index: 3 });
    click('Leave out of limits');
    click('Leave out');
    expect(screen.getByRole('alert').textContent).toBe('Give a reason; it is kept with the record.');
    type('reason', 'Setting-up part');
    click('Leave out');
    await waitFor(() => expect(actions.setExcluded).toHaveBeenCalledWith('ch-bore', samples[3]!.id, true, 'Setting-up part'));
    await waitFor(() => expect(onClose).toHaveBeenCalled());
  });
});

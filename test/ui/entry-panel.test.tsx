// @vitest-environment happy-dom
import { act, cleanup, fireEvent, render, screen, waitFor } from '@testing-library/preact';
import { afterEach, describe, expect, it } from 'vitest';
import { EntryPanel } from '../../src/ui/EntryPanel';
import { BASELINE, individuals, makeCharacteristic, T0 } from '../app/helpers';
import { fakeActions, view } from './helpers';

afterEach(cleanup);

const input = (label: string) => screen.getByLabelText(label) as HTMLInputElement;
/** Taps a field (it takes the focus, as on the tablet) and types into it with the system keyboard. */
const tap = (label: string) => act(() => input(label).focus());
const typeInto = (label: string, value: string) => {
  tap(label);
  fireEvent.input(input(label), { target: { value } });
};
const press = (...keys: string[]) => {
  for (const k of keys) fireEvent.click(document.querySelector(`.keypad [data-key="${k}"]`)!);
};

describe('EntryPanel: variable charts', () => {
  const xbar = makeCharacteristic({ id: 'ch-xbar', chartType: 'xbar-r', subgroupSize: 3, decimals: 2 });

  it('one field per value; keypad digits go into the active field, Next moves on, the last key saves', async () => {
    const actions = fakeActions();
    render(<EntryPanel view={view(xbar, [], T0)} actions={actions} separator="," />);
    expect(screen.getAllByRole('textbox').filter((e) => e.id.startsWith('entry-')).map((e) => e.id)).toEqual(['entry-v0', 'entry-v1', 'entry-v2']);
    expect(input('Value 1').className).toBe('active');

    press('1', '0', 'sep', '0', '2');
    expect(input('Value 1').value).toBe('10,02');
    expect(screen.getByRole('button', { name: 'Next value' })).toBeTruthy();
    press('next');
    expect(input('Value 2').className).toBe('active');
    press('9', 'sep', '9', '8', 'next');
    press('1', '0', 'next'); // the last field: Next is "Save sample"
    await waitFor(() => expect(actions.record).toHaveBeenCalledTimes(1));
    expect(actions.record).toHaveBeenCalledWith('ch-xbar', { values: [10.02, 9.98, 10] });
    // After a successful save the fields are emptied and the first is active again.
    await waitFor(() => expect(input('Value 1').value).toBe(''));
    expect(input('Value 3').value).toBe('');
    expect(input('Value 1').className).toBe('active');
  });

  it('Enter in a field moves to the next field, and saves from the last', async () => {
    const actions = fakeActions();
    render(<EntryPanel view={view(xbar, [], T0)} actions={actions} separator="." />);
    typeInto('Value 1', '10.1');
    fireEvent.keyDown(input('Value 1'), { key: 'Enter' });
    expect(input('Value 2').className).toBe('active');
    expect(document.activeElement).toBe(input('Value 2'));
    typeInto('Value 2', '10,2'); // the other separator is read too
    fireEvent.keyDown(input('Value 2'), { key: 'Enter' });
    typeInto('Value 3', '-0.3');
    fireEvent.keyDown(input('Value 3'), { key: 'Enter' });
    await waitFor(() => expect(actions.record).toHaveBeenCalledWith('ch-xbar', { values: [10.1, 10.2, -0.3] }));
  });

  it('a field that does not parse is named, made active, and nothing is saved', () => {
    const actions = fakeActions();
    render(<EntryPanel view={view(xbar, [], T0)} actions={actions} separator="," />);
    typeInto('Value 1', '10,1');
    typeInto('Value 3', '10,123');
    fireEvent.keyDown(input('Value 3'), { key: 'Enter' });
    expect(screen.getByRole('alert').textContent).toBe('Value 2: Enter a value.');
    expect(input('Value 2').className).toBe('active');
    expect(document.activeElement).toBe(input('Value 2'));
    expect(input('Value 2').getAttribute('aria-invalid')).toBe('true');
    typeInto('Value 2', '10');
    typeInto('Value 3', '10,123');
    fireEvent.keyDown(input('Value 3'), { key: 'Enter' });
    expect(screen.getByRole('alert').textContent).toBe('Value 3: This gauge reads to 2 decimals; “10,123” has 3.');
    expect(actions.record).not.toHaveBeenCalled();
  });

  it('XmR: one field named with the unit; lot and comment go with the sample', async () => {
    const actions = fakeActions();
    const ch = makeCharacteristic();
    render(<EntryPanel view={view(ch, [], T0)} actions={actions} separator="," />);
    fireEvent.input(screen.getByLabelText('Lot or batch'), { target: { value: ' L-17 ' } });
    fireEvent.input(screen.getByLabelText('Comment'), { target: { value: 'after tool change' } });
    press('1', '0', 'minus');
    expect(input('Value (mm)').value).toBe('-10');
    press('minus', 'next');
    await waitFor(() => expect(actions.record).toHaveBeenCalledWith('ch-bore', { values: [10], lot: 'L-17', comment: 'after tool change' }));
  });

  it('a second tap on Save while the first save runs does not save twice', async () => {
    const actions = fakeActions();
    let finish!: (ok: boolean) => void;
    actions.record.mockImplementation(() => new Promise<boolean>((r) => { finish = r; }));
    render(<EntryPanel view={view(makeCharacteristic(), [], T0)} actions={actions} separator="," />);
    press('1', '0', 'next');
    expect(screen.getByRole('button', { name: 'Saving…' })).toBeTruthy();
    press('next', 'next'); // the fields were emptied at once: nothing to save again
    expect(actions.record).toHaveBeenCalledTimes(1);
    await act(() => finish(true));
    await waitFor(() => expect(screen.getByRole('button', { name: 'Save sample' })).toBeTruthy());
  });

  it('the next reading can be typed and saved while the last one is still being written (a gauge sends value and Enter)', async () => {
    const actions = fakeActions();
    const finishers: ((ok: boolean) => void)[] = [];
    actions.record.mockImplementation(() => new Promise<boolean>((r) => { finishers.push(r); }));
    render(<EntryPanel view={view(makeCharacteristic(), [], T0)} actions={actions} separator="," />);
    typeInto('Value (mm)', '10,1');
    fireEvent.keyDown(input('Value (mm)'), { key: 'Enter' });
    expect(input('Value (mm)').value).toBe(''); // emptied at once, before the write is done
    typeInto('Value (mm)', '10,2');
    fireEvent.keyDown(input('Value (mm)'), { key: 'Enter' });
    typeInto('Value (mm)', '10,3'); // typed while both are still being written
    expect(actions.record.mock.calls.map((c) => c[1])).toEqual([{ values: [10.1] }, { values: [10.2] }]);
    await act(() => { for (const f of finishers) f(true); });
    expect(input('Value (mm)').value).toBe('10,3'); // the end of a save does not wipe the next reading
  });

  it('a failed save gives back what was typed, unless a new reading is being typed', async () => {
    const actions = fakeActions();
    actions.record.mockResolvedValueOnce(false);
    render(<EntryPanel view={view(makeCharacteristic(), [], T0)} actions={actions} separator="," />);
    press('1', '0', 'next');
    await waitFor(() => expect(actions.record).toHaveBeenCalledTimes(1));
    await waitFor(() => expect(input('Value (mm)').value).toBe('10'));

    let fail!: (ok: boolean) => void;
    actions.record.mockImplementationOnce(() => new Promise<boolean>((r) => { fail = r; }));
    press('next'); // saves 10 again; this time the write fails later
    typeInto('Value (mm)', '11');
    await act(() => fail(false));
    expect(input('Value (mm)').value).toBe('11');
  });
});

describe('EntryPanel: typo guard', () => {
  // Baseline centre 10 with sigma ≈ 0.078: 6 sigma is about ±0.47.
  const ch = makeCharacteristic();
  const v = () => view(ch, individuals(BASELINE), T0 + 21 * 3_600_000);

  it('a value far from the usual ones asks for confirmation before anything is saved', async () => {
    const actions = fakeActions();
    render(<EntryPanel view={v()} actions={actions} separator="," />);
    press('1', '0', '0', 'next'); // 100 instead of 10,0
    const alert = screen.getByRole('alert');
    expect(alert.textContent).toContain('100,00 mm is far from the usual values (around 10,00). Check the reading.');
    expect(actions.record).not.toHaveBeenCalled();
    fireEvent.click(screen.getByRole('button', { name: 'It is correct — save' }));
    await waitFor(() => expect(actions.record).toHaveBeenCalledWith('ch-bore', { values: [100] }));
  });

  it('“Let me fix it” closes the question and saves nothing', () => {
    const actions = fakeActions();
    render(<EntryPanel view={v()} actions={actions} separator="." />);
    press('1', '0', '0', 'next');
    fireEvent.click(screen.getByRole('button', { name: 'Let me fix it' }));
    expect(screen.queryByRole('alert')).toBeNull();
    expect(actions.record).not.toHaveBeenCalled();
    expect(input('Value (mm)').value).toBe('100');
  });

  it('a genuine signal (beyond 3 sigma, within 6) is saved without a question', async () => {
    const actions = fakeActions();
    render(<EntryPanel view={v()} actions={actions} separator="." />);
    press('1', '0', 'sep', '3', 'next');
    await waitFor(() => expect(actions.record).toHaveBeenCalledWith('ch-bore', { values: [10.3] }));
    expect(screen.queryByRole('alert')).toBeNull();
  });

  it('no question before limits exist (no samples yet)', async () => {
    const actions = fakeActions();
    render(<EntryPanel view={view(ch, [], T0)} actions={actions} separator="." />);
    press('1', '0', '0', 'next');
    await waitFor(() => expect(actions.record).toHaveBeenCalledWith('ch-bore', { values: [100] }));
  });
});

describe('EntryPanel: attribute charts', () => {
  it('p: nonconforming items and items inspected (prefilled with the usual quantity), whole numbers only', async () => {
    const actions = fakeActions();
    const ch = makeCharacteristic({ id: 'ch-p', chartType: 'p', subgroupSize: 125, decimals: 0, unit: 'defectives' });
    render(<EntryPanel view={view(ch, [], T0)} actions={actions} separator="," />);
    expect(input('Items inspected').value).toBe('125');
    expect((screen.getByRole('button', { name: 'Decimal separator' }) as HTMLButtonElement).disabled).toBe(true);
    expect(screen.queryByRole('button', { name: 'Change sign' })).toBeNull();
    press('3', 'next', 'next');
    await waitFor(() => expect(actions.record).toHaveBeenCalledWith('ch-p', { count: 3, inspected: 125 }));
  });

  it('p: more nonconforming items than inspected is refused', () => {
    const actions = fakeActions();
    const ch = makeCharacteristic({ id: 'ch-p', chartType: 'p', subgroupSize: 10, decimals: 0 });
    render(<EntryPanel view={view(ch, [], T0)} actions={actions} separator="," />);
    typeInto('Nonconforming items', '12');
    tap('Items inspected');
    fireEvent.keyDown(input('Items inspected'), { key: 'Enter' });
    expect(screen.getByRole('alert').textContent).toBe('More nonconforming items than items inspected.');
    expect(actions.record).not.toHaveBeenCalled();
  });

  it('c: one field, the defects found', async () => {
    const actions = fakeActions();
    const ch = makeCharacteristic({ id: 'ch-c', chartType: 'c', subgroupSize: 1, decimals: 0 });
    render(<EntryPanel view={view(ch, [], T0)} actions={actions} separator="," />);
    expect(screen.queryByLabelText('Items inspected')).toBeNull();
    expect(screen.queryByLabelText('Units inspected')).toBeNull();
    press('7', 'next');
    await waitFor(() => expect(actions.record).toHaveBeenCalledWith('ch-c', { count: 7 }));
  });

  it('u: defects over units inspected, which may be fractional and may be fewer than the defects', async () => {
    const actions = fakeActions();
    const ch = makeCharacteristic({ id: 'ch-u', chartType: 'u', subgroupSize: 2, decimals: 0 });
    render(<EntryPanel view={view(ch, [], T0)} actions={actions} separator="," />);
    press('1', '2', 'next');
    expect(input('Units inspected').className).toBe('active');
    press('back', 'sep', '5', 'next'); // "2" → "" → "0,5"
    await waitFor(() => expect(actions.record).toHaveBeenCalledWith('ch-u', { count: 12, inspected: 0.5 }));
  });
});

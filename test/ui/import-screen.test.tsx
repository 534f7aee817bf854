// @vitest-environment happy-dom
import { cleanup, fireEvent, render, screen, waitFor, within } from '@testing-library/preact';
import { afterEach, describe, expect, it } from 'vitest';
import type { Sample } from '../../src/schema';
import { CharacteristicScreen } from '../../src/ui/CharacteristicScreen';
import { ImportScreen } from '../../src/ui/import/ImportScreen';
import { BASELINE, individuals, makeCharacteristic, T0 } from '../app/helpers';
import { fakeActions, readyState, view } from './helpers';

afterEach(cleanup);

const ch = makeCharacteristic({ id: 'ch-fill', name: 'Fill weight', unit: 'g', decimals: 1, chartType: 'xbar-r', subgroupSize: 3 });
const engineer = { person: { id: 'p-eng', name: 'Ines', login: 'ines', role: 'engineer' as const, active: true } };

function paste(text: string) {
  fireEvent.input(screen.getByTestId('import-paste'), { target: { value: text } });
  fireEvent.click(screen.getByRole('button', { name: 'Read the pasted rows' }));
}

describe('import from the characteristic screen', () => {
  it('is offered to engineers and admins, not to operators', () => {
    const v = view(ch, [], T0);
    const actions = fakeActions();
    const { unmount } = render(<CharacteristicScreen state={readyState([ch], { [ch.id]: v })} actions={actions} characteristicId={ch.id} separator="." />);
    expect(screen.queryByTestId('import-csv')).toBeNull();
    unmount();
    render(<CharacteristicScreen state={readyState([ch], { [ch.id]: v }, engineer)} actions={actions} characteristicId={ch.id} separator="." />);
    fireEvent.click(screen.getByTestId('import-csv'));
    expect(actions.open).toHaveBeenCalledWith({ name: 'import', characteristicId: 'ch-fill' });
  });
});

describe('ImportScreen', () => {
  it('tells an operator that only engineers import, and offers no file', () => {
    render(<ImportScreen state={readyState([ch], {})} actions={fakeActions()} characteristicId={ch.id} separator="." />);
    expect(screen.getByRole('alert').textContent).toMatch(/Only a quality engineer \(or admin\) can import history/);
    expect(screen.queryByTestId('import-file')).toBeNull();
  });

  it('reads pasted rows with a decimal comma, lists the bad row by line, and records only after confirmation', async () => {
    const actions = fakeActions();
    actions.importSamples.mockResolvedValueOnce({ saved: 2, alreadyHeld: 0 });
    render(<ImportScreen state={readyState([ch], { [ch.id]: view(ch, [], T0) }, engineer)} actions={actions} characteristicId={ch.id} separator="," />);
    paste('Date;Time;W1;W2;W3;Batch\n01.12.2026;08:00;500,1;500,4;499,8;B1\n01.12.2026;09:00;500,2;;500,0;B1\n01.12.2026;10:00;500,0;500,3;499,9;B2\n');
    await screen.findByTestId('import-preview');
    expect((screen.getByTestId('decimal-mark') as HTMLSelectElement).value).toBe(',');
    expect(screen.getByTestId('count-ready').textContent).toBe('2');
    expect(screen.getByTestId('problem-rows').textContent).toBe('Line 3: 2 values, but a subgroup of Fill weight has 3.');
    expect(within(screen.getByTestId('import-rows')).getByText('500,1 · 500,4 · 499,8')).toBeTruthy();
    expect(actions.importSamples).not.toHaveBeenCalled();

    // Read with a decimal point instead, every number becomes a problem that names the choice.
    fireEvent.change(screen.getByTestId('decimal-mark'), { target: { value: '.' } });
    await waitFor(() => expect(screen.getByTestId('count-ready').textContent).toBe('0'));
    expect(screen.getByTestId('problem-rows').textContent).toMatch(/Line 2: .*written with a decimal comma/);
    expect((screen.getByTestId('import-confirm') as HTMLButtonElement).disabled).toBe(true);
    fireEvent.change(screen.getByTestId('decimal-mark'), { target: { value: ',' } });
    await waitFor(() => expect(screen.getByTestId('count-ready').textContent).toBe('2'));

    fireEvent.click(screen.getByRole('button', { name: 'Record 2 samples' }));
    await screen.findByTestId('import-outcome');
    const [id, samples] = actions.importSamples.mock.calls[0]! as [string, Sample[]];
    expect(id).toBe('ch-fill');
    expect(samples.map((s) => [s.values, s.lot, s.imported])).toEqual([
      [[500.1, 500.4, 499.8], 'B1', { file: 'pasted text', line: 2 }],
      [[500, 500.3, 499.9], 'B2', { file: 'pasted text', line: 4 }],
    ]);
    expect(screen.getByTestId('import-outcome').textContent).toMatch(/^2 samples recorded on this tablet, marked as imported/);
  });

  it('asks for the column of the values when the header does not say, and uses the engineer’s choice', async () => {
    const xmr = makeCharacteristic();
    render(<ImportScreen state={readyState([xmr], { [xmr.id]: view(xmr, [], T0) }, engineer)} actions={fakeActions()} characteristicId={xmr.id} separator="." />);
    paste('when,gauge,who\n2026-12-01 08:00,Ø,Ann\n2026-12-01 09:00,10.02,Ann\n');
    await screen.findByText('Choose the column with the measured value.');
    expect(screen.queryByTestId('import-preview')).toBeNull();
    const mapping = screen.getByTestId('column-mapping');
    fireEvent.change(within(mapping).getByLabelText(/^gauge/), { target: { value: 'value' } });
    await screen.findByTestId('import-preview');
    expect(screen.getByTestId('count-ready').textContent).toBe('1');
    expect(screen.getByTestId('problem-rows').textContent).toBe('Line 2: “Ø” is not a number.');
  });

  it('holds flagged rows back unless the engineer says they are right', async () => {
    const samples = individuals(BASELINE, { characteristicId: 'ch-bore' });
    const xmr = makeCharacteristic();
    const actions = fakeActions();
    actions.importSamples.mockResolvedValue({ saved: 2, alreadyHeld: 0 });
    render(<ImportScreen state={readyState([xmr], { [xmr.id]: view(xmr, samples, T0) }, engineer)} actions={actions} characteristicId={xmr.id} separator="." />);
    paste('time,value\n2026-11-30 08:00,10.01\n2026-11-30 09:00,100.1\n');
    await screen.findByTestId('check-rows');
    expect(screen.getByTestId('check-rows').textContent).toMatch(/Line 3: 100.1 mm is far from the usual values/);
    expect(screen.getByRole('button', { name: 'Record 1 sample' })).toBeTruthy();
    fireEvent.click(screen.getByLabelText('This row is correct: record it too'));
    fireEvent.click(screen.getByRole('button', { name: 'Record 2 samples' }));
    await screen.findByTestId('import-outcome');
    expect((actions.importSamples.mock.calls[0]![1] as Sample[]).map((s) => s.values![0])).toEqual([10.01, 100.1]);
  });
});

// @vitest-environment happy-dom
import { cleanup, fireEvent, render, screen, within } from '@testing-library/preact';
import { afterEach, describe, expect, it } from 'vitest';
import { buildCharacteristicView } from '../../src/app/build-view';
import { CharacteristicScreen } from '../../src/ui/CharacteristicScreen';
import { BASELINE, individuals, makeCharacteristic, sampleAt, T0 } from '../app/helpers';
import { fakeActions, readyState } from './helpers';

afterEach(cleanup);

const figures = () =>
  Object.fromEntries(
    Array.from(screen.getByLabelText('Current limits').querySelectorAll('.figure')).map((f) => [f.querySelector('.k')!.textContent, f.querySelector('.v')!.textContent]),
  );

describe('CharacteristicScreen', () => {
  it('shows the chart, the limits in force (one decimal more than the gauge), entry and signals', () => {
    const ch = makeCharacteristic({ decimals: 2 });
    const view = buildCharacteristicView(ch, [], individuals(BASELINE), [], [], T0 + 20 * 3_600_000);
    render(<CharacteristicScreen state={readyState([ch], { [ch.id]: view })} actions={fakeActions()} characteristicId={ch.id} separator="," />);
    expect(screen.getByRole('heading', { level: 1 }).textContent).toBe('Bore diameter');
    expect(screen.getByTestId('main-chart')).toBeTruthy();
    expect(screen.getByTestId('companion-chart')).toBeTruthy();
    const last = view.analysis.points[19]!;
    expect(figures()).toEqual({ Centre: last.centre!.toFixed(3), UCL: last.ucl!.toFixed(3), LCL: last.lcl!.toFixed(3), Points: '20', Phase: '1' });
    expect(screen.getByTestId('entry-panel')).toBeTruthy();
    expect(screen.getByText('No run rule has fired in this history.')).toBeTruthy();
    expect(screen.queryByTestId('safety-caution')).toBeNull();
  });

  it('says when the limits are provisional (fewer baseline subgroups than asked for)', () => {
    const ch = makeCharacteristic();
    const view = buildCharacteristicView(ch, [], individuals([10, 10.1, 9.9, 10]), [], [], T0);
    render(<CharacteristicScreen state={readyState([ch], { [ch.id]: view })} actions={fakeActions()} characteristicId={ch.id} separator="." />);
    expect(figures().Phase).toBe('1 (provisional)');
  });

  it('a safety-critical characteristic carries the caution', () => {
    const ch = makeCharacteristic({ safetyCritical: true });
    const view = buildCharacteristicView(ch, [], [], [], [], T0);
    render(<CharacteristicScreen state={readyState([ch], { [ch.id]: view })} actions={fakeActions()} characteristicId={ch.id} separator="." />);
    expect(screen.getByTestId('safety-caution').textContent).toContain('Safety-critical characteristic.');
  });

  it('shows why a chart cannot be drawn instead of failing', () => {
    const ch = makeCharacteristic({ chartType: 'p', subgroupSize: 100, decimals: 0 });
    const view = buildCharacteristicView(ch, [], [sampleAt(0, { values: undefined, count: 150, inspected: 100 })], [], [], T0);
    render(<CharacteristicScreen state={readyState([ch], { [ch.id]: view })} actions={fakeActions()} characteristicId={ch.id} separator="." />);
    expect(screen.getByText(/^The chart cannot be drawn: .*150 defectives out of 100 inspected/)).toBeTruthy();
    expect(screen.queryByLabelText('Current limits')).toBeNull();
  });

  it('back to the station board; a characteristic the tablet does not know is said so', () => {
    const ch = makeCharacteristic();
    const actions = fakeActions();
    const { unmount } = render(<CharacteristicScreen state={readyState([ch], {})} actions={actions} characteristicId={ch.id} separator="." />);
    expect(screen.getByText('Loading chart…')).toBeTruthy();
    fireEvent.click(screen.getByRole('button', { name: '← Station board' }));
    expect(actions.open).toHaveBeenCalledWith({ name: 'board' });
    unmount();
    render(<CharacteristicScreen state={readyState([], {})} actions={actions} characteristicId="nope" separator="." />);
    expect(within(document.body).getByText('This characteristic is not set up on this tablet.')).toBeTruthy();
  });
});

// @vitest-environment happy-dom
import { cleanup, fireEvent, render, screen, within } from '@testing-library/preact';
import { afterEach, describe, expect, it } from 'vitest';
import { buildCharacteristicView } from '../../src/app/build-view';
import { StationBoard } from '../../src/ui/StationBoard';
import { BASELINE, individuals, makeCharacteristic, makeResponse, MINUTE, sampleAt, T0 } from '../app/helpers';
import { fakeActions, readyState, view } from './helpers';

afterEach(cleanup);

const HOUR = 60 * MINUTE;
const NOW = T0 + 20 * HOUR + 10 * MINUTE; // ten minutes after the 21st hourly sample
const ago = (minutes: number) => (NOW - T0) / MINUTE - minutes;

const ch = (id: string, name: string, stationId = 'st-1') => makeCharacteristic({ id, name, stationId, intervalMinutes: 60 });
const alpha = ch('ch-a', 'Alpha'); // sampled 10 min ago: waiting
const bravo = ch('ch-b', 'Bravo'); // sampled 3 h ago: late
const charlie = ch('ch-c', 'Charlie'); // sampled 62 min ago: due
const delta = ch('ch-d', 'Delta'); // never sampled
const echo = ch('ch-e', 'Echo'); // a signal, answered; sampled 10 min ago
const kilo = ch('ch-k', 'Kilo'); // view not loaded yet
const zulu = ch('ch-z', 'Zulu'); // a signal nobody has answered; sampled 10 min ago
const elsewhere = ch('ch-x', 'Aardvark', 'st-2');

function board() {
  const withSignal = individuals([...BASELINE, 11]);
  const views = {
    'ch-a': view(alpha, [sampleAt(ago(10))], NOW),
    'ch-b': view(bravo, [sampleAt(ago(180))], NOW),
    'ch-c': view(charlie, [sampleAt(ago(62))], NOW),
    'ch-d': view(delta, [], NOW),
    'ch-e': buildCharacteristicView(echo, [], withSignal, [makeResponse(withSignal[20]!.id)], [], NOW),
    'ch-z': view(zulu, withSignal, NOW),
    'ch-x': view(elsewhere, [], NOW),
  };
  const state = readyState([alpha, bravo, charlie, delta, echo, kilo, zulu, elsewhere], views, { now: NOW });
  const actions = fakeActions();
  render(<StationBoard state={state} actions={actions} />);
  return actions;
}

const tiles = () => Array.from(document.querySelectorAll<HTMLButtonElement>('.tiles > button'));

describe('StationBoard', () => {
  it('puts an unanswered signal first, then late, then due or never sampled, then the rest; names order within a rank', () => {
    board();
    expect(tiles().map((t) => t.querySelector('.name')!.textContent)).toEqual(['Zulu', 'Bravo', 'Charlie', 'Delta', 'Alpha', 'Echo', 'Kilo']);
  });

  it('marks the tiles and says why in words', () => {
    board();
    const tile = (id: string) => screen.getByTestId(`tile-${id}`);
    expect(tile('ch-z').className).toBe('tile attention');
    expect(within(tile('ch-z')).getByTestId('chip-signal').textContent).toBe('Signal needs an answer');
    expect(tile('ch-b').className).toBe('tile late');
    expect(within(tile('ch-b')).getByTestId('chip-late').textContent).toBe('Late by 2 h 00 min');
    expect(within(tile('ch-c')).getByTestId('chip-due').textContent).toBe('Sample due now');
    expect(tile('ch-d').textContent).toContain('No samples yet');
    expect(within(tile('ch-e')).getByTestId('chip-answered').textContent).toBe('1 answered, awaiting sign-off');
    expect(tile('ch-e').className).toBe('tile');
    expect(tile('ch-a').textContent).toContain('Next in 50 min');
    expect(tile('ch-k').textContent).toContain('Loading…');
  });

  it('shows only the characteristics of the selected station', () => {
    board();
    expect(screen.queryByTestId('tile-ch-x')).toBeNull();
  });

  it('a tile opens its characteristic; a station button selects the station', () => {
    const actions = board();
    fireEvent.click(screen.getByTestId('tile-ch-b'));
    expect(actions.open).toHaveBeenCalledWith({ name: 'characteristic', characteristicId: 'ch-b' });
    const nav = screen.getByRole('navigation', { name: 'Stations' });
    expect(within(nav).getByRole('button', { name: 'Press 4' }).getAttribute('aria-current')).toBe('true');
    fireEvent.click(within(nav).getByRole('button', { name: 'Lathe 2' }));
    expect(actions.selectStation).toHaveBeenCalledWith('st-2');
  });

  it('says so when the station has no characteristics', () => {
    render(<StationBoard state={readyState([elsewhere], {})} actions={fakeActions()} />);
    expect(screen.getByText('No characteristics are set up for this station yet.')).toBeTruthy();
  });
});

// @vitest-environment happy-dom
import { cleanup, fireEvent, render, screen, within } from '@testing-library/preact';
import { afterEach, describe, expect, it } from 'vitest';
import type { Person } from '../../src/schema';
import { buildCharacteristicView } from '../../src/app/build-view';
import { SignalHistory } from '../../src/ui/SignalHistory';
import { BASELINE, individuals, makeAck, makeCharacteristic, makeResponse, T0 } from '../app/helpers';
import { fakeActions, readyState } from './helpers';

afterEach(cleanup);

const ch = makeCharacteristic();
// Points 21, 23 and 25 far above the baseline limits; the drops back at 22 and 24 fire on the moving range.
const samples = individuals([...BASELINE, 11, 10, 11, 10, 11]);
const [s20, s22, s24] = [samples[20]!, samples[22]!, samples[24]!];
const answered = makeResponse(s22.id, { whatHappened: 'Bar stock changed', causeCategory: 'Material', cause: 'New supplier', action: 'Quarantined the lot', respondedBy: 'p-op' });
const closed = makeResponse(s20.id, { whatHappened: 'Chip', causeCategory: 'Machine', action: 'Changed the insert' });
const ack = makeAck(closed.id, { by: 'p-sup' });
const view = buildCharacteristicView(ch, [], samples, [answered, closed], [ack], T0);
const people: Person[] = [
  { id: 'p-op', name: 'Odile', login: 'odile', role: 'operator', active: true },
  { id: 'p-sup', name: 'Sven', login: 'sven', role: 'supervisor', active: true },
];
const stateFor = (person: Person) => {
  const base = readyState([ch], { [ch.id]: view }, { person });
  return { ...base, setup: { ...base.setup, people } };
};
const items = () => within(screen.getByTestId('signal-history')).getAllByRole('listitem');

describe('SignalHistory', () => {
  it('lists the signals newest first with their state in words', () => {
    render(<SignalHistory view={view} state={stateFor(people[0]!)} actions={fakeActions()} />);
    const list = items();
    // The moving range fires at 21, 22, 23, 24 and 25 in a row: one event, listed where it began (point 21).
    expect(list.map((li) => li.querySelector('strong')!.textContent!.split(' · ')[0])).toEqual(['Point 25', 'Point 23', 'Point 21']);
    expect(list.map((li) => li.querySelector('.chip')!.textContent)).toEqual(['Needs an answer', 'Awaiting sign-off', 'Signed off']);
    expect(list[1]!.textContent).toContain('Bar stock changed · Material: New supplier · Action: Quarantined the lot · Odile');
    expect(list[2]!.textContent).toContain('Signed off by Sven');
    expect(list[2]!.textContent).toContain('The pattern went on firing up to point 25.');
  });

  it('“Answer now” reopens the prompt for that sample', () => {
    const actions = fakeActions();
    render(<SignalHistory view={view} state={stateFor(people[0]!)} actions={actions} />);
    fireEvent.click(within(items()[0]!).getByRole('button', { name: 'Answer now' }));
    expect(actions.reopenPrompt).toHaveBeenCalledWith(ch.id, s24.id);
  });

  it('an operator sees no sign-off button; a supervisor signs off an answered signal', () => {
    const { unmount } = render(<SignalHistory view={view} state={stateFor(people[0]!)} actions={fakeActions()} />);
    expect(screen.queryByRole('button', { name: 'Sign off' })).toBeNull();
    unmount();
    const actions = fakeActions();
    render(<SignalHistory view={view} state={stateFor(people[1]!)} actions={actions} />);
    const buttons = screen.getAllByRole('button', { name: 'Sign off' });
    expect(buttons).toHaveLength(1); // only the answered one: unanswered needs an answer first, closed is done
    fireEvent.click(buttons[0]!);
    expect(actions.acknowledge).toHaveBeenCalledWith(ch.id, answered.id);
  });

  it('says so when no rule has fired', () => {
    const quiet = buildCharacteristicView(ch, [], individuals(BASELINE), [], [], T0);
    render(<SignalHistory view={quiet} state={stateFor(people[0]!)} actions={fakeActions()} />);
    expect(screen.getByText('No run rule has fired in this history.')).toBeTruthy();
  });
});

// @vitest-environment happy-dom
import { cleanup, fireEvent, render, screen, waitFor } from '@testing-library/preact';
import { afterEach, describe, expect, it } from 'vitest';
import type { SignalPrompt } from '../../src/app/app-state';
import { DEFAULT_CAUSE_CATEGORIES } from '../../src/schema';
import { SignalPromptSheet } from '../../src/ui/SignalPromptSheet';
import { makeCharacteristic, newId } from '../app/helpers';
import { fakeActions } from './helpers';

afterEach(cleanup);

const prompt: SignalPrompt = {
  characteristicId: 'ch-bore',
  sampleId: newId(),
  signals: [
    { rule: 'we1', index: 20, points: [20], side: 'above', explanation: '1 point above the upper control limit' },
    { rule: 'we1', index: 20, points: [19, 20], side: 'above', explanation: '1 moving range above its upper control limit', companion: true },
  ],
};
const ch = makeCharacteristic({ reactionPlan: ['Stop the machine and call the setter', 'Change the insert'] });

const what = () => screen.getByRole('textbox', { name: 'What happened at the machine?' }) as HTMLTextAreaElement;
const save = () => fireEvent.click(screen.getByRole('button', { name: 'Save answer' }));
const problem = () => screen.getByRole('alert').textContent;

describe('SignalPromptSheet', () => {
  it('says what fired, in words and by the rule’s name, and marks range-chart signals', () => {
    render(<SignalPromptSheet prompt={prompt} characteristic={ch} siteCauses={[]} actions={fakeActions()} />);
    expect(screen.getByRole('dialog').getAttribute('aria-modal')).toBe('true');
    expect(screen.getByRole('heading', { name: 'Signal on Bore diameter: what happened?' })).toBeTruthy();
    const items = screen.getAllByRole('listitem').map((li) => li.textContent);
    expect(items).toEqual([
      '1 point above the upper control limitWestern Electric rule 1',
      '1 moving range above its upper control limitWestern Electric rule 1 (on the range chart)',
    ]);
    expect(document.activeElement).toBe(what());
  });

  it('asks for what happened, then a category, then an action, before saving anything', () => {
    const actions = fakeActions();
    render(<SignalPromptSheet prompt={prompt} characteristic={ch} siteCauses={[]} actions={actions} />);
    save();
    expect(problem()).toBe('Say briefly what happened (or what you saw) at the machine.');
    fireEvent.input(what(), { target: { value: '   ' } });
    save();
    expect(problem()).toBe('Say briefly what happened (or what you saw) at the machine.');
    fireEvent.input(what(), { target: { value: 'Chips on the insert' } });
    save();
    expect(problem()).toBe('Choose a cause category.');
    fireEvent.click(screen.getByRole('button', { name: 'Machine' }));
    save();
    expect(problem()).toBe('Choose the action taken from the reaction plan, or describe it.');
    expect(actions.answer).not.toHaveBeenCalled();
  });

  it('sends the answer: trimmed text, the category, the optional cause, the plan step joined with the detail', async () => {
    const actions = fakeActions();
    render(<SignalPromptSheet prompt={prompt} characteristic={ch} siteCauses={[]} actions={actions} />);
    fireEvent.input(what(), { target: { value: ' Chips on the insert ' } });
    fireEvent.click(screen.getByRole('button', { name: 'Material' }));
    fireEvent.click(screen.getByRole('button', { name: 'Machine' })); // the last choice counts
    expect(screen.getByRole('button', { name: 'Machine' }).getAttribute('aria-pressed')).toBe('true');
    expect(screen.getByRole('button', { name: 'Material' }).getAttribute('aria-pressed')).toBe('false');
    fireEvent.input(screen.getByRole('textbox', { name: /Suspected cause/ }), { target: { value: ' Worn insert ' } });
    fireEvent.click(screen.getByRole('button', { name: 'Change the insert' }));
    fireEvent.input(screen.getByRole('textbox', { name: 'Other action or detail' }), { target: { value: ' new edge, checked 5 parts ' } });
    save();
    await waitFor(() => expect(actions.answer).toHaveBeenCalledTimes(1));
    expect(actions.answer).toHaveBeenCalledWith(prompt, {
      whatHappened: 'Chips on the insert', causeCategory: 'Machine', cause: 'Worn insert', action: 'Change the insert — new edge, checked 5 parts',
    });
  });

  it('an action typed without a plan step is enough; no cause means no cause field', async () => {
    const actions = fakeActions();
    render(<SignalPromptSheet prompt={prompt} characteristic={ch} siteCauses={[]} actions={actions} />);
    fireEvent.input(what(), { target: { value: 'Gauge dropped' } });
    fireEvent.click(screen.getByRole('button', { name: 'Measurement' }));
    fireEvent.click(screen.getByRole('button', { name: 'Change the insert' }));
    fireEvent.click(screen.getByRole('button', { name: 'Change the insert' })); // tapped again: unselected
    fireEvent.input(screen.getByRole('textbox', { name: 'Other action or detail' }), { target: { value: 'Re-zeroed the gauge' } });
    save();
    await waitFor(() => expect(actions.answer).toHaveBeenCalledWith(prompt, { whatHappened: 'Gauge dropped', causeCategory: 'Measurement', action: 'Re-zeroed the gauge' }));
  });

  it('a failed save says so and keeps the form', async () => {
    const actions = fakeActions();
    actions.answer.mockResolvedValueOnce(false);
    render(<SignalPromptSheet prompt={prompt} characteristic={ch} siteCauses={[]} actions={actions} />);
    fireEvent.input(what(), { target: { value: 'Chips' } });
    fireEvent.click(screen.getByRole('button', { name: 'Machine' }));
    fireEvent.click(screen.getByRole('button', { name: 'Stop the machine and call the setter' }));
    save();
    await waitFor(() => expect(problem()).toBe('The answer could not be saved; see the message above.'));
    expect(what().value).toBe('Chips');
  });

  it('“Answer later” postpones', () => {
    const actions = fakeActions();
    render(<SignalPromptSheet prompt={prompt} characteristic={ch} siteCauses={[]} actions={actions} />);
    fireEvent.click(screen.getByRole('button', { name: 'Answer later' }));
    expect(actions.postpone).toHaveBeenCalledTimes(1);
    expect(actions.answer).not.toHaveBeenCalled();
  });

  it('offers the characteristic’s categories, else the site’s, else the default six', () => {
    const names = () => Array.from(document.querySelectorAll('fieldset')[0]!.querySelectorAll('button')).map((b) => b.textContent);
    const { unmount } = render(<SignalPromptSheet prompt={prompt} characteristic={makeCharacteristic({ causeCategories: ['Coolant', 'Fixture'] })} siteCauses={['Site A']} actions={fakeActions()} />);
    expect(names()).toEqual(['Coolant', 'Fixture']);
    unmount();
    const second = render(<SignalPromptSheet prompt={prompt} characteristic={ch} siteCauses={['Site A', 'Site B']} actions={fakeActions()} />);
    expect(names()).toEqual(['Site A', 'Site B']);
    second.unmount();
    render(<SignalPromptSheet prompt={prompt} characteristic={ch} siteCauses={[]} actions={fakeActions()} />);
    expect(names()).toEqual([...DEFAULT_CAUSE_CATEGORIES]);
  });
});

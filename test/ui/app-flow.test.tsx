// @vitest-environment happy-dom
/**
 * The whole tablet in a DOM: the App component on the real controller (fake IndexedDB, real api client
 * and sync engine, real sync server through inject). Enrol, sign in with the keypad, record, confirm an
 * implausible value, answer the signal, and see the answer in the history.
 */
import { cleanup, fireEvent, render, screen, waitFor, within } from '@testing-library/preact';
import { afterEach, describe, expect, it } from 'vitest';
import { getResponsesForCharacteristic } from '../../src/store';
import { issueEnrolmentCode } from '../../src/server/routes/admin-enrolment-codes';
import { App } from '../../src/ui/App';
import { SITE } from '../server/fixtures';
import { seedBaseline, tablet, useServerPerTest } from '../app/tablet-harness';

const server = useServerPerTest();
afterEach(cleanup);

const slow = { timeout: 5000 };
const key = (k: string) => fireEvent.click(document.querySelector(`.keypad [data-key="${k}"]`)!);
const typeText = (label: string, value: string) => fireEvent.input(screen.getByLabelText(label), { target: { value } });

describe('the tablet app in a DOM', () => {
  it('enrol → sign in → record → typo check → signal prompt → answer', async () => {
    const t = await tablet();
    await t.app.start();
    render(<App app={t.app} locale="de-DE" />);

    // Enrol.
    await screen.findByRole('heading', { name: 'Connect this tablet to the site' });
    const { code } = await issueEnrolmentCode(server().store, SITE, 'p-adm', server().now());
    typeText('Connection code', code);
    typeText('Name of this tablet', 'Press 4 tablet');
    fireEvent.click(screen.getByRole('button', { name: 'Connect tablet' }));
    await screen.findByRole('heading', { name: 'Who is at the machine?' }, slow);
    await t.settle();
    await seedBaseline(t); // twenty in-control lengths already on this tablet

    // Sign in: login typed, PIN on the keypad.
    typeText('Login', 'odile');
    for (const d of '1234') key(d);
    expect((screen.getByLabelText('PIN') as HTMLInputElement).value).toBe('1234');
    key('next');
    await screen.findByRole('heading', { name: 'Characteristics at this station' }, slow);
    expect(screen.getByTestId('person-pill').textContent).toBe('Odile Test · operator');

    // Open the length and record an in-control value with the German separator.
    fireEvent.click(await screen.findByTestId('tile-ch-len', undefined, slow));
    await screen.findByRole('heading', { name: 'Record a sample' }, slow);
    expect(screen.getByRole('button', { name: 'Decimal separator' }).textContent).toBe(',');
    for (const k of ['1', '0', 'sep', '0', '2', 'next']) key(k);
    await waitFor(() => expect(screen.getByRole('status').textContent).toBe('Saved on this tablet'), slow);
    await screen.findByRole('button', { name: 'Save sample' }, slow); // no longer "Saving…": the fields are empty again

    // 11 is far from everything seen so far: the typo guard asks first; confirmed, it fires WE1.
    for (const k of ['1', '1', 'next']) key(k);
    fireEvent.click(await screen.findByRole('button', { name: 'It is correct — save' }));
    const sheet = await screen.findByTestId('signal-prompt', undefined, slow);
    expect(within(sheet).getByRole('heading').textContent).toBe('Signal on Length: what happened?');
    expect(sheet.textContent).toContain('Western Electric rule 1');

    // Answer it with the site's cause list and the reaction plan.
    fireEvent.input(within(sheet).getByRole('textbox', { name: 'What happened at the machine?' }), { target: { value: 'Burr on the part' } });
    expect(within(sheet).getAllByRole('button').map((b) => b.textContent)).toEqual(expect.arrayContaining(['Machine', 'Method', 'Stop and call the setter.']));
    fireEvent.click(within(sheet).getByRole('button', { name: 'Method' }));
    fireEvent.click(within(sheet).getByRole('button', { name: 'Stop and call the setter.' }));
    fireEvent.click(within(sheet).getByRole('button', { name: 'Save answer' }));
    await waitFor(() => expect(screen.queryByTestId('signal-prompt')).toBeNull(), slow);
    await waitFor(() => expect(screen.getByTestId('signal-history').textContent).toContain('Awaiting sign-off'), slow);
    expect(screen.getByTestId('signal-history').textContent).toContain('Burr on the part');

    const [response] = await getResponsesForCharacteristic(t.db, 'ch-len');
    expect(response).toMatchObject({ whatHappened: 'Burr on the part', causeCategory: 'Method', action: 'Stop and call the setter.', respondedBy: 'p-op' });
    expect(response!.signals.map((s) => s.rule)).toContain('we1');
    await t.settle();
  });
});

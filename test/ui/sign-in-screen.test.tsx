// @vitest-environment happy-dom
import { cleanup, fireEvent, render, screen, waitFor } from '@testing-library/preact';
import { afterEach, describe, expect, it } from 'vitest';
import { SignInScreen } from '../../src/ui/SignInScreen';
import { fakeActions, readyState } from './helpers';

afterEach(cleanup);

const state = (over = {}) =>
  readyState([], {}, {
    stage: 'sign-in', person: undefined,
    signedIn: [
      { id: 'p-op', name: 'Odile', login: 'odile', role: 'operator', active: true },
      { id: 'p-sup', name: 'Sven', login: 'sven', role: 'supervisor', active: true },
    ],
    ...over,
  });
const key = (k: string) => fireEvent.click(document.querySelector(`.keypad [data-key="${k}"]`)!);
const pin = () => (screen.getByLabelText('PIN') as HTMLInputElement).value;
const login = () => (screen.getByLabelText('Login') as HTMLInputElement).value;

describe('SignInScreen', () => {
  it('the PIN is typed on the keypad: digits only (no separator, no sign), at most 12, back deletes', () => {
    render(<SignInScreen state={state()} actions={fakeActions()} />);
    for (const k of ['1', '2', '3']) key(k);
    expect(document.querySelector('.keypad [data-key="minus"]')).toBeNull();
    expect(document.querySelector('.keypad [data-key="sep"]')).toBeNull(); // a PIN has no decimal point: no key for one
    expect(pin()).toBe('123');
    key('back');
    expect(pin()).toBe('12');
    for (let i = 0; i < 15; i++) key('9');
    expect(pin()).toHaveLength(12);
    expect(screen.getByLabelText('PIN').getAttribute('type')).toBe('password');
  });

  it('Sign in is the screen\'s main action: the primary button style', () => {
    render(<SignInScreen state={state()} actions={fakeActions()} />);
    const signIn = screen.getByRole('button', { name: 'Sign in' });
    expect(signIn.getAttribute('data-key')).toBe('next');
    expect(signIn.classList.contains('btn')).toBe(true);
    expect(signIn.classList.contains('primary')).toBe(true);
  });

  it('tapping someone who signed in here before fills the login; the PIN is still asked for', () => {
    const actions = fakeActions();
    render(<SignInScreen state={state()} actions={actions} />);
    for (const k of ['5', '5']) key(k);
    fireEvent.click(screen.getByRole('button', { name: 'Sven' }));
    expect(login()).toBe('sven');
    expect(pin()).toBe('');
    expect(screen.getByRole('button', { name: 'Sven' }).getAttribute('aria-pressed')).toBe('true');
    key('next');
    expect(actions.signIn).not.toHaveBeenCalled(); // no PIN yet
  });

  it('signs in with the trimmed login and the PIN; a refusal empties the PIN and shows the error', async () => {
    const actions = fakeActions();
    actions.signIn.mockResolvedValueOnce(false);
    const { rerender } = render(<SignInScreen state={state()} actions={actions} />);
    fireEvent.input(screen.getByLabelText('Login'), { target: { value: '  odile ' } });
    for (const k of '9876') key(k);
    key('next');
    await waitFor(() => expect(actions.signIn).toHaveBeenCalledWith('odile', '9876'));
    await waitFor(() => expect(pin()).toBe(''));
    rerender(<SignInScreen state={state({ error: 'Login or PIN is not right.' })} actions={actions} />);
    expect(screen.getByRole('alert').textContent).toBe('Login or PIN is not right.');
  });

  it('needs a login and at least 4 digits before asking', () => {
    const actions = fakeActions();
    render(<SignInScreen state={state()} actions={actions} />);
    for (const k of '123') key(k);
    fireEvent.input(screen.getByLabelText('Login'), { target: { value: 'odile' } });
    key('next');
    fireEvent.input(screen.getByLabelText('Login'), { target: { value: '  ' } });
    key('4');
    key('next');
    expect(actions.signIn).not.toHaveBeenCalled();
  });
});

// @vitest-environment happy-dom
import { cleanup, fireEvent, render, screen, waitFor, within } from '@testing-library/preact';
import { afterEach, describe, expect, it } from 'vitest';
import type { AdminView } from '../../src/app/admin-controller';
import type { AppState } from '../../src/app/app-state';
import type { AdminDevice, AdminPerson } from '../../src/schema';
import { AdminScreen } from '../../src/ui/admin/AdminScreen';
import { describeSync, TopBar } from '../../src/ui/TopBar';
import { WithdrawnNotice } from '../../src/ui/WithdrawnNotice';
import { fakeActions, readyState } from './helpers';

afterEach(cleanup);

const NOW = Date.parse('2026-12-02T08:00:00.000Z');
const people: AdminPerson[] = [
  { id: 'p-ada', name: 'Ada Admin', login: 'ada', role: 'admin', active: true, pinSetAt: '2026-12-01T08:00:00.000Z' },
  { id: 'p-odile', name: 'Odile Op', login: 'odile', role: 'operator', active: true, pinSetAt: '2026-12-01T08:00:00.000Z' },
  { id: 'p-gone', name: 'Gone Person', login: 'gone', role: 'operator', active: false },
];
const devices: AdminDevice[] = [
  { id: 'tab-1', name: 'Press 4 tablet', enrolledAt: '2026-11-01T08:00:00.000Z', revokedAt: null, lastUploadAt: '2026-12-02T07:00:00.000Z', lastSignInAt: null },
  { id: 'tab-2', name: 'Old tablet', enrolledAt: '2026-10-01T08:00:00.000Z', revokedAt: '2026-11-20T08:00:00.000Z' },
];
const me = { id: 'p-ada', name: 'Ada Admin', login: 'ada', role: 'admin' as const, active: true };

function admin(view: AdminView, tab: 'people' | 'tablets' = 'people', actions = fakeActions()) {
  const state = readyState([], {}, { person: me, now: NOW, admin: view, screen: { name: 'admin', tab } });
  render(<AdminScreen state={state} actions={actions} tab={tab} />);
  return actions;
}

describe('AdminScreen: people', () => {
  it('lists name, login, role, access and when the PIN was set', () => {
    admin({ loading: false, people, devices });
    const rows = within(screen.getByTestId('people-table')).getAllByRole('row').slice(1);
    expect(rows.map((r) => r.querySelector('th')?.textContent)).toEqual(['Ada Admin (you)ada', 'Odile Opodile', 'Gone Persongone']);
    expect((screen.getByLabelText('Role of Odile Op') as HTMLSelectElement).value).toBe('operator');
    expect(within(screen.getByTestId('person-gone')).getByText('Access withdrawn')).toBeTruthy();
    expect(within(screen.getByTestId('person-gone')).getByText('No PIN set')).toBeTruthy();
  });

  it('saves a role only with its button, withdraws access only after a second tap, and gives it back', async () => {
    const actions = admin({ loading: false, people, devices });
    fireEvent.change(screen.getByLabelText('Role of Odile Op'), { target: { value: 'engineer' } });
    fireEvent.change(screen.getByLabelText('Role of Odile Op'), { target: { value: 'supervisor' } });
    expect(actions.adminChangePerson).not.toHaveBeenCalled();
    fireEvent.click(within(screen.getByTestId('person-odile')).getByRole('button', { name: 'Save role' }));
    expect(actions.adminChangePerson).toHaveBeenCalledWith('p-odile', { role: 'supervisor' });
    await waitFor(() => expect((screen.getByLabelText('Role of Odile Op') as HTMLSelectElement).disabled).toBe(false));
    fireEvent.click(screen.getByRole('button', { name: 'Withdraw access of Odile Op' }));
    expect(actions.adminChangePerson).toHaveBeenCalledTimes(1);
    fireEvent.click(screen.getByRole('button', { name: "Withdraw Odile Op's access" }));
    expect(actions.adminChangePerson).toHaveBeenLastCalledWith('p-odile', { active: false });
    fireEvent.click(screen.getByRole('button', { name: 'Give access back to Gone Person' }));
    expect(actions.adminChangePerson).toHaveBeenLastCalledWith('p-gone', { active: true });
  });

  it('the add form sends what was typed and shows the errors the app gives back, each beside its field', async () => {
    const actions = admin({ loading: false, people, devices });
    actions.adminAddPerson.mockResolvedValueOnce({ ok: false, errors: { pinAgain: 'The two PINs are not the same.', login: 'This login is already used by Odile Op.' } });
    fireEvent.click(screen.getByTestId('add-person'));
    const form = screen.getByTestId('add-person-form');
    fireEvent.input(within(form).getByLabelText('Full name'), { target: { value: 'Nadia N' } });
    fireEvent.input(within(form).getByLabelText('Login'), { target: { value: 'odile' } });
    fireEvent.change(within(form).getByLabelText('Role'), { target: { value: 'operator' } });
    fireEvent.input(within(form).getByLabelText('First PIN'), { target: { value: '4826' } });
    fireEvent.input(within(form).getByLabelText('First PIN again'), { target: { value: '4862' } });
    fireEvent.submit(form);
    expect(actions.adminAddPerson).toHaveBeenCalledWith({ name: 'Nadia N', login: 'odile', role: 'operator', pin: '4826', pinAgain: '4862' });
    await waitFor(() => expect(screen.getByText('The two PINs are not the same.')).toBeTruthy());
    const login = within(form).getByLabelText('Login');
    expect(login.getAttribute('aria-invalid')).toBe('true');
    expect(document.getElementById(login.getAttribute('aria-describedby')!.split(' ')[1]!)?.textContent).toBe('This login is already used by Odile Op.');
    // The rule for PINs is shown before anything is typed wrong.
    expect(within(form).getByText(/^A PIN is 4 to 12 digits/)).toBeTruthy();
  });

  it('a new PIN is typed twice and sent for that person', async () => {
    const actions = admin({ loading: false, people, devices });
    actions.adminResetPin.mockResolvedValueOnce({ ok: true });
    fireEvent.click(within(screen.getByTestId('person-odile')).getByRole('button', { name: 'New PIN' }));
    fireEvent.input(screen.getByLabelText('New PIN for Odile Op'), { target: { value: '5281' } });
    fireEvent.input(screen.getByLabelText('New PIN again'), { target: { value: '5281' } });
    fireEvent.click(screen.getByRole('button', { name: 'Set new PIN' }));
    expect(actions.adminResetPin).toHaveBeenCalledWith('p-odile', '5281', '5281');
    await waitFor(() => expect(screen.queryByLabelText('New PIN for Odile Op')).toBeNull()); // closed once done
  });

  it('says plainly when the server cannot be reached', () => {
    admin({ loading: false, problem: 'The site server cannot be reached from this tablet. People and tablets are managed online only; nothing was changed.' });
    expect(screen.getByRole('alert').textContent).toMatch(/^The site server cannot be reached/);
    expect(screen.queryByTestId('people-table')).toBeNull();
  });
});

describe('AdminScreen: tablets', () => {
  it('lists tablets with when they were connected and last heard of; a withdrawn one has no Withdraw button', () => {
    const actions = admin({ loading: false, people, devices }, 'tablets');
    const row = screen.getByTestId('tablet-Press 4 tablet');
    expect(within(row).getByText('Not yet')).toBeTruthy(); // no sign-in yet
    expect(within(row).getByText('In use')).toBeTruthy();
    expect(within(screen.getByTestId('tablet-Old tablet')).getByText(/^Withdrawn/)).toBeTruthy();
    expect(screen.queryByRole('button', { name: 'Withdraw tablet Old tablet' })).toBeNull();
    fireEvent.click(screen.getByRole('button', { name: 'Withdraw tablet Press 4 tablet' }));
    expect(within(row).getByText(/This is the tablet you are using/)).toBeTruthy(); // readyState's device is tab-1
    fireEvent.click(screen.getByRole('button', { name: 'Withdraw “Press 4 tablet”' }));
    expect(actions.adminRevokeTablet).toHaveBeenCalledWith('tab-1');
  });

  it('a withdrawn tablet can be reinstated, only after a confirmation that says what it means', async () => {
    const actions = admin({ loading: false, people, devices }, 'tablets');
    const row = screen.getByTestId('tablet-Old tablet');
    expect(screen.queryByRole('button', { name: 'Reinstate tablet Press 4 tablet' })).toBeNull(); // a tablet in use has none
    expect(screen.queryByTestId('reinstate-confirm')).toBeNull();
    fireEvent.click(screen.getByRole('button', { name: 'Reinstate tablet Old tablet' }));
    expect(actions.adminReinstateTablet).not.toHaveBeenCalled();
    const confirm = screen.getByTestId('reinstate-confirm');
    expect(confirm.textContent).toMatch(/“Old tablet” syncs again with the connection it already has \(no new code needed\)/);
    expect(confirm.textContent).toMatch(/records it has not sent go to the server at its next sync/);
    // Changing one's mind leaves it withdrawn.
    fireEvent.click(within(confirm).getByRole('button', { name: 'Keep withdrawn' }));
    expect(screen.queryByTestId('reinstate-confirm')).toBeNull();
    expect(actions.adminReinstateTablet).not.toHaveBeenCalled();
    fireEvent.click(screen.getByRole('button', { name: 'Reinstate tablet Old tablet' }));
    expect(within(row).queryByRole('button', { name: 'Reinstate tablet Old tablet' })).toBeNull(); // the confirmation replaces it
    fireEvent.click(within(screen.getByTestId('reinstate-confirm')).getByRole('button', { name: 'Reinstate “Old tablet”' }));
    expect(actions.adminReinstateTablet).toHaveBeenCalledWith('tab-2');
    expect(actions.adminRevokeTablet).not.toHaveBeenCalled();
    await waitFor(() => expect(screen.queryByTestId('reinstate-confirm')).toBeNull()); // closed once done
  });

  it('a reinstated tablet is listed in use again, with its Withdraw button back', () => {
    admin({ loading: false, people, devices: [devices[0]!, { ...devices[1]!, revokedAt: null }], notice: '“Old tablet” is in use again: records it has not sent go to the server at its next sync.' }, 'tablets');
    const row = screen.getByTestId('tablet-Old tablet');
    expect(within(row).getByText('In use')).toBeTruthy();
    expect(screen.getByRole('button', { name: 'Withdraw tablet Old tablet' })).toBeTruthy();
    expect(screen.queryByRole('button', { name: 'Reinstate tablet Old tablet' })).toBeNull();
  });

  it('says which of a tablet\'s record numbers never reached the server, marked as a problem', () => {
    const numbered: AdminDevice[] = [
      { ...devices[0]!, records: { received: 118, highest: 120, missing: 2, gaps: [{ from: 57, to: 58 }] } },
      { ...devices[1]!, records: { received: 40, highest: 40, missing: 0, gaps: [] } },
    ];
    admin({ loading: false, people, devices: numbered }, 'tablets');
    const gap = within(screen.getByTestId('tablet-Press 4 tablet')).getByTestId('record-coverage');
    expect(gap.textContent).toMatch(/118 of 120 received; not received: 57–58 \(2\)/);
    expect(gap.className).toContain('coverage-missing');
    const whole = within(screen.getByTestId('tablet-Old tablet')).getByTestId('record-coverage');
    expect(whole.textContent).toBe('Records 1–40 received');
    expect(whole.className).not.toContain('coverage-missing');
  });

  it('shows a live connection code with its expiry and the steps; an expired one asks for a new code', () => {
    admin({ loading: false, devices, code: { code: 'ABCDE-FGHJK', expiresAt: new Date(NOW + 15 * 60_000).toISOString() }, codeIssuedAt: NOW }, 'tablets');
    expect(screen.getByTestId('enrolment-code').textContent).toBe('ABCDE-FGHJK');
    expect(screen.getByTestId('code-expiry').textContent).toMatch(/^Works once, until .+ \(about 15 min from now\)/);
    expect(screen.getAllByRole('listitem')).toHaveLength(3);
    cleanup();
    const actions = admin({ loading: false, devices, code: { code: 'ABCDE-FGHJK', expiresAt: new Date(NOW - 1000).toISOString() } }, 'tablets');
    expect(screen.queryByTestId('enrolment-code')).toBeNull();
    expect(screen.getByTestId('code-card').textContent).toContain('The last code has expired.');
    expect((screen.getByLabelText('Valid for') as HTMLSelectElement).value).toBe('15');
    fireEvent.change(screen.getByLabelText('Valid for'), { target: { value: '60' } });
    fireEvent.click(screen.getByTestId('issue-code'));
    expect(actions.adminIssueCode).toHaveBeenLastCalledWith(60);
  });
});

describe('the way in and the withdrawn tablet', () => {
  const bar = (over: Partial<AppState>) => render(<TopBar state={readyState([], {}, over)} actions={fakeActions()} />);

  it('only an admin sees "People & tablets" in the top bar', () => {
    bar({ person: me });
    expect(screen.getByTestId('open-admin').textContent).toBe('People & tablets');
    cleanup();
    bar({});
    expect(screen.queryByTestId('open-admin')).toBeNull();
  });

  it('a withdrawn tablet says what that means and how many records stay on it', () => {
    render(<WithdrawnNotice state={readyState([], {}, { sync: { state: 'error', pending: 2, rejected: 0, withdrawn: true } })} />);
    expect(screen.getByRole('alert').textContent).toMatch(/^This tablet has been withdrawn from the site by an administrator\. .*2 records saved here have not reached the server: they stay on this tablet and on its charts\./);
    expect(screen.getByRole('alert').textContent).toMatch(/If it was withdrawn by mistake, ask the site admin to reinstate it: they are then sent at its next sync\. Do not reset the tablet or connect it again before that/);
    expect(describeSync({ state: 'error', pending: 2, rejected: 0, withdrawn: true })).toEqual({ text: '2 waiting to send · tablet withdrawn', tone: 'failing' });
    cleanup();
    render(<WithdrawnNotice state={readyState([], {}, { sync: { state: 'idle', pending: 0, rejected: 0 } })} />);
    expect(screen.queryByRole('alert')).toBeNull();
  });
});

import { useState } from 'preact/hooks';
import type { AdminView } from '../../app/admin-controller';
import type { AppActions, AppState } from '../../app/app-state';
import { Role, type AdminPerson } from '../../schema';
import { formatShortDateTime } from '../format-time';
import { AddPersonForm } from './AddPersonForm';
import { ResetPinForm } from './ResetPinForm';

export const ROLE_LABEL: Record<Role, string> = { operator: 'Operator', supervisor: 'Supervisor', engineer: 'Quality engineer', admin: 'Site admin' };

/** Everyone at the site: role, access, when the PIN was set; change a role, withdraw or give back access, set a new PIN. */
export function PeoplePanel({ state, view, actions }: { state: AppState; view: AdminView; actions: AppActions }) {
  const [adding, setAdding] = useState(false);
  const [pinFor, setPinFor] = useState<string | undefined>();
  const [confirming, setConfirming] = useState<string | undefined>();
  const people = view.people ?? [];
  return (
    <section class="stack" aria-labelledby="people-title">
      <div class="row" style="justify-content:space-between">
        <h2 id="people-title">People at this site{view.people ? ` (${people.length})` : ''}</h2>
        {!adding ? <button type="button" class="btn small primary" onClick={() => setAdding(true)} data-testid="add-person">Add a person</button> : null}
      </div>
      {adding ? <AddPersonForm actions={actions} onDone={() => setAdding(false)} /> : null}
      {view.people ? (
        <table class="handover-table admin-table" data-testid="people-table">
          <thead>
            <tr><th scope="col">Name and login</th><th scope="col">Role</th><th scope="col">Access</th><th scope="col"><span class="sr-only">Actions</span></th></tr>
          </thead>
          <tbody>
            {people.map((p) => (
              <PersonRow key={`${p.id}:${p.role}`} person={p} isMe={p.id === state.person?.id} actions={actions}
                confirming={confirming === p.id} onConfirm={(on) => setConfirming(on ? p.id : undefined)}
                pinOpen={pinFor === p.id} onPin={(on) => setPinFor(on ? p.id : undefined)} />
            ))}
          </tbody>
        </table>
      ) : view.loading ? <p class="hint">Loading the people of the site…</p> : null}
    </section>
  );
}

interface RowProps {
  person: AdminPerson;
  isMe: boolean;
  actions: AppActions;
  confirming: boolean;
  onConfirm(on: boolean): void;
  pinOpen: boolean;
  onPin(on: boolean): void;
}

function PersonRow({ person: p, isMe, actions, confirming, onConfirm, pinOpen, onPin }: RowProps) {
  const [busy, setBusy] = useState(false);
  // A new role is chosen first and saved with its own button: arrowing through the list changes nothing.
  const [role, setRole] = useState<Role>(p.role);
  const change = async (c: { role?: Role; active?: boolean }) => {
    setBusy(true);
    const ok = await actions.adminChangePerson(p.id, c);
    setBusy(false);
    onConfirm(false);
    if (!ok && c.role) setRole(p.role);
  };
  return (
    <>
      <tr data-testid={`person-${p.login}`}>
        <th scope="row">
          {p.name}{isMe ? <span class="hint"> (you)</span> : null}
          <span class="admin-sub">{p.login}</span>
        </th>
        <td>
          <select class="text-input" aria-label={`Role of ${p.name}`} value={role} disabled={busy || !p.active}
            onChange={(e) => setRole((e.target as HTMLSelectElement).value as Role)}>
            {Role.options.map((r) => <option key={r} value={r}>{ROLE_LABEL[r]}</option>)}
          </select>
          {role !== p.role ? (
            <div class="row" style="gap:8px;margin-top:8px">
              <button type="button" class="btn small primary" disabled={busy} onClick={() => void change({ role })}>Save role</button>
              <button type="button" class="btn small" onClick={() => setRole(p.role)}>Undo</button>
            </div>
          ) : null}
        </td>
        <td>
          {p.active ? <span class="chip steady">Can sign in</span> : <span class="chip neutral">Access withdrawn</span>}
          <span class="admin-sub">{p.pinSetAt ? `PIN set ${formatShortDateTime(p.pinSetAt)}` : 'No PIN set'}</span>
        </td>
        <td>
          <div class="row" style="gap:8px">
            {confirming ? (
              <>
                <button type="button" class="btn small warn" disabled={busy} onClick={() => void change({ active: false })}>
                  Withdraw {p.name}'s access
                </button>
                <button type="button" class="btn small" onClick={() => onConfirm(false)}>Keep</button>
                <span class="hint">
                  {isMe ? 'This is you: you will be signed out at once. ' : ''}They can no longer sign in on any tablet; what they recorded stays.
                </span>
              </>
            ) : p.active ? (
              <>
                <button type="button" class="btn small one-line" onClick={() => onPin(!pinOpen)} aria-expanded={pinOpen}>New PIN</button>
                <button type="button" class="btn small one-line" onClick={() => onConfirm(true)} aria-label={`Withdraw access of ${p.name}`}>Withdraw access</button>
              </>
            ) : (
              <button type="button" class="btn small" disabled={busy} onClick={() => void change({ active: true })} aria-label={`Give access back to ${p.name}`}>
                Give access back
              </button>
            )}
          </div>
        </td>
      </tr>
      {pinOpen ? (
        <tr>
          <td colSpan={4}><ResetPinForm person={p} actions={actions} onDone={() => onPin(false)} /></td>
        </tr>
      ) : null}
    </>
  );
}

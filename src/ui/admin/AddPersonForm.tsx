import { useState } from 'preact/hooks';
import type { FieldErrors, NewPersonInput } from '../../app/admin-forms';
import type { AppActions } from '../../app/app-state';
import { PIN_RULE, Role } from '../../schema';
import { describedBy, FormField } from './FormField';
import { ROLE_LABEL } from './PeoplePanel';

const EMPTY: NewPersonInput = { name: '', login: '', role: '', pin: '', pinAgain: '' };

/** A new person: name, login, role and a first PIN typed twice; checked here as the server will check it. */
export function AddPersonForm({ actions, onDone }: { actions: AppActions; onDone(): void }) {
  const [input, setInput] = useState<NewPersonInput>(EMPTY);
  const [errors, setErrors] = useState<FieldErrors>({});
  const [busy, setBusy] = useState(false);
  const field = (key: keyof NewPersonInput) => (e: Event) => setInput({ ...input, [key]: (e.target as HTMLInputElement).value });
  const submit = async (e: Event) => {
    e.preventDefault();
    setBusy(true);
    const outcome = await actions.adminAddPerson(input);
    setBusy(false);
    if (outcome.ok) {
      setInput(EMPTY);
      onDone();
    } else setErrors(outcome.errors);
  };
  return (
    <form class="card stack" onSubmit={submit} aria-labelledby="add-person-title" data-testid="add-person-form" noValidate>
      <h3 id="add-person-title">Add a person</h3>
      <div class="admin-form-grid">
        <FormField id="np-name" label="Full name" error={errors.name}>
          <input class="text-input" {...describedBy('np-name', false, errors.name)} value={input.name} onInput={field('name')} autocomplete="off" />
        </FormField>
        <FormField id="np-login" label="Login" hint="Typed at sign-in: letters, digits, dot, dash or underscore." error={errors.login}>
          <input class="text-input" {...describedBy('np-login', true, errors.login)} value={input.login} onInput={field('login')}
            autocomplete="off" autocapitalize="none" spellcheck={false} />
        </FormField>
        <FormField id="np-role" label="Role" error={errors.role}>
          <select class="text-input" {...describedBy('np-role', false, errors.role)} value={input.role} onChange={field('role')}>
            <option value="">Choose…</option>
            {Role.options.map((r) => <option key={r} value={r}>{ROLE_LABEL[r]}</option>)}
          </select>
        </FormField>
        <FormField id="np-pin" label="First PIN" hint={PIN_RULE} error={errors.pin}>
          <input class="text-input" type="password" inputMode="numeric" autocomplete="new-password" {...describedBy('np-pin', true, errors.pin)}
            value={input.pin} onInput={field('pin')} />
        </FormField>
        <FormField id="np-pin-again" label="First PIN again" error={errors.pinAgain}>
          <input class="text-input" type="password" inputMode="numeric" autocomplete="new-password" {...describedBy('np-pin-again', false, errors.pinAgain)}
            value={input.pinAgain} onInput={field('pinAgain')} />
        </FormField>
      </div>
      {errors.form ? <p class="error-text" role="alert">{errors.form}</p> : null}
      <p class="hint">Tell the person their login and PIN yourself; the PIN is not shown again.</p>
      <div class="row">
        <button type="submit" class="btn primary" disabled={busy}>{busy ? 'Adding…' : 'Add person'}</button>
        <button type="button" class="btn" onClick={onDone}>Cancel</button>
      </div>
    </form>
  );
}

import { useState } from 'preact/hooks';
import type { FieldErrors } from '../../app/admin-forms';
import type { AppActions } from '../../app/app-state';
import { PIN_RULE, type Person } from '../../schema';
import { describedBy, FormField } from './FormField';

/** A new PIN for someone who forgot theirs, typed twice. */
export function ResetPinForm({ person, actions, onDone }: { person: Person; actions: AppActions; onDone(): void }) {
  const [pin, setPin] = useState('');
  const [again, setAgain] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const [busy, setBusy] = useState(false);
  const id = `pin-${person.id}`;
  const submit = async (e: Event) => {
    e.preventDefault();
    setBusy(true);
    const outcome = await actions.adminResetPin(person.id, pin, again);
    setBusy(false);
    if (outcome.ok) onDone();
    else setErrors(outcome.errors);
  };
  return (
    <form class="stack" onSubmit={submit} aria-label={`Set a new PIN for ${person.name}`} noValidate>
      <div class="admin-form-grid">
        <FormField id={id} label={`New PIN for ${person.name}`} hint={PIN_RULE} error={errors.pin}>
          <input class="text-input" type="password" inputMode="numeric" autocomplete="new-password" {...describedBy(id, true, errors.pin)}
            value={pin} onInput={(e) => setPin((e.target as HTMLInputElement).value)} />
        </FormField>
        <FormField id={`${id}-again`} label="New PIN again" error={errors.pinAgain}>
          <input class="text-input" type="password" inputMode="numeric" autocomplete="new-password" {...describedBy(`${id}-again`, false, errors.pinAgain)}
            value={again} onInput={(e) => setAgain((e.target as HTMLInputElement).value)} />
        </FormField>
      </div>
      {errors.form ? <p class="error-text" role="alert">{errors.form}</p> : null}
      <div class="row">
        <button type="submit" class="btn small primary" disabled={busy}>{busy ? 'Saving…' : 'Set new PIN'}</button>
        <button type="button" class="btn small" onClick={onDone}>Cancel</button>
      </div>
    </form>
  );
}

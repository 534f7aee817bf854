import { useState } from 'preact/hooks';
import { z } from '../../schema';

const Name = z.string().check(z.trim(), z.minLength(1), z.maxLength(80));

/** One name to type and save (a new line or station, or a new name for one); checked as typed. */
export function NameForm({ id, label, initial = '', submitLabel, onSave, onCancel }: {
  id: string; label: string; initial?: string; submitLabel: string; onSave: (name: string) => Promise<boolean>; onCancel?: () => void;
}) {
  const [name, setName] = useState(initial);
  const [tried, setTried] = useState(false);
  const [busy, setBusy] = useState(false);
  const parsed = Name.safeParse(name);
  const error = !tried && name === initial ? undefined : !parsed.success ? (name.trim() ? 'At most 80 characters.' : 'Give a name.') : undefined;
  const submit = async (e: Event) => {
    e.preventDefault();
    setTried(true);
    if (!parsed.success) return;
    setBusy(true);
    const ok = await onSave(parsed.data);
    setBusy(false);
    if (ok && !initial) {
      setName('');
      setTried(false);
    }
  };
  return (
    <form class="inline-form" onSubmit={submit} noValidate>
      <div class="entry-field setup-field">
        <label for={id}>{label}</label>
        <input id={id} class="text-input" value={name} autoComplete="off" aria-invalid={error ? 'true' : undefined}
          aria-describedby={error ? `${id}-error` : undefined} onInput={(e) => setName((e.target as HTMLInputElement).value)} />
        {error ? <span id={`${id}-error`} class="error-text field-error">{error}</span> : null}
      </div>
      <button type="submit" class="btn small" disabled={busy}>{submitLabel}</button>
      {onCancel ? <button type="button" class="btn small quiet" onClick={onCancel}>Cancel</button> : null}
    </form>
  );
}

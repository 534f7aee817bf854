/**
 * A labelled text input (or, `multiline`, a text area for a reason or a note) with its hint and,
 * when wrong, the problem beside it (linked for screen readers).
 */
export function TextField({ id, label, value, onInput, error, hint, inputMode, width, testId, multiline }: {
  id: string; label: string; value: string; onInput: (value: string) => void; error?: string | undefined; hint?: string;
  inputMode?: 'numeric' | 'decimal' | 'text'; width?: string; testId?: string; multiline?: boolean;
}) {
  const describedBy = [hint ? `${id}-hint` : '', error ? `${id}-error` : ''].filter(Boolean).join(' ');
  const common = {
    id, class: 'text-input', value, 'aria-invalid': error ? ('true' as const) : undefined, 'aria-describedby': describedBy || undefined, 'data-testid': testId,
    onInput: (e: Event) => onInput((e.target as HTMLInputElement | HTMLTextAreaElement).value),
  };
  return (
    <div class="entry-field setup-field" style={width ? `max-width:${width}` : undefined}>
      <label for={id}>{label}</label>
      {multiline ? <textarea {...common} /> : <input {...common} inputMode={inputMode} autoComplete="off" />}
      {hint ? <span id={`${id}-hint`} class="hint">{hint}</span> : null}
      {error ? <span id={`${id}-error`} class="error-text field-error">{error}</span> : null}
    </div>
  );
}

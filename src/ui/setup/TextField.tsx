/** A labelled text input with its hint and, when wrong, the problem beside it (linked for screen readers). */
export function TextField({ id, label, value, onInput, error, hint, inputMode, width, testId }: {
  id: string; label: string; value: string; onInput: (value: string) => void; error?: string | undefined; hint?: string;
  inputMode?: 'numeric' | 'decimal' | 'text'; width?: string; testId?: string;
}) {
  const describedBy = [hint ? `${id}-hint` : '', error ? `${id}-error` : ''].filter(Boolean).join(' ');
  return (
    <div class="entry-field setup-field" style={width ? `max-width:${width}` : undefined}>
      <label for={id}>{label}</label>
      <input id={id} class="text-input" value={value} inputMode={inputMode} autoComplete="off"
        aria-invalid={error ? 'true' : undefined} aria-describedby={describedBy || undefined} data-testid={testId}
        onInput={(e) => onInput((e.target as HTMLInputElement).value)} />
      {hint ? <span id={`${id}-hint`} class="hint">{hint}</span> : null}
      {error ? <span id={`${id}-error`} class="error-text field-error">{error}</span> : null}
    </div>
  );
}

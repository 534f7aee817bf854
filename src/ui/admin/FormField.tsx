import type { ComponentChildren } from 'preact';

/** A labelled form field with its hint and its error, both tied to the input for screen readers. */
export function FormField({ id, label, hint, error, children }: { id: string; label: string; hint?: string; error?: string; children: ComponentChildren }) {
  return (
    <div class="stack" style="gap:6px">
      <label for={id}>{label}</label>
      {children}
      {hint ? <span class="hint" id={`${id}-hint`}>{hint}</span> : null}
      {error ? <span class="error-text" id={`${id}-error`}>{error}</span> : null}
    </div>
  );
}

/** The aria attributes of an input inside FormField. */
export function describedBy(id: string, hint: boolean, error: string | undefined) {
  const ids = [hint ? `${id}-hint` : '', error ? `${id}-error` : ''].filter(Boolean).join(' ');
  return { id, 'aria-invalid': error ? ('true' as const) : undefined, 'aria-describedby': ids || undefined };
}

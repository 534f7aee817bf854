import { useEffect, useRef } from 'preact/hooks';

/**
 * The last step before a phase is started, changed or withdrawn: what will change on the chart, in
 * plain words, with the button that does it and one that goes back to the form.
 */
export function ConfirmChange({ title, lines, confirmLabel, busy, onConfirm, onBack, testId }: {
  title: string; lines: readonly string[]; confirmLabel: string; busy: boolean;
  onConfirm: () => void; onBack: () => void; testId: string;
}) {
  const heading = useRef<HTMLHeadingElement>(null);
  // The panel replaces the buttons: move the focus to it so a screen reader reads it out.
  useEffect(() => heading.current?.focus(), []);
  return (
    <section class="caution stack confirm-change" aria-labelledby={`${testId}-title`} data-testid={testId}>
      <h2 id={`${testId}-title`} tabIndex={-1} ref={heading}>{title}</h2>
      {lines.map((l) => <p key={l}>{l}</p>)}
      <div class="row">
        <button type="button" class="btn primary" disabled={busy} onClick={onConfirm} data-testid={`${testId}-yes`}>{busy ? 'Saving…' : confirmLabel}</button>
        <button type="button" class="btn" disabled={busy} onClick={onBack}>Go back to the form</button>
      </div>
    </section>
  );
}

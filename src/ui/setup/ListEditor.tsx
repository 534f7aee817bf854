import { GrowingTextArea } from './GrowingTextArea';

/** An ordered list of short texts: add, change, remove and move up or down (reaction plan steps, cause categories). */
export function ListEditor({ idPrefix, itemLabel, items, onChange, addLabel, error }: {
  idPrefix: string; itemLabel: string; items: readonly string[]; onChange: (items: string[]) => void; addLabel: string; error?: string | undefined;
}) {
  const move = (i: number, by: -1 | 1) => {
    const next = [...items];
    const [item] = next.splice(i, 1);
    next.splice(i + by, 0, item!);
    onChange(next);
  };
  return (
    <div class="stack" style="gap:8px">
      <ol class="list-editor">
        {items.map((item, i) => (
          <li key={i} class="list-editor-row">
            <span class="list-editor-no" aria-hidden="true">{i + 1}.</span>
            <label class="sr-only" for={`${idPrefix}-${i}`}>{itemLabel} {i + 1}</label>
            <GrowingTextArea id={`${idPrefix}-${i}`} value={item} onInput={(v) => onChange(items.map((x, j) => (j === i ? v : x)))} />
            <button type="button" class="btn small" disabled={i === 0} onClick={() => move(i, -1)} aria-label={`Move ${itemLabel.toLowerCase()} ${i + 1} up`}>↑</button>
            <button type="button" class="btn small" disabled={i === items.length - 1} onClick={() => move(i, 1)} aria-label={`Move ${itemLabel.toLowerCase()} ${i + 1} down`}>↓</button>
            <button type="button" class="btn small" onClick={() => onChange(items.filter((_, j) => j !== i))} aria-label={`Remove ${itemLabel.toLowerCase()} ${i + 1}`}>Remove</button>
          </li>
        ))}
      </ol>
      <button type="button" class="btn small" style="align-self:flex-start" onClick={() => onChange([...items, ''])}>{addLabel}</button>
      {error ? <span class="error-text field-error" role="status">{error}</span> : null}
    </div>
  );
}

import { useLayoutEffect, useRef } from 'preact/hooks';

/**
 * A one-paragraph text box that grows with what is typed, so a long line (a reaction plan step)
 * can be read whole. Line breaks are not part of the value: Enter does nothing and pasted breaks
 * become spaces, as in a one-line input.
 */
export function GrowingTextArea({ id, value, onInput, class: cls = 'text-input' }: {
  id: string; value: string; onInput: (value: string) => void; class?: string;
}) {
  const box = useRef<HTMLTextAreaElement>(null);
  useLayoutEffect(() => {
    const el = box.current;
    // Browsers that size the box to its content themselves (CSS field-sizing) need no help.
    if (!el || (typeof CSS !== 'undefined' && CSS.supports?.('field-sizing', 'content'))) return;
    el.style.height = 'auto';
    el.style.height = `${el.scrollHeight + el.offsetHeight - el.clientHeight}px`;
  }, [value]);
  return (
    <textarea id={id} ref={box} class={`${cls} growing-text`} rows={1} value={value} autoComplete="off"
      onKeyDown={(e) => {
        if (e.key === 'Enter') e.preventDefault();
      }}
      onInput={(e) => onInput((e.target as HTMLTextAreaElement).value.replace(/\s*[\r\n]+\s*/g, ' '))} />
  );
}

/** A large on-screen keypad for gloved hands. Emits keys; the field that has focus decides what they mean. */
export type KeypadKey = '0' | '1' | '2' | '3' | '4' | '5' | '6' | '7' | '8' | '9' | 'sep' | 'minus' | 'back' | 'next';

interface KeypadProps {
  readonly separator: ',' | '.';
  readonly onKey: (key: KeypadKey) => void;
  readonly allowDecimal: boolean;
  readonly allowMinus: boolean;
  readonly nextLabel: string;
  /** For a PIN: no separator key at all (a PIN has no decimal point), and the last key reads as the screen's main action. */
  readonly pin?: boolean;
}

export function Keypad({ separator, onKey, allowDecimal, allowMinus, nextLabel, pin = false }: KeypadProps) {
  const key = (k: KeypadKey, label: string, aria?: string, disabled = false) => (
    <button type="button" onClick={() => onKey(k)} aria-label={aria ?? label} disabled={disabled} data-key={k}>
      {label}
    </button>
  );
  return (
    <div class="keypad" role="group" aria-label="Number keys">
      {key('7', '7')}{key('8', '8')}{key('9', '9')}
      {key('4', '4')}{key('5', '5')}{key('6', '6')}
      {key('1', '1')}{key('2', '2')}{key('3', '3')}
      {pin ? <span class="keypad-gap" aria-hidden="true" /> : key('sep', separator, 'Decimal separator', !allowDecimal)}
      {key('0', '0')}
      {key('back', '⌫', 'Delete last digit')}
      {allowMinus ? key('minus', '±', 'Change sign') : null}
      <button type="button" class={`${allowMinus ? 'wide two' : 'wide'}${pin ? ' btn primary' : ''}`} onClick={() => onKey('next')} data-key="next">
        {nextLabel}
      </button>
    </div>
  );
}

/** Applies a keypad key to a field's text. Pure, so the entry logic is testable without a DOM. */
export function applyKey(text: string, key: KeypadKey, separator: ',' | '.'): string {
  switch (key) {
    case 'back':
      return text.slice(0, -1);
    case 'minus':
      return text.startsWith('-') ? text.slice(1) : `-${text}`;
    case 'sep':
      return text.includes(separator) ? text : `${text === '' || text === '-' ? `${text}0` : text}${separator}`;
    case 'next':
      return text;
    default:
      return text + key;
  }
}

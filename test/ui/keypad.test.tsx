// @vitest-environment happy-dom
import { cleanup, fireEvent, render, screen } from '@testing-library/preact';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { applyKey, Keypad, type KeypadKey } from '../../src/ui/Keypad';

afterEach(cleanup);

const type = (keys: readonly KeypadKey[], separator: ',' | '.' = ',') => keys.reduce((t, k) => applyKey(t, k, separator), '');

describe('applyKey', () => {
  it('appends digits', () => {
    expect(type(['1', '0', '2'])).toBe('102');
  });

  it('writes the locale’s separator, once, with a leading 0 when needed', () => {
    expect(type(['1', '0', 'sep', '2', '5'])).toBe('10,25');
    expect(type(['1', '0', 'sep', '2', '5'], '.')).toBe('10.25');
    expect(type(['sep', '5'])).toBe('0,5');
    expect(type(['1', 'sep', 'sep', '5'])).toBe('1,5');
    expect(type(['minus', 'sep', '5'], '.')).toBe('-0.5');
  });

  it('the minus key toggles the sign wherever the text is', () => {
    expect(type(['5', 'minus'])).toBe('-5');
    expect(type(['5', 'minus', 'minus'])).toBe('5');
    expect(type(['minus'])).toBe('-');
  });

  it('back deletes the last character, and nothing on an empty field', () => {
    expect(type(['1', '2', 'back'])).toBe('1');
    expect(type(['back'])).toBe('');
    expect(applyKey('1,', 'back', ',')).toBe('1');
  });

  it('next leaves the text alone', () => {
    expect(applyKey('10,2', 'next', ',')).toBe('10,2');
  });
});

describe('Keypad', () => {
  it('emits each key; the decimal key shows the separator', () => {
    const onKey = vi.fn();
    render(<Keypad separator="," allowDecimal allowMinus onKey={onKey} nextLabel="Next value" />);
    fireEvent.click(screen.getByRole('button', { name: '7' }));
    fireEvent.click(screen.getByRole('button', { name: 'Decimal separator' }));
    fireEvent.click(screen.getByRole('button', { name: 'Change sign' }));
    fireEvent.click(screen.getByRole('button', { name: 'Delete last digit' }));
    fireEvent.click(screen.getByRole('button', { name: 'Next value' }));
    expect(onKey.mock.calls.map((c) => c[0])).toEqual(['7', 'sep', 'minus', 'back', 'next']);
    expect(screen.getByRole('button', { name: 'Decimal separator' }).textContent).toBe(',');
  });

  it('disables the decimal key and hides the sign key for counts', () => {
    render(<Keypad separator="." allowDecimal={false} allowMinus={false} onKey={() => {}} nextLabel="Save sample" />);
    expect((screen.getByRole('button', { name: 'Decimal separator' }) as HTMLButtonElement).disabled).toBe(true);
    expect(screen.queryByRole('button', { name: 'Change sign' })).toBeNull();
    expect(screen.getByRole('button', { name: 'Save sample' })).toBeTruthy();
    expect(screen.getAllByRole('button').filter((b) => /^\d$/.test(b.textContent ?? ''))).toHaveLength(10);
    expect(screen.getByRole('button', { name: 'Save sample' }).classList.contains('primary')).toBe(false);
  });

  it('for a PIN: no decimal key at all, ten digits, and the last key styled as the main action', () => {
    render(<Keypad pin separator="." allowDecimal={false} allowMinus={false} onKey={() => {}} nextLabel="Sign in" />);
    expect(screen.queryByRole('button', { name: 'Decimal separator' })).toBeNull();
    expect(screen.queryByRole('button', { name: 'Change sign' })).toBeNull();
    expect(screen.getAllByRole('button').filter((b) => /^\d$/.test(b.textContent ?? ''))).toHaveLength(10);
    expect(screen.getByRole('button', { name: 'Sign in' }).className).toContain('btn primary');
  });
});

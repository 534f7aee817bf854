// @vitest-environment happy-dom
import { cleanup, fireEvent, render, screen } from '@testing-library/preact';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { ListEditor } from '../../src/ui/setup/ListEditor';

afterEach(cleanup);

describe('the list editor\'s growing text boxes', () => {
  it('shows each item in a text box that wraps, labelled by its number', () => {
    const long = 'Stop the cell, tag the last two parts red, measure them again on the bench gauge and call the setter';
    render(<ListEditor idPrefix="st" itemLabel="Step" items={[long]} onChange={() => undefined} addLabel="Add a step" />);
    const box = screen.getByLabelText('Step 1');
    expect(box.tagName).toBe('TEXTAREA');
    expect((box as HTMLTextAreaElement).value).toBe(long);
  });

  it('keeps an item one paragraph: Enter adds no line, pasted line breaks become spaces', () => {
    const onChange = vi.fn();
    render(<ListEditor idPrefix="st" itemLabel="Step" items={['Stop']} onChange={onChange} addLabel="Add a step" />);
    const box = screen.getByLabelText('Step 1');
    const enter = new KeyboardEvent('keydown', { key: 'Enter', bubbles: true, cancelable: true });
    box.dispatchEvent(enter);
    expect(enter.defaultPrevented).toBe(true);
    fireEvent.input(box, { target: { value: 'Stop the cell\nand call\r\n  the setter' } });
    expect(onChange).toHaveBeenLastCalledWith(['Stop the cell and call the setter']);
  });
});

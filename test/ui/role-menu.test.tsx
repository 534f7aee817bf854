// @vitest-environment happy-dom
import { cleanup, fireEvent, render, screen } from '@testing-library/preact';
import { afterEach, describe, expect, it } from 'vitest';
import type { Person } from '../../src/schema';
import { RoleMenu, roleMenuItems } from '../../src/ui/RoleMenu';
import { TopBar } from '../../src/ui/TopBar';
import { fakeActions, readyState } from './helpers';

afterEach(cleanup);

const person = (role: Person['role']): Person => ({ id: `p-${role}`, name: 'Noor', login: 'noor', role, active: true });
const labels = (role: Person['role']) => roleMenuItems(role).map((i) => i.label);

describe('roleMenuItems', () => {
  it('gives each role its own tools', () => {
    expect(labels('operator')).toEqual(['Site overview', 'Shift handover']);
    expect(labels('supervisor')).toEqual(['Site overview', 'Shift handover']);
    expect(labels('engineer')).toEqual(['Site overview', 'Shift handover', 'Set-up']);
    expect(labels('admin')).toEqual(['Site overview', 'Shift handover', 'Set-up', 'People & tablets']);
    expect(roleMenuItems(undefined)).toEqual([]);
  });
});

describe('RoleMenu', () => {
  const setUp = (role: Person['role'] = 'admin', screenName: 'board' | 'setup' = 'board') => {
    const actions = fakeActions();
    render(<RoleMenu state={readyState([], {}, { person: person(role), screen: { name: screenName } })} actions={actions} />);
    const button = screen.getByRole('button', { name: 'Tools' });
    const panel = screen.getByTestId('role-menu-panel');
    return { actions, button, panel };
  };

  it('is a disclosure button: closed at first, the panel hidden and named by aria-controls', () => {
    const { button, panel } = setUp();
    expect(button.getAttribute('aria-expanded')).toBe('false');
    expect(button.getAttribute('aria-controls')).toBe(panel.id);
    expect(panel.hidden).toBe(true);
  });

  it('opens with Enter or Space (a native button: a key press is a click) and focuses the first tool', () => {
    for (const key of ['Enter', ' ']) {
      const { button, panel } = setUp();
      button.focus();
      fireEvent.keyDown(button, { key });
      fireEvent.click(button); // what the browser does for Enter/Space on a <button>
      expect(button.getAttribute('aria-expanded')).toBe('true');
      expect(panel.hidden).toBe(false);
      expect(document.activeElement?.textContent).toBe('Site overview');
      cleanup();
    }
  });

  it('Escape closes it and gives focus back to the button', () => {
    const { button, panel } = setUp();
    fireEvent.click(button);
    fireEvent.keyDown(document.activeElement!, { key: 'Escape' });
    expect(button.getAttribute('aria-expanded')).toBe('false');
    expect(panel.hidden).toBe(true);
    expect(document.activeElement).toBe(button);
  });

  it('the arrow keys, Home and End move between the tools, wrapping round', () => {
    const { button } = setUp('admin');
    fireEvent.click(button);
    const focused = () => document.activeElement?.textContent;
    fireEvent.keyDown(document.activeElement!, { key: 'ArrowDown' });
    expect(focused()).toBe('Shift handover');
    fireEvent.keyDown(document.activeElement!, { key: 'End' });
    expect(focused()).toBe('People & tablets');
    fireEvent.keyDown(document.activeElement!, { key: 'ArrowDown' });
    expect(focused()).toBe('Site overview');
    fireEvent.keyDown(document.activeElement!, { key: 'ArrowUp' });
    expect(focused()).toBe('People & tablets');
    fireEvent.keyDown(document.activeElement!, { key: 'Home' });
    expect(focused()).toBe('Site overview');
  });

  it('a tool opens its screen and closes the menu', () => {
    const { actions, button, panel } = setUp('engineer');
    fireEvent.click(button);
    fireEvent.click(screen.getByTestId('open-setup'));
    expect(actions.open).toHaveBeenCalledWith({ name: 'setup' });
    expect(panel.hidden).toBe(true);
    expect(button.getAttribute('aria-expanded')).toBe('false');
  });

  it('a press outside closes it', () => {
    const { button, panel } = setUp();
    fireEvent.click(button);
    fireEvent.pointerDown(document.body);
    expect(panel.hidden).toBe(true);
  });

  it('marks the screen in use as the current page', () => {
    setUp('engineer', 'setup');
    expect(screen.getByTestId('open-setup').getAttribute('aria-current')).toBe('page');
    expect(screen.getByTestId('menu-overview').getAttribute('aria-current')).toBeNull();
  });

  it('lists only the role\'s tools, as buttons a screen reader finds in a named list', () => {
    setUp('operator');
    const list = screen.getByRole('list', { hidden: true });
    expect(list.getAttribute('aria-label')).toBe('Tools for your role');
    expect(screen.getAllByRole('button', { hidden: true }).map((b) => b.textContent)).toEqual(['Tools', 'Site overview', 'Shift handover']);
    expect(screen.queryByTestId('open-setup')).toBeNull();
    expect(screen.queryByTestId('open-admin')).toBeNull();
  });
});

describe('TopBar with the menu', () => {
  it('keeps the sync state and the person in the bar, outside the menu', () => {
    render(<TopBar state={readyState([], {}, { person: person('admin') })} actions={fakeActions()} />);
    const panel = screen.getByTestId('role-menu-panel');
    expect(panel.contains(screen.getByTestId('sync-pill'))).toBe(false);
    expect(panel.contains(screen.getByTestId('person-pill'))).toBe(false);
    expect(panel.contains(screen.getByTestId('open-admin'))).toBe(true);
  });

  it('has no menu before anyone signs in', () => {
    render(<TopBar state={readyState([], {}, { stage: 'sign-in', person: undefined })} actions={fakeActions()} />);
    expect(screen.queryByTestId('role-menu-button')).toBeNull();
  });
});

import { useEffect, useRef, useState } from 'preact/hooks';
import type { AppActions, AppState, Screen } from '../app/app-state';

/** One way into a tool of the role menu. */
interface MenuItem {
  readonly label: string;
  readonly screen: Screen;
  readonly testId: string;
  /** Screens that count as "here" for this item (aria-current). */
  readonly current: readonly Screen['name'][];
}

/**
 * The tools the signed-in person's role may open, in the order they appear in the menu.
 * Everyone reads the site overview and the shift handover; engineers and admins change set-up;
 * admins manage people and tablets.
 */
export function roleMenuItems(role: string | undefined): MenuItem[] {
  if (!role) return [];
  const items: MenuItem[] = [
    { label: 'Site overview', screen: { name: 'overview' }, testId: 'menu-overview', current: ['overview'] },
    { label: 'Shift handover', screen: { name: 'handover' }, testId: 'menu-handover', current: ['handover'] },
  ];
  if (role === 'engineer' || role === 'admin') {
    items.push({ label: 'Set-up', screen: { name: 'setup' }, testId: 'open-setup', current: ['setup', 'edit-characteristic'] });
  }
  if (role === 'admin') items.push({ label: 'People & tablets', screen: { name: 'admin', tab: 'people' }, testId: 'open-admin', current: ['admin'] });
  return items;
}

/**
 * "Tools": a disclosure button in the top bar that shows the role's tools in a panel beneath it.
 * Enter or Space opens it (it is a plain button) and moves focus to the first tool; the arrow keys
 * move between tools; Escape, or a press outside, closes it, and Escape gives focus back to the button.
 * The panel stays in the page while closed (hidden), so it is found the same way open or closed.
 */
export function RoleMenu({ state, actions }: { state: AppState; actions: AppActions }) {
  const [open, setOpen] = useState(false);
  const root = useRef<HTMLDivElement>(null);
  const button = useRef<HTMLButtonElement>(null);
  const items = roleMenuItems(state.person?.role);
  const itemButtons = () => [...(root.current?.querySelectorAll<HTMLButtonElement>('.role-menu-item') ?? [])];

  useEffect(() => {
    if (!open) return;
    itemButtons()[0]?.focus();
    const away = (e: Event) => {
      if (root.current && !root.current.contains(e.target as Node)) setOpen(false);
    };
    document.addEventListener('pointerdown', away);
    document.addEventListener('focusin', away);
    return () => {
      document.removeEventListener('pointerdown', away);
      document.removeEventListener('focusin', away);
    };
  }, [open]);

  if (!items.length) return null;
  const close = (refocus: boolean) => {
    setOpen(false);
    if (refocus) button.current?.focus();
  };
  const onKeyDown = (e: KeyboardEvent) => {
    if (!open) return;
    if (e.key === 'Escape') {
      e.preventDefault();
      close(true);
      return;
    }
    const list = itemButtons();
    const at = list.indexOf(document.activeElement as HTMLButtonElement);
    const to = e.key === 'ArrowDown' ? at + 1 : e.key === 'ArrowUp' ? at - 1 : e.key === 'Home' ? 0 : e.key === 'End' ? list.length - 1 : null;
    if (to === null || !list.length) return;
    e.preventDefault();
    list[(to + list.length) % list.length]?.focus();
  };
  return (
    <div class="role-menu" ref={root} onKeyDown={onKeyDown}>
      <button type="button" ref={button} class="pill role-menu-button" aria-expanded={open} aria-controls="role-menu-panel"
        onClick={() => setOpen(!open)} data-testid="role-menu-button">
        <span class="role-menu-glyph" aria-hidden="true" />
        <span>Tools</span>
      </button>
      <div id="role-menu-panel" class="role-menu-panel" hidden={!open} data-testid="role-menu-panel">
        <ul aria-label="Tools for your role">
          {items.map((it) => {
            const here = it.current.includes(state.screen.name);
            return (
              <li key={it.testId}>
                <button type="button" class="role-menu-item" data-testid={it.testId} aria-current={here ? 'page' : undefined}
                  onClick={() => {
                    close(false);
                    actions.open(it.screen);
                  }}>
                  {it.label}
                </button>
              </li>
            );
          })}
        </ul>
      </div>
    </div>
  );
}

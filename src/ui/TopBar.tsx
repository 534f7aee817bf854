import { formatClock } from './format-time';
import type { AppState, SyncView } from '../app/app-state';
import type { AppActions } from '../app/app-state';
import { RoleMenu } from './RoleMenu';

function clock(iso: string | undefined): string {
  if (!iso) return 'never';
  return formatClock(iso);
}

/** What a sync in progress is doing, in words: sending only while there is something to send, never "0/0". */
function syncingText(p: SyncView['progress'], pending: number): string {
  if (!p) return pending > 0 ? 'Sending…' : 'Syncing…';
  if (p.toPush > 0) return `Sending ${Math.min(p.pushed, p.toPush)} of ${p.toPush}…`;
  return p.pulled > 0 ? `Receiving updates… ${p.pulled}` : 'Checking for updates…';
}

/** The sync state in plain words, e.g. "3 waiting to send · offline". */
export function describeSync(s: SyncView): { text: string; tone: 'clear' | 'waiting' | 'failing' } {
  const waiting = s.pending > 0 ? `${s.pending} waiting to send` : 'All sent';
  if (s.state === 'syncing') {
    return { text: syncingText(s.progress, s.pending), tone: 'waiting' };
  }
  if (s.withdrawn) return { text: `${waiting} · tablet withdrawn`, tone: 'failing' };
  if (s.state === 'offline') return { text: `${waiting} · no connection`, tone: s.pending ? 'waiting' : 'clear' };
  if (s.state === 'error') return { text: `${waiting} · last try failed`, tone: 'failing' };
  if (s.rejected > 0) return { text: `${waiting} · ${s.rejected} refused by server`, tone: 'failing' };
  return { text: `${waiting} · last sync ${clock(s.lastSuccessAt)}`, tone: s.pending ? 'waiting' : 'clear' };
}

export function TopBar({ state, actions }: { state: AppState; actions: AppActions }) {
  const station = state.setup.stations.find((s) => s.id === state.stationId);
  const line = station && state.setup.lines.find((l) => l.id === station.lineId);
  const sync = describeSync(state.sync);
  return (
    <header class={`topbar${state.person ? ' with-person' : ''}`}>
      <div class="mark">
        <img src="/icons/plumbline.svg" alt="" />
        <span class="mark-word">Plumbline</span>
      </div>
      {station ? (
        <div class="where" data-testid="where">
          {line ? `${line.name} · ` : ''}
          {station.name}
        </div>
      ) : null}
      <div class="spacer" />
      <button
        type="button"
        class={`pill sync-pill ${sync.tone}`}
        onClick={() => void actions.openSyncDetails()}
        title={state.sync.lastError ?? 'Sending and receiving: details and Sync now'}
        data-testid="sync-pill"
      >
        <span class="dot" aria-hidden="true" />
        <span class="pill-text">{sync.text}</span>
      </button>
      <button type="button" class="pill theme-toggle" onClick={() => actions.setTheme(state.theme === 'dark' ? 'light' : 'dark')}
        aria-label={state.theme === 'dark' ? 'Use the light theme' : 'Use the dark theme'} data-testid="theme-toggle">
        <span aria-hidden="true">{state.theme === 'dark' ? '☀' : '☾'}</span>
        <span class="pill-word">{state.theme === 'dark' ? 'Light' : 'Dark'}</span>
      </button>
      {state.stage === 'ready' && state.person ? <RoleMenu state={state} actions={actions} /> : null}
      {state.person ? (
        <button type="button" class="pill person-pill" onClick={() => actions.signOut()} data-testid="person-pill" title="Change person">
          <span class="pill-text">{state.person.name} · {state.person.role}</span>
        </button>
      ) : null}
    </header>
  );
}

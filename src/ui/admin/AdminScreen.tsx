import type { AppActions, AppState } from '../../app/app-state';
import { formatClock } from '../format-time';
import { PeoplePanel } from './PeoplePanel';
import { TabletsPanel } from './TabletsPanel';

const TABS = [
  { tab: 'people', label: 'People' },
  { tab: 'tablets', label: 'Tablets' },
] as const;

/** The site admin's people and tablets. Everything here is read from and changed on the site server: online only. */
export function AdminScreen({ state, actions, tab }: { state: AppState; actions: AppActions; tab: 'people' | 'tablets' }) {
  const view = state.admin ?? { loading: true };
  return (
    <main class="main stack" data-testid="admin-screen">
      <button type="button" class="btn quiet small back-link" onClick={() => actions.open({ name: 'board' })}>← Station board</button>
      <div class="row" style="justify-content:space-between">
        <h1 id="admin-title">People and tablets</h1>
        <div class="row" style="gap:8px">
          <div class="row" style="gap:8px" role="group" aria-label="Section">
            {TABS.map((t) => (
              <button type="button" key={t.tab} class={`btn small${t.tab === tab ? ' primary' : ''}`} aria-pressed={t.tab === tab}
                onClick={() => actions.open({ name: 'admin', tab: t.tab })}>
                {t.label}
              </button>
            ))}
          </div>
          <button type="button" class="btn small" onClick={() => void actions.adminReload()} disabled={view.loading}>
            {view.loading ? 'Loading…' : 'Refresh'}
          </button>
        </div>
      </div>
      <p class="hint">
        Read from the site server{view.loadedAt ? ` at ${formatClock(new Date(view.loadedAt).toISOString())}` : ''}. Changes are made on the
        server straight away and need a connection; tablets take them up at their next sync.
      </p>
      {view.problem ? <p class="caution" role="alert" data-testid="admin-problem">{view.problem}</p> : null}
      {view.notice ? <p class="caution all-clear" role="status" data-testid="admin-notice">{view.notice}</p> : null}
      {tab === 'people' ? <PeoplePanel state={state} view={view} actions={actions} /> : <TabletsPanel state={state} view={view} actions={actions} />}
    </main>
  );
}

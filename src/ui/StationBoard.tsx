import type { AppActions, AppState } from '../app/app-state';
import { formatShortDateTime } from './format-time';
import { StateChips } from './state-chips';

const CHART_NAMES: Record<string, string> = {
  xmr: 'Individuals & moving range', 'xbar-r': 'X̄ & R', 'xbar-s': 'X̄ & s', p: 'p (proportion)', np: 'np (count)', c: 'c (defects)', u: 'u (defects per unit)', ewma: 'EWMA', cusum: 'CUSUM',
};

/** The station's characteristics with their state: what needs doing first comes first. */
export function StationBoard({ state, actions }: { state: AppState; actions: AppActions }) {
  const { setup } = state;
  const chars = setup.characteristics.filter((c) => c.stationId === state.stationId);
  const rank = (id: string) => {
    const v = state.views[id];
    if (!v) return 9;
    if (v.groups.some((g) => g.state === 'unanswered')) return 0;
    if (v.due.kind === 'late') return 1;
    if (v.due.kind === 'due' || v.due.kind === 'not-started') return 2;
    return 3;
  };
  const sorted = [...chars].sort((a, b) => rank(a.id) - rank(b.id) || a.name.localeCompare(b.name));
  return (
    <main class="main stack">
      <nav class="row" aria-label="Stations">
        {[...setup.lines].sort((a, b) => a.name.localeCompare(b.name)).map((line) => (
          <div class="row" key={line.id} style="gap:8px">
            <span class="hint">{line.name}:</span>
            {setup.stations.filter((s) => s.lineId === line.id).map((s) => (
              <button type="button" key={s.id} class={`btn small${s.id === state.stationId ? ' primary' : ''}`}
                aria-current={s.id === state.stationId ? 'true' : undefined} onClick={() => actions.selectStation(s.id)}>
                {s.name}
              </button>
            ))}
          </div>
        ))}
      </nav>
      <div class="row" style="justify-content:space-between">
        <h1>Characteristics at this station</h1>
        <button type="button" class="btn small" onClick={() => actions.open({ name: 'overview' })} data-testid="open-overview">Site overview</button>
      </div>
      {sorted.length === 0 ? <p class="hint">No characteristics are set up for this station yet.</p> : null}
      <div class="tiles">
        {sorted.map((c) => {
          const v = state.views[c.id];
          const unanswered = v?.groups.some((g) => g.state === 'unanswered');
          const last = v?.series.samples[v.series.samples.length - 1];
          return (
            <button type="button" key={c.id} class={`tile${unanswered ? ' attention' : v?.due.kind === 'late' ? ' late' : ''}`}
              onClick={() => actions.open({ name: 'characteristic', characteristicId: c.id })} data-testid={`tile-${c.id}`}>
              <span class="name">{c.name}{c.safetyCritical ? ' ⚠' : ''}</span>
              <span class="meta">{CHART_NAMES[c.chartType]} · {c.unit} · every {c.intervalMinutes} min</span>
              {v ? <StateChips view={v} /> : <span class="hint">Loading…</span>}
              {last ? (
                <span class="meta">Last: {formatShortDateTime(last.takenAt)}</span>
              ) : null}
            </button>
          );
        })}
      </div>
    </main>
  );
}

import type { AppActions, AppState } from '../app/app-state';
import { CausesPanel } from './CausesPanel';
import { StateChips } from './state-chips';

/** Every line and station of the site at a glance: open signals, late samples, what is quiet. */
export function SiteOverview({ state, actions }: { state: AppState; actions: AppActions }) {
  const { setup } = state;
  const lines = [...setup.lines].sort((a, b) => a.name.localeCompare(b.name));
  const open = Object.values(state.views).reduce((n, v) => n + v.groups.filter((g) => g.state === 'unanswered').length, 0);
  const awaiting = Object.values(state.views).reduce((n, v) => n + v.groups.filter((g) => g.state === 'answered').length, 0);
  const late = Object.values(state.views).filter((v) => v.due.kind === 'late').length;
  return (
    <main class="main stack">
      <div class="row" style="justify-content:space-between">
        <h1>Site overview</h1>
        <div class="row" style="gap:8px">
          <button type="button" class="btn small" onClick={() => actions.open({ name: 'handover' })} data-testid="open-handover">Shift handover</button>
          <button type="button" class="btn small" onClick={() => actions.open({ name: 'board' })}>Back to my station</button>
        </div>
      </div>
      <div class="figures figures-totals" aria-label="Site totals">
        <div class="figure"><div class="k">Signals without an answer</div><div class="v" data-testid="total-open">{open}</div></div>
        <div class="figure"><div class="k">Answered, awaiting sign-off</div><div class="v">{awaiting}</div></div>
        <div class="figure"><div class="k">Late samples</div><div class="v">{late}</div></div>
        <div class="figure"><div class="k">Waiting to send</div><div class="v">{state.sync.pending}</div></div>
      </div>
      <CausesPanel state={state} />
      {lines.map((line) => (
        <section class="card stack" key={line.id} aria-labelledby={`line-${line.id}`}>
          <h2 id={`line-${line.id}`}>{line.name}</h2>
          {setup.stations.filter((s) => s.lineId === line.id).map((st) => (
            <div class="stack" style="gap:8px" key={st.id}>
              <h3>{st.name}</h3>
              <ul class="signal-list">
                {setup.characteristics.filter((c) => c.stationId === st.id).map((c) => {
                  const v = state.views[c.id];
                  return (
                    <li class="signal-item overview-row" key={c.id}>
                      <button type="button" class="btn quiet small" style="justify-content:flex-start;padding-left:0"
                        onClick={() => { actions.selectStation(st.id); actions.open({ name: 'characteristic', characteristicId: c.id }); }}>
                        {c.name}
                      </button>
                      {v ? <StateChips view={v} /> : <span class="hint">Loading…</span>}
                    </li>
                  );
                })}
              </ul>
            </div>
          ))}
        </section>
      ))}
    </main>
  );
}

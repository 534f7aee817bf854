import type { AppActions, AppState } from '../app/app-state';
import { useState } from 'preact/hooks';
import { historyToCsv } from '../app/export-csv';
import { CapabilityPanel } from './chart/CapabilityPanel';
import { downloadText } from './download';
import { ChartPanel } from './chart/ChartPanel';
import { EntryPanel } from './EntryPanel';
import { SafetyCaution } from './SafetyCaution';
import { SignalHistory } from './SignalHistory';
import { StateChips } from './state-chips';

/** One characteristic: chart, figures, entry and signals side by side (stacked in portrait). */
export function CharacteristicScreen({ state, actions, characteristicId, separator }: {
  state: AppState; actions: AppActions; characteristicId: string; separator: ',' | '.';
}) {
  const [showCapability, setShowCapability] = useState(false);
  const view = state.views[characteristicId];
  const ch = state.setup.characteristics.find((c) => c.id === characteristicId);
  if (!ch) return <main class="main"><p>This characteristic is not set up on this tablet.</p></main>;
  const phase = view?.analysis.phases[view.analysis.phases.length - 1];
  const last = view?.analysis.points[view.analysis.points.length - 1];
  const d = ch.decimals + 1;
  const f = (v: number | null) => (v === null ? '—' : v.toFixed(d));
  const spec = [ch.spec.lsl !== undefined ? `LSL ${ch.spec.lsl}` : null, ch.spec.target !== undefined ? `target ${ch.spec.target}` : null, ch.spec.usl !== undefined ? `USL ${ch.spec.usl}` : null].filter(Boolean).join(' · ');
  return (
    <main class="main stack">
      <div class="char-head">
        <div class="stack" style="gap:8px">
          <button type="button" class="btn quiet small" onClick={() => actions.open({ name: 'board' })} style="align-self:flex-start;padding-left:0">
            ← Station board
          </button>
          <h1>{ch.name}</h1>
          <span class="hint">{ch.unit}{spec ? ` · ${spec}` : ' · no specification'} · sample every {ch.intervalMinutes} min</span>
        </div>
        {view ? <StateChips view={view} /> : null}
      </div>
      {ch.safetyCritical ? <SafetyCaution /> : null}
      {view?.analysis.warnings.map((w) => <p class="caution" key={w}>{w}</p>)}
      <div class="char-layout">
        <div class="stack area-chart">
          {view ? <ChartPanel view={view} state={state} actions={actions} /> : <p class="hint">Loading chart…</p>}
          {phase && last ? (
            <div class="figures" aria-label="Current limits">
              <div class="figure"><div class="k">Centre</div><div class="v">{f(last.centre)}</div></div>
              <div class="figure"><div class="k">UCL</div><div class="v">{f(last.ucl)}</div></div>
              <div class="figure"><div class="k">LCL</div><div class="v">{f(last.lcl)}</div></div>
              <div class="figure"><div class="k">Points</div><div class="v">{view!.analysis.points.length}</div></div>
              <div class="figure"><div class="k">Phase</div><div class="v">{view!.analysis.phases.length}{phase.provisional ? ' (provisional)' : ''}</div></div>
            </div>
          ) : null}
          {view ? (
            <div class="row" style="gap:8px">
              <button type="button" class="btn small" aria-expanded={showCapability}
                onClick={() => setShowCapability(!showCapability)} data-testid="toggle-capability">
                {showCapability ? 'Hide capability study' : 'Capability study'}
              </button>
              <button type="button" class="btn small" data-testid="export-csv" onClick={() => {
                const people = new Map(state.setup.people.map((p) => [p.id, p.name]));
                downloadText(`${ch.id}-history.csv`, historyToCsv(view, (id) => people.get(id) ?? id), 'text/csv');
              }}>
                Export history (CSV)
              </button>
              <button type="button" class="btn small" data-testid="open-limits-history" onClick={() => actions.open({ name: 'limits-history', characteristicId })}>
                Limits by phase
              </button>
              <button type="button" class="btn small" data-testid="open-report" onClick={() => actions.open({ name: 'report', characteristicId })}>
                Print report
              </button>
              {state.person?.role === 'engineer' || state.person?.role === 'admin' ? (
                <>
                  <button type="button" class="btn small" data-testid="open-new-phase" onClick={() => actions.open({ name: 'new-phase', characteristicId })}>Start a new phase</button>
                  <button type="button" class="btn small" data-testid="edit-characteristic" onClick={() => actions.open({ name: 'edit-characteristic', characteristicId })}>Change set-up</button>
                  <button type="button" class="btn small" data-testid="import-csv" onClick={() => actions.open({ name: 'import', characteristicId })}>
                    Import history (CSV)
                  </button>
                </>
              ) : null}
            </div>
          ) : null}
          {view && showCapability ? <CapabilityPanel view={view} /> : null}
        </div>
        <div class="area-entry">{view ? <EntryPanel view={view} actions={actions} separator={separator} /> : null}</div>
        <section class="card stack area-signals" aria-labelledby="signals-title">
          <h2 id="signals-title">Signals</h2>
          {view ? <SignalHistory view={view} state={state} actions={actions} /> : null}
        </section>
      </div>
    </main>
  );
}

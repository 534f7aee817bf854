import { useMemo, useState } from 'preact/hooks';
import type { AppActions, AppState } from '../app/app-state';
import { summarizeShift } from '../app/handover';
import { formatDateTime } from './format-time';
import { describeSync } from './TopBar';

const PERIODS = [8, 12, 24] as const;

/** The shift handover: what was recorded, what fired and where each signal stands, and whether all is sent. Printable. */
export function HandoverScreen({ state, actions }: { state: AppState; actions: AppActions }) {
  const [hours, setHours] = useState<(typeof PERIODS)[number]>(8);
  const to = state.now;
  const from = to - hours * 3_600_000;
  const views = state.setup.characteristics.map((c) => state.views[c.id]).filter((v) => v !== undefined);
  const h = useMemo(() => summarizeShift(views, from, to), [state.views, from, to]);
  const stations = new Map(state.setup.stations.map((s) => [s.id, s.name]));
  const sync = describeSync(state.sync);
  return (
    <main class="main stack handover">
      <div class="row no-print" style="justify-content:space-between">
        <h1>Shift handover</h1>
        <div class="row" style="gap:8px">
          <div class="row" style="gap:8px" role="group" aria-label="Period">
            {PERIODS.map((p) => (
              <button type="button" key={p} class={`btn small${p === hours ? ' primary' : ''}`} aria-pressed={p === hours} onClick={() => setHours(p)}>
                Last {p} h
              </button>
            ))}
          </div>
          <button type="button" class="btn small" onClick={() => print()}>Print</button>
          <button type="button" class="btn small" onClick={() => actions.open({ name: 'overview' })}>Site overview</button>
        </div>
      </div>
      <p class="print-only"><strong>Shift handover</strong></p>
      <p>
        {formatDateTime(new Date(from).toISOString())} to {formatDateTime(new Date(to).toISOString())}
        {state.person ? ` · prepared by ${state.person.name}` : ''}
      </p>
      <div class={`caution ${state.sync.pending === 0 && state.sync.rejected === 0 ? 'all-clear' : ''}`} role="status" data-testid="handover-sync">
        {state.sync.pending === 0 && state.sync.rejected === 0
          ? 'Everything recorded on this tablet has reached the site server.'
          : `Not everything has reached the server: ${sync.text}. Sync before handing over.`}
      </div>
      <div class="figures figures-totals" aria-label="Shift totals">
        <div class="figure"><div class="k">Samples taken</div><div class="v">{h.totals.samples}</div></div>
        <div class="figure"><div class="k">Signals without an answer</div><div class="v">{h.totals.unanswered}</div></div>
        <div class="figure"><div class="k">Awaiting sign-off</div><div class="v">{h.totals.awaitingSignOff}</div></div>
        <div class="figure"><div class="k">Late now</div><div class="v">{h.totals.late}</div></div>
      </div>
      <table class="handover-table" data-testid="handover-table">
        <caption class="sr-only">Per characteristic over the period</caption>
        <thead>
          <tr><th scope="col">Characteristic</th><th scope="col">Station</th><th scope="col">Samples (due)</th><th scope="col">Signals: open / to sign off / signed off</th><th scope="col">Late now</th></tr>
        </thead>
        <tbody>
          {h.rows.map((r) => (
            <tr key={r.characteristicId}>
              <th scope="row">{r.name}
                {r.notes.map((n) => <div class="hint" key={n.at}>{n.text}</div>)}
              </th>
              <td>{stations.get(r.stationId) ?? r.stationId}</td>
              <td>{r.samples} ({r.expected})</td>
              <td>{r.unanswered} / {r.awaitingSignOff} / {r.signedOff}</td>
              <td>{r.late ? 'Yes' : 'No'}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </main>
  );
}

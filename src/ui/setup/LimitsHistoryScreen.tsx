import type { AppActions, AppState } from '../../app/app-state';
import { SIGMA_METHOD_TEXT, limitsHistory, withdrawnPhases, type LimitsHistoryRow } from '../../app/limits-history';
import { canChangePhases, correctionLines, isChangeablePhase, withdrawalLine } from '../../app/phase-change';
import type { Phase } from '../../schema';
import { formatShortDateTime } from '../format-time';
import { CHART_SHORT_NAME } from './chart-names';
import './setup.css';
import './phase-change.css';

/** "+57%", "−12%": a ratio as a signed change. */
function percentChange(ratio: number): string {
  const pct = Math.round((ratio - 1) * 100);
  return `${pct >= 0 ? '+' : '−'}${Math.abs(pct)}%`;
}

/** Each phase of a characteristic with its limits, how they were set, and how they moved from the phase before. Printable. */
export function LimitsHistoryScreen({ state, actions, characteristicId }: { state: AppState; actions: AppActions; characteristicId: string }) {
  const ch = state.setup.characteristics.find((c) => c.id === characteristicId);
  const view = state.views[characteristicId];
  if (!ch) return <main class="main"><p>This characteristic is not set up on this tablet.</p></main>;
  if (!view) return <main class="main"><p class="hint">Loading…</p></main>;
  const rows = limitsHistory(view.analysis, view.series, state.setup.phases);
  const withdrawn = withdrawnPhases(state.setup.phases, characteristicId);
  // Phases in force and withdrawn ones, in the order they were started: the record shows what happened.
  const listed: ({ kind: 'row'; row: LimitsHistoryRow } | { kind: 'withdrawn'; phase: Phase })[] = [
    ...rows.map((row) => ({ kind: 'row' as const, row })), ...withdrawn.map((phase) => ({ kind: 'withdrawn' as const, phase })),
  ].sort((a, b) => (a.kind === 'row' ? a.row.number : a.phase.number) - (b.kind === 'row' ? b.row.number : b.phase.number));
  const byId = new Map(state.setup.phases.map((p) => [p.id, p]));
  const mayChange = canChangePhases(state.person?.role);
  const nameOf = (id: string) => state.setup.people.find((p) => p.id === id)?.name ?? id;
  const open = (phaseId: string) => actions.open({ name: 'edit-phase', characteristicId, phaseId });
  const d = ch.decimals + 2;
  const f = (v: number | null) => (v === null ? '—' : v.toFixed(d));
  const delta = (v: number | null | undefined) => (v === null || v === undefined ? null : `${v >= 0 ? '+' : '−'}${Math.abs(v).toFixed(d)}`);
  const how = (r: LimitsHistoryRow) => r.source === 'given' ? 'Given (earlier study or standard)' : `Baseline of ${r.baselineCount} subgroup${r.baselineCount === 1 ? '' : 's'}${r.provisional ? ' — provisional' : ''}`;
  return (
    <main class="main stack setup-screen">
      <button type="button" class="btn quiet small back-link no-print" onClick={() => actions.open({ name: 'characteristic', characteristicId })}>← {ch.name}</button>
      <div class="row" style="justify-content:space-between">
        <h1>Limits by phase: {ch.name}</h1>
        <button type="button" class="btn small no-print" onClick={() => window.print()}>Print</button>
      </div>
      <p class="hint">{ch.unit} · {CHART_SHORT_NAME[ch.chartType]} · {view.analysis.points.length} points · as of {formatShortDateTime(new Date(state.now).toISOString())}</p>
      <div class="table-scroll card" tabIndex={0} role="region" aria-label={`Limits by phase of ${ch.name} (scrolls sideways)`}>
        <table class="history-table" data-testid="limits-history">
          <caption class="sr-only">Limits of each phase of {ch.name}</caption>
          <thead>
            <tr>
              <th scope="col">Phase</th><th scope="col">Starts</th><th scope="col">Reason</th><th scope="col">Limits set by</th>
              <th scope="col">Centre</th><th scope="col">UCL</th><th scope="col">LCL</th><th scope="col">Sigma</th>
              <th scope="col">Points</th><th scope="col">Points with signals</th>
            </tr>
          </thead>
          <tbody>
            {listed.map((item) => {
              if (item.kind === 'withdrawn') {
                const p = item.phase;
                return (
                  <tr key={`w${p.number}`} class="withdrawn-row" data-testid={`history-row-${p.number}`}>
                    <th scope="row">Phase {p.number} <span class="phase-note">withdrawn</span></th>
                    <td data-label="Starts">{formatShortDateTime(p.startsAt)}</td>
                    <td data-label="Reason">{p.reason}{correctionLines(p, ch, nameOf, formatShortDateTime).map((l) => <span key={l} class="phase-note">{l}</span>)}
                      <span class="phase-note" data-testid={`withdrawn-note-${p.number}`}>{withdrawalLine(p, nameOf, formatShortDateTime)}</span></td>
                    <td data-label="Limits set by" colSpan={7}>Not used: its points are judged against the phase before.</td>
                  </tr>
                );
              }
              const r = item.row;
              const setupPhase = r.phaseId ? byId.get(r.phaseId) : undefined;
              return (
                <tr key={r.number} data-testid={`history-row-${r.number}`}>
                  <th scope="row">Phase {r.number}
                    {mayChange && setupPhase && isChangeablePhase(setupPhase) ? (
                      <button type="button" class="btn small no-print" style="display:block;margin-top:6px" onClick={() => open(setupPhase.id)}
                        aria-label={`Correct or withdraw phase ${r.number}`} data-testid={`change-phase-${r.number}`}>Correct…</button>
                    ) : null}
                  </th>
                  <td data-label="Starts">{r.firstPointAt ? formatShortDateTime(r.firstPointAt) : r.startsAt ? `${formatShortDateTime(r.startsAt)} (no points yet)` : '—'}</td>
                  <td data-label="Reason">{r.reason}{setupPhase ? correctionLines(setupPhase, ch, nameOf, formatShortDateTime).map((l) => <span key={l} class="phase-note">{l}</span>) : null}</td>
                  <td data-label="Limits set by">{how(r)}</td>
                  <td data-label="Centre">{f(r.centre)}<span class="delta">{delta(r.change?.centre)}</span></td>
                  <td data-label="UCL">{f(r.ucl)}{r.limitsVary ? ' (latest)' : ''}<span class="delta">{delta(r.change?.ucl)}</span></td>
                  <td data-label="LCL">{f(r.lcl)}{r.limitsVary ? ' (latest)' : ''}<span class="delta">{delta(r.change?.lcl)}</span></td>
                  <td data-label="Sigma">{f(r.sigma)} <span class="delta">{SIGMA_METHOD_TEXT[r.sigmaMethod]}{r.change?.sigmaRatio ? ` · ${percentChange(r.change.sigmaRatio)} vs phase before` : ''}</span></td>
                  <td data-label="Points">{r.points}</td>
                  <td data-label="Points with signals">{r.signalPoints}</td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      <p class="hint">Changes under each figure are against the phase before. Limits marked “latest” vary with the sample size (or settle over time on an EWMA chart); the row shows them at the phase's latest point.{mayChange ? ' A phase started at the wrong point, with the wrong reason or limits, or by mistake can be corrected or withdrawn; the note saying why stays in this history.' : ''}</p>
    </main>
  );
}

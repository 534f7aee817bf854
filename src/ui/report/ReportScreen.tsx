import { useMemo, useState } from 'preact/hooks';
import type { AppActions, AppState, CharacteristicView } from '../../app/app-state';
import { SIGMA_METHOD_TEXT } from '../../app/limits-history';
import { importedFromText } from '../../app/imported-from';
import { correctionLines, pointRange, withdrawalLine } from '../../app/phase-change';
import {
  REPORT_PERIODS, capabilityScope, phasesInRange, reportHeader, reportRange, signalCounts, signalsInRange,
  type ReportPeriod, type ReportRange,
} from '../../app/report';
import type { SignalGroup } from '../../app/signal-state';
import { isVariableChart, type Phase } from '../../schema';
import { CapabilityPanel } from '../chart/CapabilityPanel';
import { ChartPanel } from '../chart/ChartPanel';
import { formatDateTime, formatShortDateTime } from '../format-time';
import { ruleName } from '../rule-text';
import { SafetyCaution } from '../SafetyCaution';
import { CHART_SHORT_NAME } from '../setup/chart-names';
import './report.css';

const STATE_TEXT: Record<SignalGroup['state'], string> = {
  unanswered: 'OPEN: no answer yet',
  answered: 'Answered, awaiting sign-off',
  closed: 'Signed off',
  historical: 'In imported history, not answered',
};
const STATE_CHIP: Record<SignalGroup['state'], string> = { unanswered: 'signal', answered: 'answered', closed: 'steady', historical: 'neutral' };

/**
 * The printable report of one characteristic: a preview on screen (period choice, Print, back) and,
 * printed, a sheet with the header, the chart, limits by phase, capability and the signals with
 * their responses. Everyone signed in may print it.
 */
export function ReportScreen({ state, actions, characteristicId }: { state: AppState; actions: AppActions; characteristicId: string }) {
  const [period, setPeriod] = useState<ReportPeriod>('all');
  const ch = state.setup.characteristics.find((c) => c.id === characteristicId);
  const view = state.views[characteristicId];
  if (!ch) return <main class="main"><p>This characteristic is not set up on this tablet.</p></main>;
  return (
    <main class="main stack report-screen">
      <div class="report-controls no-print stack">
        <button type="button" class="btn quiet small back-link" onClick={() => actions.open({ name: 'characteristic', characteristicId })}>← {ch.name}</button>
        <div class="row" style="justify-content:space-between;align-items:flex-end">
          <fieldset>
            <legend>Period of the report</legend>
            <div class="choice-grid">
              {REPORT_PERIODS.map((p) => (
                <button type="button" key={p.id} class="choice" aria-pressed={period === p.id} onClick={() => setPeriod(p.id)} data-testid={`period-${p.id}`}>{p.label}</button>
              ))}
            </div>
          </fieldset>
          <button type="button" class="btn primary" data-testid="print-report" onClick={() => window.print()} disabled={!view}>Print</button>
        </div>
        <p class="hint">A preview of the paper: choose the period, then Print (A4 or Letter, portrait).</p>
      </div>
      {view ? <ReportSheet view={view} state={state} actions={actions} period={period} /> : <p class="hint">Loading…</p>}
    </main>
  );
}

function ReportSheet({ view, state, actions, period }: { view: CharacteristicView; state: AppState; actions: AppActions; period: ReportPeriod }) {
  const ch = view.characteristic;
  const range = useMemo(() => reportRange(view, period, state.now), [view, period, state.now]);
  const header = reportHeader(view, state.setup, range, period, state.person, state.now);
  const people = new Map(state.setup.people.map((p) => [p.id, p.name]));
  const who = (id: string) => people.get(id) ?? id;
  const groups = signalsInRange(view.groups, range);
  const counts = signalCounts(groups);
  const empty = range.to <= range.from;
  const hasSpec = ch.spec.lsl !== undefined || ch.spec.usl !== undefined;
  const chartName = `${CHART_SHORT_NAME[ch.chartType]}${isVariableChart(ch.chartType) && ch.subgroupSize > 1 ? `, subgroups of ${ch.subgroupSize}` : ''}`;
  const facts: [string, string][] = [
    ['Site', header.site ?? '—'],
    ['Line', header.line ?? '—'],
    ['Station', header.station ?? '—'],
    ['Characteristic', `${header.characteristic} (${header.unit})`],
    ['Specification', header.specification],
    ['Chart', chartName],
    ['Rules in force', header.rules],
    ['Period', `${header.periodLabel}: ${header.firstSampleAt && header.lastSampleAt ? `${formatDateTime(header.firstSampleAt)} to ${formatDateTime(header.lastSampleAt)}, ${header.points} point${header.points === 1 ? '' : 's'}` : 'no samples'}`],
    ['Printed', `${formatDateTime(header.printedAt)} by ${header.printedBy}`],
  ];
  return (
    <article class="report-sheet" aria-labelledby="report-title" data-testid="report-sheet">
      <header class="report-head">
        <p class="report-kind">Process control report</p>
        <h1 id="report-title">{ch.name}</h1>
        <dl class="report-facts" data-testid="report-header">
          {facts.map(([k, v]) => <div key={k}><dt>{k}</dt><dd>{v}</dd></div>)}
        </dl>
      </header>
      {header.safetyCritical ? <SafetyCaution /> : null}
      {view.analysis.warnings.map((w) => <p class="caution" key={w}>{w}</p>)}

      {empty ? <p class="hint" data-testid="report-empty">No samples were taken in this period.</p> : (
        <div class="report-chart">
          <ChartPanel view={view} state={state} actions={actions} span={range} />
        </div>
      )}

      <LimitsSection view={view} state={state} range={range} />

      {hasSpec && isVariableChart(ch.chartType) ? <CapabilitySection view={view} range={range} openSignals={counts.open} signals={counts.total} /> : null}

      <section class="report-section stack" aria-labelledby="report-signals">
        <h2 id="report-signals">Signals and responses</h2>
        <p data-testid="report-signal-summary">
          {counts.total === 0 ? 'No run rule fired in this period.' : (
            <>
              {counts.total} signal{counts.total === 1 ? '' : 's'} in this period:{' '}
              <strong class={counts.open ? 'report-open' : ''}>{counts.open} open (no answer yet)</strong>, {counts.awaitingSignOff} awaiting sign-off, {counts.closed} signed off{counts.historical ? `, ${counts.historical} in imported history` : ''}.
            </>
          )}
        </p>
        {groups.length ? (
          <div class="table-scroll" tabIndex={0} role="region" aria-label="Signals and responses (scrolls sideways)">
            <table class="history-table report-table report-signals-table" data-testid="report-signals">
              <caption class="sr-only">Signals of {ch.name} in the period, oldest first, with what was done</caption>
              <thead>
                <tr><th scope="col">Signal</th><th scope="col">Response</th><th scope="col">Answered and signed off</th></tr>
              </thead>
              <tbody>
                {groups.map((g) => {
                  const sample = view.series.samples[g.index];
                  return (
                    <tr key={g.sampleId} class={g.state === 'unanswered' ? 'report-open-row' : ''} data-testid="report-signal-row" data-state={g.state}>
                      <th scope="row">
                        <span class="report-line">Point {g.index + 1}{sample ? `, ${formatShortDateTime(sample.takenAt)}` : ''}</span>
                        <span class={`chip ${STATE_CHIP[g.state]}`}>{STATE_TEXT[g.state]}</span>
                        {g.signals.map((s) => <span class="delta" key={s.rule}>{s.explanation} ({ruleName(s.rule)})</span>)}
                        {g.lastIndex > g.index ? <span class="delta">Went on firing up to point {g.lastIndex + 1}.</span> : null}
                        {sample?.imported ? <span class="delta" data-testid="report-signal-imported">Imported from {importedFromText(sample.imported)}.</span> : null}
                      </th>
                      <td data-label="Response">
                        {g.response ? (
                          <>
                            <span class="report-line">{g.response.whatHappened}</span>
                            <span class="report-line"><strong>Cause:</strong> {g.response.causeCategory}{g.response.cause ? `: ${g.response.cause}` : ''}</span>
                            <span class="report-line"><strong>Action:</strong> {g.response.action}</span>
                          </>
                        ) : g.state === 'historical'
                          ? <span class="report-line">No response recorded: it fired in history imported from a file, where no answer was asked for.</span>
                          : <strong class="report-open">No response recorded.</strong>}
                      </td>
                      <td data-label="Answered and signed off">
                        <span class="report-line"><strong>Answered:</strong> {g.response ? `${who(g.response.respondedBy)}, ${formatShortDateTime(g.response.respondedAt)}` : g.state === 'historical' ? 'not asked for (imported history)' : 'not yet'}</span>
                        {g.response ? (
                          <span class="report-line"><strong>Signed off:</strong> {g.ack ? `${who(g.ack.by)}, ${formatShortDateTime(g.ack.at)}` : 'not yet'}</span>
                        ) : null}
                        {g.ack?.note ? <span class="delta">{g.ack.note}</span> : null}
                      </td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
        ) : null}
      </section>

      <footer class="report-foot hint">
        Plumbline · {ch.name} · {header.periodLabel.toLowerCase()} · printed {formatDateTime(header.printedAt)} by {header.printedBy}.
        Limits are the voice of the process; the specification is the customer's.
      </footer>
    </article>
  );
}

function LimitsSection({ view, state, range }: { view: CharacteristicView; state: AppState; range: ReportRange }) {
  const ch = view.characteristic;
  const entries = phasesInRange(view, state.setup.phases, range);
  const nameOf = (id: string) => state.setup.people.find((p) => p.id === id)?.name ?? id;
  const notes = (phase: Phase | undefined) => (phase ? [...correctionLines(phase, ch, nameOf, formatShortDateTime), withdrawalLine(phase, nameOf, formatShortDateTime)] : [])
    .filter((l): l is string => l !== undefined)
    .map((l) => <span key={l} class="delta report-phase-note" data-testid="report-phase-note">{l}</span>);
  const d = ch.decimals + 2;
  const f = (v: number | null) => (v === null ? '—' : v.toFixed(d));
  const anyChanged = entries.some((e) => e.kind === 'withdrawn' || (e.phase?.corrections?.length ?? 0) > 0);
  return (
    <section class="report-section stack" aria-labelledby="report-limits">
      <h2 id="report-limits">Limits by phase</h2>
      {entries.length === 0 ? <p class="hint">No phase has points in this period.</p> : (
        <div class="table-scroll" tabIndex={0} role="region" aria-label="Limits by phase (scrolls sideways)">
          <table class="history-table report-table" data-testid="report-limits">
            <caption class="sr-only">Limits of each phase of {ch.name} in the period, with corrections and withdrawn phases</caption>
            <thead>
              <tr>
                <th scope="col">Phase</th><th scope="col">Reason and limits</th><th scope="col">Centre</th><th scope="col">UCL</th><th scope="col">LCL</th>
                <th scope="col">Sigma</th><th scope="col">Points</th>
              </tr>
            </thead>
            <tbody>
              {entries.map((e) => {
                if (e.kind === 'withdrawn') {
                  return (
                    <tr key={`w${e.number}`} class="report-withdrawn-row" data-testid={`report-phase-${e.number}`} data-withdrawn="true">
                      <th scope="row">
                        Phase {e.number} <span class="chip neutral">Withdrawn</span>
                        <span class="delta">from {formatShortDateTime(e.phase.startsAt)}</span>
                      </th>
                      <td data-label="Reason and limits">{e.phase.reason}{notes(e.phase)}</td>
                      <td data-label="Limits" colSpan={5}>
                        {e.to > e.from
                          ? `Not used: ${pointRange(e.from, e.to)} ${e.to - e.from === 1 ? 'is' : 'are'} judged against ${e.judgedBy !== undefined ? `phase ${e.judgedBy}'s limits` : 'the limits of the phase before'}.`
                          : 'Not used: it had no points.'}
                      </td>
                    </tr>
                  );
                }
                const r = e.row;
                return (
                  <tr key={r.number} data-testid={`report-phase-${r.number}`}>
                    <th scope="row">
                      Phase {r.number}
                      <span class="delta">from {r.firstPointAt ? formatShortDateTime(r.firstPointAt) : r.startsAt ? `${formatShortDateTime(r.startsAt)} (no points yet)` : '—'}</span>
                    </th>
                    <td data-label="Reason and limits">
                      {r.reason}
                      <span class="delta">{r.source === 'given' ? 'Given (earlier study or standard)' : `Baseline of ${r.baselineCount} subgroup${r.baselineCount === 1 ? '' : 's'}${r.provisional ? ' (provisional)' : ''}`}</span>
                      {notes(e.phase)}
                    </td>
                    <td data-label="Centre">{f(r.centre)}</td>
                    <td data-label="UCL">{f(r.ucl)}{r.limitsVary ? <span class="delta">latest</span> : null}</td>
                    <td data-label="LCL">{f(r.lcl)}{r.limitsVary ? <span class="delta">latest</span> : null}</td>
                    <td data-label="Sigma">{f(r.sigma)}<span class="delta">{SIGMA_METHOD_TEXT[r.sigmaMethod]}</span></td>
                    <td data-label="Points">{r.points}<span class="delta">{r.signalPoints} with signals</span></td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      )}
      <p class="hint">
        Each row shows the phase whole, also where it reaches outside the period. Limits marked “latest” vary with the sample size (or settle over time on an EWMA chart).
        {anyChanged ? ' A correction names what it replaced, who made it, when and why; a withdrawn phase was started by mistake and is not used on the chart.' : ''}
      </p>
    </section>
  );
}

function CapabilitySection({ view, range, signals, openSignals }: { view: CharacteristicView; range: ReportRange; signals: number; openSignals: number }) {
  const scope = capabilityScope(view, range);
  const at = (i: number) => view.series.samples[i]?.takenAt;
  const first = scope ? at(scope.from) : undefined;
  const last = scope && scope.to > scope.from ? at(scope.to - 1) : undefined;
  const lead = (
    <>
      {signals > 0 ? (
        <p class="caution" data-testid="report-stability-caution">
          <strong>Stability first.</strong> {signals} signal{signals === 1 ? '' : 's'} in the period of this report{openSignals ? `, ${openSignals} still open` : ''} (a
          pattern that went on firing counted once): the process is not shown to be stable, so the capability figures below may not
          predict what it will make.
        </p>
      ) : null}
      {scope?.outside && first && last ? (
        <p class="hint">Studied over the whole of phase {scope.phase}: points {scope.from + 1} to {scope.to}, {formatShortDateTime(first)} to {formatShortDateTime(last)}, which reaches outside the period of this report.</p>
      ) : null}
    </>
  );
  return <div class="report-section report-capability"><CapabilityPanel view={view} lead={lead} /></div>;
}

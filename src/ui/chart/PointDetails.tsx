import { useState } from 'preact/hooks';
import type { AppActions, AppState, CharacteristicView } from '../../app/app-state';
import { parseEntry } from '../../app/number-entry';
import { isVariableChart } from '../../schema';
import { ruleName } from '../rule-text';

import { formatDateTime as when } from '../format-time';

/** What is behind one point: values, time, who, lot, limits, signals and answers; correct or exclude it. */
export function PointDetails({ view, index, state, actions, onClose }: {
  view: CharacteristicView; index: number; state: AppState; actions: AppActions; onClose: () => void;
}) {
  const [mode, setMode] = useState<'view' | 'correct' | 'exclude'>('view');
  const [text, setText] = useState('');
  const [reason, setReason] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const ch = view.characteristic;
  const sample = view.series.samples[index];
  const point = view.analysis.points[index];
  if (!sample || !point) return null;
  const people = new Map(state.setup.people.map((p) => [p.id, p.name]));
  const signals = view.analysis.signals.filter((s) => s.index === index);
  const group = view.groups.find((g) => g.index === index);
  const canExclude = state.person?.role === 'engineer' || state.person?.role === 'admin';
  const variable = isVariableChart(ch.chartType);
  const f = (v: number | null) => (v === null ? '—' : v.toFixed(ch.decimals + 1));
  const shown = variable ? (sample.values ?? []).map((v) => v.toFixed(ch.decimals)).join('  ') : `${sample.count ?? 0}${sample.inspected !== undefined ? ` of ${sample.inspected}` : ''}`;

  const submit = async () => {
    setProblem(null);
    if (!reason.trim()) return setProblem('Give a reason; it is kept with the record.');
    if (mode === 'exclude') {
      if (await actions.setExcluded(ch.id, sample.id, !sample.excluded, reason)) onClose();
      return;
    }
    const parts = text.trim().split(/\s+/);
    // As in the entry panel: counts are whole; only a u chart's units inspected may have decimals.
    const parsed = parts.map((t, i) => parseEntry(t, variable ? ch.decimals : i === 1 && ch.chartType === 'u' ? 2 : 0));
    const bad = parsed.find((p) => !p.ok);
    if (bad && !bad.ok) return setProblem(bad.message);
    const nums = parsed.map((p) => (p.ok ? p.value : 0));
    const expected = variable ? (ch.chartType === 'xmr' ? 1 : ch.subgroupSize) : ch.chartType === 'c' ? 1 : 2;
    if (nums.length !== expected) return setProblem(`Enter ${expected} value${expected === 1 ? '' : 's'}, separated by spaces.`);
    const entry = variable ? { values: nums } : ch.chartType === 'c' ? { count: nums[0]! } : { count: nums[0]!, inspected: nums[1]! };
    if (await actions.correct(ch.id, sample.id, entry, reason)) onClose();
  };

  return (
    <section class="card stack point-details" aria-label={`Point ${index + 1}`} data-testid="point-details">
      <div class="row" style="justify-content:space-between">
        <h3>Point {index + 1} · {when(sample.takenAt)}</h3>
        <button type="button" class="btn small" onClick={onClose}>Close</button>
      </div>
      <dl class="details-grid">
        <dt>{variable ? 'Values' : 'Count'}</dt><dd>{shown} {ch.unit}</dd>
        <dt>Plotted</dt><dd>{f(point.value)}</dd>
        <dt>Limits here</dt><dd>{f(point.lcl)} – {f(point.centre)} – {f(point.ucl)}</dd>
        <dt>Recorded by</dt><dd>{people.get(sample.recordedBy) ?? sample.recordedBy}</dd>
        {sample.lot ? <><dt>Lot</dt><dd>{sample.lot}</dd></> : null}
        {sample.comment ? <><dt>Comment</dt><dd>{sample.comment}</dd></> : null}
        {sample.supersedes ? <><dt>Corrected</dt><dd>{sample.reason ?? 'yes'}</dd></> : null}
        {sample.excluded ? <><dt>Left out of limits</dt><dd>{sample.reason ?? 'yes'}</dd></> : null}
      </dl>
      {signals.map((s) => <p key={s.rule} class="error-text" style="margin:0">{s.explanation} ({ruleName(s.rule)})</p>)}
      {group?.response ? (
        <p class="hint" style="margin:0">
          Answer: {group.response.whatHappened} · {group.response.causeCategory} · {group.response.action} —{' '}
          {people.get(group.response.respondedBy) ?? group.response.respondedBy}
        </p>
      ) : null}
      {mode === 'view' ? (
        <div class="row">
          <button type="button" class="btn small" onClick={() => { setMode('correct'); setText(variable ? (sample.values ?? []).join(' ') : `${sample.count ?? 0}${sample.inspected !== undefined ? ` ${sample.inspected}` : ''}`); }}>
            Correct this sample
          </button>
          {canExclude ? (
            <button type="button" class="btn small" onClick={() => setMode('exclude')}>
              {sample.excluded ? 'Use in limits again' : 'Leave out of limits'}
            </button>
          ) : null}
          {canExclude && index > (view.analysis.phases[view.analysis.phases.length - 1]?.start ?? 0) ? (
            <button type="button" class="btn small" data-testid="phase-from-point"
              onClick={() => actions.open({ name: 'new-phase', characteristicId: ch.id, fromSampleId: sample.id })}>
              New phase from here
            </button>
          ) : null}
        </div>
      ) : (
        <div class="stack" style="gap:8px">
          {mode === 'correct' ? (
            <label class="stack" style="gap:4px"><span class="hint">Corrected {variable ? 'values' : 'count and quantity'} (separated by spaces)</span>
              <input class="text-input" name="correction" value={text} onInput={(e) => setText((e.target as HTMLInputElement).value)} /></label>
          ) : null}
          <label class="stack" style="gap:4px"><span class="hint">Reason (kept with the record)</span>
            <input class="text-input" name="reason" value={reason} maxLength={400} onInput={(e) => setReason((e.target as HTMLInputElement).value)} /></label>
          {problem ? <p class="error-text" role="alert">{problem}</p> : null}
          <div class="row">
            <button type="button" class="btn small primary" onClick={() => void submit()}>
              {mode === 'correct' ? 'Save correction' : sample.excluded ? 'Use in limits' : 'Leave out'}
            </button>
            <button type="button" class="btn small" onClick={() => { setMode('view'); setProblem(null); }}>Cancel</button>
          </div>
        </div>
      )}
    </section>
  );
}
